/**
 * `fit --restarts 1` on the `xlarge` scenario (a campus: 100 × 100 grid, 10 000 cells; 1 000 runs ×
 * 5 000 steps): peak memory and seconds per EM iteration.
 *
 *     npm run build && node dist/bench/xlarge-fit.js [runs] [max-iter] [workers]
 *
 * Writes the floor and the first `runs` runs (default all 1 000) as a CSV runs table to a temporary
 * directory, then runs the fit (`--restarts 1 --holdout 0 --transitions tied --no-final-pass
 * --max-iter N`, default 2) in a fresh Node process through the same code as the CLI
 * (`fitFromFiles`), and prints the process's peak RSS, the time from process start to the end of the
 * first E-step, and the seconds between successive E-steps (one EM iteration each). With fewer runs the
 * E-step time scales with the steps (the per-iteration figure × 1000 / runs estimates the full scenario).
 */
import { spawnSync } from 'node:child_process';
import { createWriteStream, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { makeScenario, SCENARIO_SIZES } from './make-scenario.js';
import { formatFloor } from '../src/io/format-floor.js';
import { fitFromFiles } from '../src/pipeline/fit-from-files.js';
import { resolveFitOptions } from '../src/pipeline/resolve-fit-options.js';

async function child(dir: string, maxIter: number, workers: number): Promise<void> {
  const { options } = resolveFitOptions({ restarts: 1, holdout: 0, transitions: 'tied', maxIter, finalPass: false, workers }, 'xlarge-fit');
  const marks: number[] = [];
  await fitFromFiles(
    {
      floor: path.join(dir, 'floor.json'),
      runs: [path.join(dir, 'runs.csv')],
      out: path.join(dir, 'model.json'),
      from: null,
      options,
      workers,
      keys: { runCol: 'run', stepCol: 'step', readingCol: 'reading', unknownReadings: 'error' },
    },
    () => marks.push(performance.now() / 1000),
  );
  const total = performance.now() / 1000;
  process.stdout.write(`${JSON.stringify({ marks, total, peakRssMB: process.resourceUsage().maxRSS / 1024 })}\n`);
}

if (process.argv[2] === '--fit') {
  await child(process.argv[3], Number(process.argv[4]), Number(process.argv[5]));
} else {
  const spec = SCENARIO_SIZES.xlarge;
  const nRuns = Number(process.argv[2] ?? spec.nRuns);
  const maxIter = Number(process.argv[3] ?? 2);
  const workers = Number(process.argv[4] ?? 1);
  if (!(Number.isInteger(nRuns) && nRuns >= 1 && nRuns <= spec.nRuns && Number.isInteger(maxIter) && maxIter >= 1 && Number.isInteger(workers) && workers >= 1)) {
    process.stderr.write(`xlarge-fit: usage: node dist/bench/xlarge-fit.js [runs 1…${spec.nRuns}] [max-iter ≥ 1] [workers ≥ 1], got ${process.argv.slice(2).join(' ')}\n`);
    process.exit(2);
  }
  const t0 = performance.now();
  const s = makeScenario('xlarge', 1);
  const dir = mkdtempSync(path.join(os.tmpdir(), 'underfoot-xlarge-'));
  try {
    writeFileSync(path.join(dir, 'floor.json'), formatFloor(s.floor));
    const out = createWriteStream(path.join(dir, 'runs.csv'));
    let chunk = 'run,step,reading\n';
    let steps = 0;
    for (const run of s.runs.slice(0, nRuns)) {
      for (let t = 0; t < run.obs.length; t++) {
        chunk += `${run.id},${t},${run.obs[t] < 0 ? '' : s.floor.surfaces[run.obs[t]]}\n`;
        if (chunk.length > 1 << 20) {
          if (!out.write(chunk)) await new Promise<void>((resolve) => out.once('drain', () => resolve()));
          chunk = '';
        }
      }
      steps += run.obs.length;
    }
    out.end(chunk);
    await new Promise<void>((resolve, reject) => out.once('finish', () => resolve()).once('error', reject));
    const nnz = s.truth.structure.nnz;
    console.log(
      `xlarge: ${s.floor.cells.length} cells, ${s.floor.links.length} floor links, nnz ${nnz}; ${nRuns} runs, ${steps} steps; written in ${((performance.now() - t0) / 1000).toFixed(1)} s; ` +
        `Node ${process.version}, ${os.availableParallelism()} cores, load average ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`,
    );
    const res = spawnSync(process.execPath, [fileURLToPath(import.meta.url), '--fit', dir, String(maxIter), String(workers)], { encoding: 'utf8', maxBuffer: 1 << 20 });
    if (res.status !== 0) throw new Error(`xlarge-fit: the fit failed: ${res.stderr.trim().split('\n').slice(-3).join(' / ')}`);
    const r = JSON.parse(res.stdout.trim().split('\n').pop()!) as { marks: number[]; total: number; peakRssMB: number };
    const iters = r.marks.slice(1).map((x, k) => x - r.marks[k]);
    const per = iters.length ? iters.reduce((a, b) => a + b, 0) / iters.length : NaN;
    console.log(`fit --restarts 1 --max-iter ${maxIter} --workers ${workers}: peak RSS ${r.peakRssMB.toFixed(0)} MB; process start → end of first E-step ${r.marks[0]?.toFixed(2)} s; whole process ${r.total.toFixed(2)} s`);
    console.log(
      `seconds per EM iteration: ${iters.map((x) => x.toFixed(2)).join(', ')} (${((per * 1e9) / (steps * nnz)).toFixed(2)} ns/step-link); ` +
        `estimate for all ${spec.nRuns} runs: ${((per * spec.nRuns) / nRuns).toFixed(0)} s per iteration`,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
