/**
 * Reading a very large runs table (issue 4: "a 10⁷-row runs table, CSV and Arrow, loads without
 * building per-row JavaScript objects"):
 *
 *     npm run build && node dist/bench/load-table.js [rows] [repeats] [formats]
 *
 * Writes a runs table of `rows` rows (default 10 000 000: 5 000 runs × 2 000 steps, six invented
 * surfaces, 2 % empty readings) to a temporary directory as CSV and as an Arrow IPC file (the Arrow
 * file as `underfoot simulate` writes it: run and reading as Utf8, step as Int32; `formats` picks them,
 * default `csv,arrow`), then reads each file `repeats` times (default 3) with `readRuns`, each time in a
 * fresh Node process, and prints the wall seconds of the read (file bytes to runs), rows per second, ns
 * per row, the process's CPU seconds over the read, its peak resident set size and its heap after the
 * read; then the best (fastest) read of each file. The temporary directory is removed at the end.
 */
import { spawnSync } from 'node:child_process';
import { createWriteStream, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { readRuns } from '../src/io/read-runs.js';
import { tableToArrowBytes } from '../src/io/table-to-arrow-bytes.js';

const SURFACES = ['oak', 'slate', 'cork', 'tile', 'carpet', 'rubber'];
const STEPS_PER_RUN = 2000;

/** Run id, step and reading code (−1 = empty) of row `row`, drawn from a small fixed-seed generator. */
function rowAt(row: number, state: { x: number }): [string, number, number] {
  const r = Math.floor(row / STEPS_PER_RUN);
  state.x = (Math.imul(state.x, 1103515245) + 12345) >>> 0;
  const u = state.x / 2 ** 32;
  const code = u < 0.02 ? -1 : Math.floor(((u - 0.02) / 0.98) * SURFACES.length);
  return [`run-${String(r).padStart(5, '0')}`, row % STEPS_PER_RUN, code];
}

async function writeCsv(file: string, nRows: number): Promise<void> {
  const out = createWriteStream(file);
  const state = { x: 7 };
  let chunk = 'run,step,reading\n';
  for (let row = 0; row < nRows; row++) {
    const [run, step, code] = rowAt(row, state);
    chunk += `${run},${step},${code < 0 ? '' : SURFACES[code]}\n`;
    if (chunk.length > 1 << 20) {
      if (!out.write(chunk)) await new Promise<void>((resolve) => out.once('drain', () => resolve()));
      chunk = '';
    }
  }
  out.end(chunk);
  await new Promise<void>((resolve, reject) => out.once('finish', () => resolve()).once('error', reject));
}

function writeArrow(file: string, nRows: number): void {
  const runs = new Int32Array(nRows);
  const steps = new Int32Array(nRows);
  const codes = new Int8Array(nRows);
  const state = { x: 7 };
  for (let row = 0; row < nRows; row++) {
    const [, step, code] = rowAt(row, state);
    runs[row] = Math.floor(row / STEPS_PER_RUN);
    steps[row] = step;
    codes[row] = code;
  }
  const bytes = tableToArrowBytes(
    {
      nRows,
      columns: [
        { name: 'run', kind: 'utf8', get: (row) => `run-${String(runs[row]).padStart(5, '0')}` },
        { name: 'step', kind: 'int32', get: (row) => steps[row] },
        { name: 'reading', kind: 'utf8', get: (row) => (codes[row] < 0 ? null : SURFACES[codes[row]]) },
      ],
    },
    false,
  );
  writeFileSync(file, bytes);
}

/** In a child process: reads one file, prints one JSON line. */
async function readOne(file: string): Promise<void> {
  const t0 = process.hrtime.bigint();
  const cpu0 = process.cpuUsage();
  const table = await readRuns(file, { surfaces: SURFACES });
  const seconds = Number(process.hrtime.bigint() - t0) / 1e9;
  const cpu = process.cpuUsage(cpu0);
  let steps = 0;
  for (const run of table.runs) steps += run.obs.length;
  const heapMB = process.memoryUsage().heapUsed / 2 ** 20;
  const result = { seconds, cpuSeconds: (cpu.user + cpu.system) / 1e6, rows: table.nRows, runs: table.runs.length, steps, peakRssMB: process.resourceUsage().maxRSS / 1024, heapMB };
  process.stdout.write(`${JSON.stringify(result)}\n`);
}

if (process.argv[2] === '--read') {
  await readOne(process.argv[3]);
} else {
  const nRows = Number(process.argv[2] ?? 10_000_000);
  const repeats = Number(process.argv[3] ?? 3);
  const formats: string[] = (process.argv[4] ?? 'csv,arrow').split(',');
  if (!(Number.isInteger(nRows) && nRows > 0 && Number.isInteger(repeats) && repeats > 0 && formats.length > 0 && formats.every((f) => f === 'csv' || f === 'arrow'))) {
    process.stderr.write(`load-table: usage: node dist/bench/load-table.js [rows ≥ 1] [repeats ≥ 1] [csv,arrow], got ${process.argv.slice(2).join(' ')}\n`);
    process.exit(2);
  }
  const dir = mkdtempSync(path.join(os.tmpdir(), 'underfoot-load-table-'));
  try {
    const csv = path.join(dir, 'runs.csv');
    const arrow = path.join(dir, 'runs.arrow');
    let t0 = process.hrtime.bigint();
    if (formats.includes('csv')) await writeCsv(csv, nRows);
    if (formats.includes('arrow')) writeArrow(arrow, nRows);
    const made = Number(process.hrtime.bigint() - t0) / 1e9;
    console.log(`runs table of ${nRows} rows (${Math.ceil(nRows / STEPS_PER_RUN)} runs × ≤ ${STEPS_PER_RUN} steps) written in ${made.toFixed(1)} s; Node ${process.version}, ${os.availableParallelism()} cores, load average ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
    console.log('file                 MB   read s    rows/s   ns/row    cpu s   peak RSS MB   heap after MB');
    const self = fileURLToPath(import.meta.url);
    const best: string[] = [];
    for (const file of [csv, arrow].filter((_, i) => formats.includes((['csv', 'arrow'] as const)[i]))) {
      let fastest = Infinity;
      for (let k = 0; k < repeats; k++) {
        t0 = process.hrtime.bigint();
        const res = spawnSync(process.execPath, [self, '--read', file], { encoding: 'utf8', maxBuffer: 1 << 20 });
        if (res.status !== 0) throw new Error(`load-table: reading ${path.basename(file)} failed: ${res.stderr.trim().split('\n').slice(-3).join(' / ')}`);
        const r = JSON.parse(res.stdout.trim().split('\n').pop()!) as { seconds: number; cpuSeconds: number; rows: number; steps: number; peakRssMB: number; heapMB: number };
        if (r.rows !== nRows || r.steps !== nRows) throw new Error(`load-table: ${path.basename(file)}: read ${r.rows} rows and ${r.steps} steps, expected ${nRows}`);
        const mb = statSync(file).size / 2 ** 20;
        console.log(
          `${path.basename(file).padEnd(16)} ${mb.toFixed(0).padStart(6)} ${r.seconds.toFixed(2).padStart(8)} ${(nRows / r.seconds).toExponential(2).padStart(9)} ${((r.seconds * 1e9) / nRows).toFixed(0).padStart(8)} ${r.cpuSeconds.toFixed(2).padStart(8)} ${r.peakRssMB.toFixed(0).padStart(13)} ${r.heapMB.toFixed(0).padStart(15)}`,
        );
        fastest = Math.min(fastest, r.seconds);
      }
      best.push(`${path.basename(file)} ${fastest.toFixed(2)} s (${(nRows / fastest).toExponential(2)} rows/s)`);
    }
    console.log(`best of ${repeats}: ${best.join('; ')}`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
