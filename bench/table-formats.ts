/**
 * Writing and reading a large table in each binary format through underfoot's own code:
 *
 *     npm run build && node dist/bench/table-formats.js [rows] [formats]
 *
 * Makes a runs-like table of `rows` rows (default 1 000 000: runs of 2 000 steps; `run` and `reading`
 * dictionary-encoded text, `step` int64, `moved` float64 with 2 % nulls, six invented surfaces), then for
 * each format (default `parquet,parquet-zstd,arrow,arrow-zstd,arrow-lz4`) writes it with `writeTable` in a
 * fresh Node process and reads it back with `readRuns` in another, and prints wall seconds, ns per row,
 * the file size and each process's peak resident set size (`process.resourceUsage().maxRSS`; a bare
 * process with the modules loaded is printed first as the baseline). The temporary folder is removed.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { readRuns } from '../src/io/read-runs.js';
import { writeTable } from '../src/io/write-table.js';
import type { OutputTable } from '../src/io/output-table.js';
import type { TableCompression } from '../src/io/table-compression.js';

const SURFACES = ['oak', 'slate', 'cork', 'tile', 'carpet', 'rubber'];
const STEPS_PER_RUN = 2000;
const FORMATS: Record<string, { ext: string; compression: TableCompression | null }> = {
  parquet: { ext: '.parquet', compression: null },
  'parquet-zstd': { ext: '.parquet', compression: 'zstd' },
  arrow: { ext: '.arrow', compression: null },
  'arrow-zstd': { ext: '.arrow', compression: 'zstd' },
  'arrow-lz4': { ext: '.arrow', compression: 'lz4' },
};

/** The table: typed arrays behind getters, as the annotated table is built. */
function makeTable(nRows: number): OutputTable {
  const codes = new Int8Array(nRows);
  const moved = new Float64Array(nRows);
  let x = 7;
  for (let row = 0; row < nRows; row++) {
    x = (Math.imul(x, 1103515245) + 12345) >>> 0;
    const u = x / 2 ** 32;
    codes[row] = Math.floor(u * SURFACES.length);
    moved[row] = u < 0.02 ? NaN : Math.round(u * 1000) / 1000;
  }
  const runIds = Array.from({ length: Math.ceil(nRows / STEPS_PER_RUN) }, (_, r) => `run-${String(r).padStart(5, '0')}`);
  return {
    nRows,
    columns: [
      { name: 'run', kind: 'dictionary', dictionary: runIds, code: (row) => Math.floor(row / STEPS_PER_RUN), get: (row) => runIds[Math.floor(row / STEPS_PER_RUN)] },
      { name: 'step', kind: 'int64', get: (row) => row % STEPS_PER_RUN },
      { name: 'reading', kind: 'dictionary', dictionary: SURFACES, code: (row) => codes[row], get: (row) => SURFACES[codes[row]] },
      { name: 'moved', kind: 'float64', get: (row) => (Number.isNaN(moved[row]) ? null : moved[row]) },
    ],
  };
}

function report(extra: Record<string, unknown>): void {
  process.stdout.write(`${JSON.stringify({ ...extra, peakRssMB: process.resourceUsage().maxRSS / 1024 })}\n`);
}

async function child(mode: string, file: string, nRows: number, format: string): Promise<void> {
  if (mode === '--baseline') {
    makeTable(nRows);
    report({ seconds: 0 });
    return;
  }
  if (mode === '--write') {
    const table = makeTable(nRows);
    const t0 = process.hrtime.bigint();
    await writeTable(file, table, { compression: FORMATS[format].compression });
    report({ seconds: Number(process.hrtime.bigint() - t0) / 1e9 });
    return;
  }
  const t0 = process.hrtime.bigint();
  const table = await readRuns(file, { surfaces: SURFACES });
  const seconds = Number(process.hrtime.bigint() - t0) / 1e9;
  let steps = 0;
  for (const run of table.runs) steps += run.obs.length;
  if (table.nRows !== nRows || steps !== nRows) throw new Error(`read ${table.nRows} rows and ${steps} steps, expected ${nRows}`);
  report({ seconds });
}

const self = fileURLToPath(import.meta.url);
function spawnChild(args: string[]): { seconds: number; peakRssMB: number } {
  const res = spawnSync(process.execPath, [self, ...args], { encoding: 'utf8', maxBuffer: 1 << 20 });
  if (res.status !== 0) throw new Error(`table-formats: ${args.join(' ')} failed: ${res.stderr.trim().split('\n').slice(-3).join(' / ')}`);
  return JSON.parse(res.stdout.trim().split('\n').pop()!) as { seconds: number; peakRssMB: number };
}

if (process.argv[2]?.startsWith('--')) {
  await child(process.argv[2], process.argv[3], Number(process.argv[4]), process.argv[5]);
} else {
  const nRows = Number(process.argv[2] ?? 1_000_000);
  const formats = (process.argv[3] ?? Object.keys(FORMATS).join(',')).split(',');
  if (!(Number.isInteger(nRows) && nRows > 0) || formats.some((f) => !(f in FORMATS))) {
    process.stderr.write(`table-formats: usage: node dist/bench/table-formats.js [rows ≥ 1] [${Object.keys(FORMATS).join(',')}], got ${process.argv.slice(2).join(' ')}\n`);
    process.exit(2);
  }
  const dir = mkdtempSync(path.join(os.tmpdir(), 'underfoot-table-formats-'));
  try {
    console.log(`${nRows} rows (run, step, reading, moved); Node ${process.version}, ${os.availableParallelism()} cores, load average ${os.loadavg().map((v) => v.toFixed(2)).join(' ')}`);
    const base = spawnChild(['--baseline', '', String(nRows), '']);
    console.log(`baseline process (modules + table in memory): peak RSS ${base.peakRssMB.toFixed(0)} MB`);
    console.log('format          file MB   write s  ns/row  write RSS MB    read s  ns/row  read RSS MB');
    for (const format of formats) {
      const file = path.join(dir, `${format}${FORMATS[format].ext}`);
      const w = spawnChild(['--write', file, String(nRows), format]);
      const r = spawnChild(['--read', file, String(nRows), format]);
      const mb = statSync(file).size / 2 ** 20;
      const ns = (s: number) => ((s * 1e9) / nRows).toFixed(0).padStart(7);
      console.log(
        `${format.padEnd(14)} ${mb.toFixed(1).padStart(8)} ${w.seconds.toFixed(2).padStart(9)} ${ns(w.seconds)} ${w.peakRssMB.toFixed(0).padStart(13)} ${r.seconds.toFixed(2).padStart(9)} ${ns(r.seconds)} ${r.peakRssMB.toFixed(0).padStart(12)}`,
      );
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
