/**
 * `underfoot fit` with 1 and with 2 worker threads on a scenario building, through the built command
 * as a user runs it, to measure how the E-step pool scales and the command's peak memory:
 *
 *     npm run build && node dist/bench/fit-workers.js [size] [repeats]
 *
 * Writes the scenario's floor (default medium) to a temporary directory, simulates runs there with
 * `underfoot simulate` (the scenario's run count and length, 2 % dropouts), then runs
 * `underfoot fit --restarts 2 --max-iter 10 --tol 0` (a fixed amount of work: 34 E-steps) `repeats`
 * times (default 3) with `--workers 1` and with `--workers 2`, alternating, under `/usr/bin/time` for
 * the peak resident set size. Prints every timing, the medians and their ratio, and checks that both
 * worker counts wrote byte-identical models. The temporary directory is removed at the end.
 *
 * First it probes the machine: how much two threads gain over one on a pure arithmetic loop and on a
 * loop that streams a 64 MB array (as the E-step streams its forward table) — the ceiling for any
 * two-worker speed-up here.
 */
import { spawnSync } from 'node:child_process';
import { Worker } from 'node:worker_threads';
import { mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { makeScenario, SCENARIO_SIZES, type ScenarioSize } from './make-scenario.js';

const size = (process.argv[2] ?? 'medium') as ScenarioSize;
const repeats = Number(process.argv[3] ?? 3);
if (!SCENARIO_SIZES[size] || !(Number.isInteger(repeats) && repeats > 0)) {
  process.stderr.write(`fit-workers: usage: node dist/bench/fit-workers.js [small|medium|large] [repeats ≥ 1], got ${process.argv.slice(2).join(' ')}\n`);
  process.exit(2);
}
const bin = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', 'src', 'cli', 'bin.js');
const dir = mkdtempSync(path.join(os.tmpdir(), 'underfoot-fit-workers-'));
const haveTime = existsSync('/usr/bin/time');

function run(args: string[]): { seconds: number; rssMB: number } {
  const t0 = process.hrtime.bigint();
  const command = haveTime ? '/usr/bin/time' : process.execPath;
  const full = haveTime ? ['-f', 'peak-rss-kb %M', process.execPath, bin, ...args] : [bin, ...args];
  const res = spawnSync(command, full, { encoding: 'utf8' });
  const seconds = Number(process.hrtime.bigint() - t0) / 1e9;
  if (res.status !== 0) throw new Error(`underfoot ${args[0]} failed: ${res.stderr.trim().split('\n').slice(-2).join(' / ')}`);
  const m = /peak-rss-kb (\d+)/.exec(res.stderr);
  return { seconds, rssMB: m ? Number(m[1]) / 1024 : NaN };
}

/** Seconds for one job alone and for two at once on two threads, of a loop of the given kind. */
async function probe(kind: 'arithmetic' | 'memory'): Promise<number> {
  const body =
    kind === 'arithmetic'
      ? 'let x = 0; for (let i = 0; i < 2e8; i++) x += Math.sqrt(i) * 1e-9; require("node:worker_threads").parentPort.postMessage(x);'
      : 'const a = new Float64Array(8e6); let s = 0; for (let r = 0; r < 6; r++) { for (let i = 0; i < a.length; i++) a[i] = i * r; for (let i = a.length - 1; i >= 0; i--) s += a[i]; } require("node:worker_threads").parentPort.postMessage(s);';
  const job = (): Promise<void> => new Promise((resolve, reject) => new Worker(body, { eval: true }).once('message', () => resolve()).once('error', reject));
  let t0 = process.hrtime.bigint();
  await job();
  const one = Number(process.hrtime.bigint() - t0);
  t0 = process.hrtime.bigint();
  await Promise.all([job(), job()]);
  const two = Number(process.hrtime.bigint() - t0);
  return (2 * one) / two;
}

try {
  console.log(`two threads vs one on this machine: arithmetic ${(await probe('arithmetic')).toFixed(2)}×, streaming 64 MB ${(await probe('memory')).toFixed(2)}×`);
  const scenario = makeScenario(size, 1);
  const spec = SCENARIO_SIZES[size];
  const floorFile = path.join(dir, 'floor.json');
  const runsFile = path.join(dir, 'runs.arrow');
  writeFileSync(floorFile, JSON.stringify(scenario.floor));
  run(['simulate', '--floor', floorFile, '--runs', String(spec.nRuns), '--steps', String(spec.nSteps), '--dropout-rate', '0.02', '--seed', '1', '--out', runsFile, '-q']);
  const common = ['fit', '--floor', floorFile, '--runs', runsFile, '--restarts', '2', '--max-iter', '10', '--tol', '0', '--seed', '1', '-q'];
  const times: Record<1 | 2, Array<{ seconds: number; rssMB: number }>> = { 1: [], 2: [] };
  console.log(`fit on the ${size} building (${scenario.floor.cells.length} cells), ${spec.nRuns} runs × ${spec.nSteps} steps; cores: ${os.availableParallelism()}; load average ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
  for (let k = 0; k < repeats; k++) {
    for (const workers of [1, 2] as const) {
      const r = run([...common, '--workers', String(workers), '--out', path.join(dir, `model-${workers}.json`)]);
      times[workers].push(r);
      console.log(`  --workers ${workers}: ${r.seconds.toFixed(2)} s, peak RSS ${r.rssMB.toFixed(0)} MB`);
    }
  }
  const median = (a: number[]): number => a.slice().sort((x, y) => x - y)[a.length >> 1];
  const one = median(times[1].map((t) => t.seconds));
  const two = median(times[2].map((t) => t.seconds));
  console.log(`median: --workers 1 ${one.toFixed(2)} s, --workers 2 ${two.toFixed(2)} s, speed-up ${(one / two).toFixed(2)}×`);
  console.log(`peak RSS (largest): --workers 1 ${Math.max(...times[1].map((t) => t.rssMB)).toFixed(0)} MB, --workers 2 ${Math.max(...times[2].map((t) => t.rssMB)).toFixed(0)} MB`);
  const same = readFileSync(path.join(dir, 'model-1.json')).equals(readFileSync(path.join(dir, 'model-2.json')));
  console.log(`models with 1 and 2 workers byte-identical: ${same ? 'yes' : 'NO'}`);
  if (!same) process.exitCode = 1;
} finally {
  rmSync(dir, { recursive: true, force: true });
}
