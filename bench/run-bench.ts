/**
 * Benchmark of the engine on generated grid buildings (see `make-scenario.ts` and `README.md`).
 *
 *     npm run bench                                    # all sizes
 *     npm run build && node dist/bench/run-bench.js --sizes small,medium [--seed 1]
 *
 * Times, per size: scoring every run (forwardScore), decoding every run (decodeRun: Viterbi and
 * posteriors), one Baum-Welch iteration and twenty (emIteration, tied transitions, prior strength 10,
 * survey prior). Figures are measured wall-clock times on this machine, single-threaded.
 */
import os from 'node:os';
import { parseArgs } from 'node:util';
import { makeScenario, SCENARIO_SIZES, type Scenario, type ScenarioSize } from './make-scenario.js';
import { chainFromModel } from '../src/model/chain-from-model.js';
import { forwardScore } from '../src/kernels/forward-score.js';
import { decodeRun } from '../src/decode/decode-run.js';
import { logChain } from '../src/decode/log-chain.js';
import { emIteration } from '../src/fit/em-iteration.js';
import { EStepWorkspace } from '../src/fit/e-step-workspace.js';
import { buildModel } from '../src/model/build-model.js';
import { surveyPrior } from '../src/model/survey-prior.js';
import type { HmmModel } from '../src/model/hmm-model.js';
import type { RunReadings } from '../src/fit/em-iteration.js';

const ALL_SIZES = Object.keys(SCENARIO_SIZES) as ScenarioSize[];
const EM_ITERATIONS = 20;
const PRIOR_STRENGTH = 10;
const FIT_HIT = 0.8;
const FIT_DWELL = 0.5;

interface Row {
  size: string;
  cells: number;
  nnz: number;
  shape: string;
  operation: string;
  seconds: number;
  /** Passes over all runs (20 for twenty EM iterations); null for rows with no per-step-link figure. */
  passes: number | null;
  totalSteps: number;
  rssMB: number;
  check: string;
}

function usage(message: string): never {
  process.stderr.write(`run-bench: ${message}\nusage: node dist/bench/run-bench.js [--sizes small,medium,large] [--seed N]\n`);
  process.exit(2);
}

function parseOptions(argv: string[]): { sizes: ScenarioSize[]; seed: number } {
  let values: { sizes?: string; seed?: string };
  try {
    ({ values } = parseArgs({ args: argv, options: { sizes: { type: 'string' }, seed: { type: 'string' } }, strict: true }));
  } catch (err) {
    usage((err as Error).message);
  }
  const sizes = (values.sizes ?? ALL_SIZES.join(',')).split(',').map((s) => s.trim()).filter((s) => s !== '');
  for (const s of sizes) {
    if (!(ALL_SIZES as string[]).includes(s)) usage(`--sizes must list ${ALL_SIZES.join(', ')}, got ${JSON.stringify(s)}`);
  }
  if (sizes.length === 0) usage('--sizes must list at least one size, got nothing');
  const seed = values.seed === undefined ? 1 : Number(values.seed);
  if (!Number.isSafeInteger(seed)) usage(`--seed must be an integer, got ${JSON.stringify(values.seed)}`);
  return { sizes: sizes as ScenarioSize[], seed };
}

function peakRssMB(): number {
  return process.resourceUsage().maxRSS / 1024; // maxRSS is in kilobytes
}

function timed<T>(fn: () => T): { seconds: number; value: T } {
  const t0 = process.hrtime.bigint();
  const value = fn();
  return { seconds: Number(process.hrtime.bigint() - t0) / 1e9, value };
}

function countReadings(runs: ReadonlyArray<RunReadings>): number {
  let n = 0;
  for (const run of runs) for (let t = 0; t < run.obs.length; t++) if (run.obs[t] >= 0) n++;
  return n;
}

/** Σ log P(readings) of all runs by the O(nCells)-memory scaled forward pass. */
function scoreAll(model: HmmModel, runs: ReadonlyArray<RunReadings>): number {
  const chain = chainFromModel(model);
  const work = new Float64Array(2 * chain.nCells);
  let total = 0;
  for (const run of runs) total += forwardScore(chain, run.obs, run.obs.length, work);
  return total;
}

/** Decodes all runs; returns the share of steps whose Viterbi cell is the true cell. */
function decodeAll(model: HmmModel, runs: ReadonlyArray<RunReadings>, truePaths: ReadonlyArray<Int32Array>): number {
  const chain = chainFromModel(model);
  const log = logChain(chain);
  let hits = 0;
  let steps = 0;
  runs.forEach((run, k) => {
    const decoded = decodeRun(chain, log, run.obs);
    const truth = truePaths[k];
    for (let t = 0; t < truth.length; t++) if (decoded.path[t] === truth[t]) hits++;
    steps += truth.length;
  });
  return hits / steps;
}

/** `iterations` Baum-Welch iterations from the survey-prior start; returns the last input model's log-likelihood. */
function fitAll(scenario: Scenario, runs: ReadonlyArray<RunReadings>, iterations: number): number {
  let model = buildModel(scenario.floor, { dwell: FIT_DWELL, hit: FIT_HIT });
  const index = new Map(scenario.floor.surfaces.map((s, r) => [s, r] as const));
  const surfaceOfCell = Int32Array.from(scenario.floor.cells, (c) => index.get(c.surface) ?? -1);
  const prior = surveyPrior(surfaceOfCell, scenario.floor.surfaces.length, FIT_HIT);
  const ws = new EStepWorkspace();
  let logLik = NaN;
  for (let k = 0; k < iterations; k++) {
    const result = emIteration(model, runs, { mode: 'tied', priorStrength: PRIOR_STRENGTH, prior }, ws);
    model = result.model;
    logLik = result.logLik;
  }
  return logLik;
}

/** Runs every operation once on a few short runs so the timed passes do not include JIT compilation. */
function warmUp(seed: number): void {
  const s = makeScenario('small', seed);
  const runs = s.runs.slice(0, 5).map((r) => ({ id: r.id, obs: r.obs.subarray(0, 200) }));
  const paths = s.truePaths.slice(0, 5).map((p) => p.subarray(0, 200));
  scoreAll(s.truth, runs);
  decodeAll(s.truth, runs, paths);
  fitAll(s, runs, 2);
}

function benchSize(size: ScenarioSize, seed: number): Row[] {
  const made = timed(() => makeScenario(size, seed));
  const s = made.value;
  const spec = SCENARIO_SIZES[size];
  const totalSteps = s.runs.reduce((k, r) => k + r.obs.length, 0);
  const nReadings = countReadings(s.runs);
  const base = {
    size,
    cells: s.floor.cells.length,
    nnz: s.truth.structure.nnz,
    shape: `${spec.nRuns} x ${spec.nSteps}`,
    totalSteps,
  };
  const rows: Row[] = [];
  rows.push({ ...base, operation: 'make scenario', seconds: made.seconds, passes: null, rssMB: peakRssMB(), check: `${s.floor.links.length} links` });

  const score = timed(() => scoreAll(s.truth, s.runs));
  rows.push({ ...base, operation: 'score (forward)', seconds: score.seconds, passes: 1, rssMB: peakRssMB(), check: `loglik/reading ${(score.value / nReadings).toFixed(4)}` });

  const decode = timed(() => decodeAll(s.truth, s.runs, s.truePaths));
  rows.push({ ...base, operation: 'decode (Viterbi+posteriors)', seconds: decode.seconds, passes: 1, rssMB: peakRssMB(), check: `path = true cell ${(100 * decode.value).toFixed(1)}%` });

  const em1 = timed(() => fitAll(s, s.runs, 1));
  rows.push({ ...base, operation: 'Baum-Welch x1', seconds: em1.seconds, passes: 1, rssMB: peakRssMB(), check: `loglik/reading ${(em1.value / nReadings).toFixed(4)} (start)` });

  const em20 = timed(() => fitAll(s, s.runs, EM_ITERATIONS));
  rows.push({ ...base, operation: `Baum-Welch x${EM_ITERATIONS}`, seconds: em20.seconds, passes: EM_ITERATIONS, rssMB: peakRssMB(), check: `loglik/reading ${(em20.value / nReadings).toFixed(4)} (iter ${EM_ITERATIONS})` });
  return rows;
}

function formatTable(rows: Row[]): string {
  const header = ['size', 'cells', 'nnz', 'runs x steps', 'operation', 'wall s', 'ns/step-link', 'peak RSS MB', 'check'];
  const body = rows.map((r) => [
    r.size,
    String(r.cells),
    String(r.nnz),
    r.shape,
    r.operation,
    r.seconds.toFixed(3),
    r.passes === null ? '-' : ((r.seconds * 1e9) / (r.passes * r.totalSteps * r.nnz)).toFixed(2),
    r.rssMB.toFixed(0),
    r.check,
  ]);
  const widths = header.map((h, c) => Math.max(h.length, ...body.map((row) => row[c].length)));
  const numeric = new Set([1, 2, 5, 6, 7]);
  const line = (cells: string[]): string =>
    cells.map((v, c) => (numeric.has(c) ? v.padStart(widths[c]) : v.padEnd(widths[c]))).join('  ').trimEnd();
  return [line(header), line(widths.map((w) => '-'.repeat(w))), ...body.map(line)].join('\n');
}

function main(): void {
  const { sizes, seed } = parseOptions(process.argv.slice(2));
  const cpus = os.cpus();
  console.log(`underfoot bench — node ${process.version}, ${os.platform()} ${os.arch()}`);
  console.log(`cores (os.availableParallelism): ${os.availableParallelism()}; cpu: ${cpus[0]?.model ?? 'unknown'}`);
  console.log(`sizes: ${sizes.join(', ')}; seed ${seed}; single-threaded; Baum-Welch: tied transitions, prior strength ${PRIOR_STRENGTH}, survey prior (hit ${FIT_HIT})`);
  const w = timed(() => warmUp(seed + 1000));
  console.log(`warm-up: ${w.seconds.toFixed(2)} s`);
  console.log('');
  const rows: Row[] = [];
  for (const size of sizes) {
    rows.push(...benchSize(size, seed));
    process.stderr.write(`done: ${size}\n`);
  }
  console.log(formatTable(rows));
  console.log('');
  console.log('ns/step-link = wall seconds × 1e9 / (passes × total steps × nnz); passes = 20 for "Baum-Welch x20", else 1.');
  console.log('peak RSS = process-wide high-water mark (process.resourceUsage().maxRSS) after the operation.');
}

main();
