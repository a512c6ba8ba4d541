/**
 * Benchmark of the engine on generated grid buildings (see `make-scenario.ts` and `README.md`), side by
 * side with two reference libraries when they are installed (see `peers.ts`).
 *
 *     npm run bench                                    # all sizes, both peers
 *     npm run build && node dist/bench/run-bench.js --sizes small,medium [--seed 1] [--peers none]
 *
 * Times, per size: scoring every run, the Viterbi path of every run (one run at a time, and in lane
 * groups of 8 as `decode` runs it), decoding every run (Viterbi and posteriors; and with every annotated
 * column, one run at a time and in lanes), one and twenty Baum-Welch iterations as `fit` runs them (tied transitions, survey prior
 * of strength 10), and one and twenty iterations of plain Baum-Welch (learned transitions, no prior: the
 * peers' work); then the same model and runs through GHMM and pomegranate, checking that all three agree on
 * the total log-likelihood. Every figure is a measured wall-clock time on this machine, in one thread.
 */
import os from 'node:os';
import { parseArgs } from 'node:util';
import { makeScenario, SCENARIO_SIZES, type Scenario, type ScenarioSize } from './make-scenario.js';
import { peerInput, runPeer, type PeerName, type PeerResult } from './peers.js';
import { chainFromModel } from '../src/model/chain-from-model.js';
import { decodeRun } from '../src/decode/decode-run.js';
import { viterbiPath } from '../src/decode/viterbi-path.js';
import { logChain } from '../src/decode/log-chain.js';
import { decodeLanes } from '../src/decode/decode-lanes.js';
import { logLanes } from '../src/decode/log-lanes.js';
import { positionLayout } from '../src/decode/position-layout.js';
import type { DecodedRun } from '../src/decode/decode-run.js';
import { LocalEngine } from '../src/fit/local-engine.js';
import { packRuns, type PackedRuns } from '../src/fit/packed-runs.js';
import { reduceBlocks } from '../src/fit/reduce-blocks.js';
import { buildModel } from '../src/model/build-model.js';
import { surveyPrior } from '../src/model/survey-prior.js';
import { maximizeModel, type MaximizeOptions } from '../src/model/maximize-model.js';
import type { HmmModel, TransitionMode } from '../src/model/hmm-model.js';
import type { RunReadings } from '../src/fit/em-iteration.js';

const ALL_SIZES = Object.keys(SCENARIO_SIZES) as ScenarioSize[];
/** Sizes run when --sizes is not given (xlarge takes hours here: `bench/xlarge-fit.ts` measures it). */
const DEFAULT_SIZES: ScenarioSize[] = ['small', 'medium', 'large'];
const ALL_PEERS: PeerName[] = ['ghmm', 'pomegranate'];
const EM_ITERATIONS = 20;
const PRIOR_STRENGTH = 10;
const FIT_HIT = 0.8;
const FIT_DWELL = 0.5;
/** Runs per E-step block, as `fit` uses by default. */
const BLOCK_SIZE = 8;
/** Relative difference of the total log-likelihood allowed between underfoot and a peer. */
const AGREEMENT = 1e-8;

interface Options {
  sizes: ScenarioSize[];
  seed: number;
  peers: PeerName[];
  ghmmIterations: number[];
  pomegranateIterations: number[];
}

/** One table row. `peerOp` names the peer operation it is compared with. */
interface Row {
  size: string;
  cells: number;
  nnz: number;
  shape: string;
  operation: string;
  seconds: number;
  cpuSeconds: number | null;
  /** Passes over all runs (20 for twenty EM iterations); null for rows with no per-step-link figure. */
  passes: number | null;
  totalSteps: number;
  rssMB: number;
  peerOp: 'score' | 'viterbi' | 'baum-welch' | null;
  versus: Partial<Record<PeerName, number>>;
  check: string;
}

function usage(message: string): never {
  process.stderr.write(
    `run-bench: ${message}\nusage: node dist/bench/run-bench.js [--sizes small,medium,large] [--seed N] [--peers ghmm,pomegranate|none]` +
      ` [--ghmm-iterations 1,3] [--pomegranate-iterations 1]\n`,
  );
  process.exit(2);
}

function parseList(name: string, text: string): number[] {
  const list = text.split(',').map((s) => Number(s.trim()));
  if (list.length === 0 || list.some((k) => !(Number.isInteger(k) && k > 0))) usage(`--${name} must list positive integers, got ${JSON.stringify(text)}`);
  return list;
}

function parseOptions(argv: string[]): Options {
  let values: Record<string, string | undefined>;
  try {
    ({ values } = parseArgs({
      args: argv,
      options: {
        sizes: { type: 'string' },
        seed: { type: 'string' },
        peers: { type: 'string' },
        'ghmm-iterations': { type: 'string' },
        'pomegranate-iterations': { type: 'string' },
      },
      strict: true,
    }));
  } catch (err) {
    usage((err as Error).message);
  }
  const sizes = (values.sizes ?? DEFAULT_SIZES.join(',')).split(',').map((s) => s.trim()).filter((s) => s !== '');
  for (const s of sizes) if (!(ALL_SIZES as string[]).includes(s)) usage(`--sizes must list ${ALL_SIZES.join(', ')}, got ${JSON.stringify(s)}`);
  if (sizes.length === 0) usage('--sizes must list at least one size, got nothing');
  const seed = values.seed === undefined ? 1 : Number(values.seed);
  if (!Number.isSafeInteger(seed)) usage(`--seed must be an integer, got ${JSON.stringify(values.seed)}`);
  const peerText = values.peers ?? ALL_PEERS.join(',');
  const peers = peerText === 'none' ? [] : peerText.split(',').map((s) => s.trim());
  for (const p of peers) if (!(ALL_PEERS as string[]).includes(p)) usage(`--peers must list ${ALL_PEERS.join(', ')} or be none, got ${JSON.stringify(p)}`);
  return {
    sizes: sizes as ScenarioSize[],
    seed,
    peers: peers as PeerName[],
    ghmmIterations: parseList('ghmm-iterations', values['ghmm-iterations'] ?? '1,3'),
    pomegranateIterations: parseList('pomegranate-iterations', values['pomegranate-iterations'] ?? '1'),
  };
}

function peakRssMB(): number {
  return process.resourceUsage().maxRSS / 1024; // maxRSS is in kilobytes
}

async function timed<T>(fn: () => T | Promise<T>): Promise<{ seconds: number; cpuSeconds: number; value: T }> {
  const cpu0 = process.cpuUsage();
  const t0 = process.hrtime.bigint();
  const value = await fn();
  const seconds = Number(process.hrtime.bigint() - t0) / 1e9;
  const cpu = process.cpuUsage(cpu0);
  return { seconds, cpuSeconds: (cpu.user + cpu.system) / 1e6, value };
}

function countReadings(runs: ReadonlyArray<RunReadings>): number {
  let n = 0;
  for (const run of runs) for (let t = 0; t < run.obs.length; t++) if (run.obs[t] >= 0) n++;
  return n;
}

function toBlocks(nRuns: number): number[][] {
  const blocks: number[][] = [];
  for (let a = 0; a < nRuns; a += BLOCK_SIZE) blocks.push(Array.from({ length: Math.min(BLOCK_SIZE, nRuns - a) }, (_, k) => a + k));
  return blocks;
}

/** Σ log P(readings) of all runs, as `fit` scores held-out runs. */
async function scoreAll(model: HmmModel, packed: PackedRuns, blocks: number[][]): Promise<number> {
  const engine = new LocalEngine(packed);
  let total = 0;
  for (const b of await engine.score(model, blocks)) total += b.logLik;
  return total;
}

/** Σ log P(Viterbi path, readings) over all runs. */
function viterbiAll(model: HmmModel, runs: ReadonlyArray<RunReadings>): number {
  const chain = chainFromModel(model);
  const log = logChain(chain);
  let total = 0;
  for (const run of runs) total += viterbiPath(chain, log, run.obs, 64 * 1024 * 1024, new Int32Array(run.obs.length));
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

/** Σ log P(Viterbi path, readings) over all runs, in lane groups of 8 (`decodeLanes`, Viterbi only), as `decode` groups them. */
function viterbiLanesAll(model: HmmModel, runs: ReadonlyArray<RunReadings>): number {
  const chain = chainFromModel(model);
  const lanes = logLanes(chain, logChain(chain));
  let total = 0;
  for (let g = 0; g < runs.length; g += BLOCK_SIZE) {
    for (const d of decodeLanes(chain, lanes, runs.slice(g, g + BLOCK_SIZE).map((r) => r.obs), { viterbiOnly: true })) total += d.pathLogProb;
  }
  return total;
}

/**
 * Decodes all runs with every annotated column (Viterbi, posteriors, entropy, surprise, area and position
 * summaries), one run at a time (`decodeRun`) or in lane groups of 8 (`decodeLanes`, as `decode` does);
 * returns Σ entropy over all steps (the same, bit for bit, both ways).
 */
function decodeFullAll(model: HmmModel, runs: ReadonlyArray<RunReadings>, lanes: boolean): number {
  const chain = chainFromModel(model);
  const log = logChain(chain);
  const positions = positionLayout(model).groups;
  let total = 0;
  const add = (d: DecodedRun): void => {
    for (let t = 0; t < d.entropyBits.length; t++) total += d.entropyBits[t];
  };
  if (!lanes) for (const run of runs) add(decodeRun(chain, log, run.obs, { positions }));
  else {
    const tables = logLanes(chain, log);
    for (let g = 0; g < runs.length; g += BLOCK_SIZE) decodeLanes(chain, tables, runs.slice(g, g + BLOCK_SIZE).map((r) => r.obs), { positions }).forEach(add);
  }
  return total;
}

/**
 * `iterations` Baum-Welch iterations the way `fit` does them in one thread (blocks of 8 runs through
 * `LocalEngine`, reduced in block order, then `maximizeModel`); returns the log-likelihood of the model
 * that went into the last iteration.
 */
async function baumWelch(start: HmmModel, packed: PackedRuns, blocks: number[][], options: MaximizeOptions & { mode: TransitionMode }, iterations: number): Promise<number> {
  const engine = new LocalEngine(packed, { mode: options.mode });
  let model = start;
  let logLik = NaN;
  for (let k = 0; k < iterations; k++) {
    const counts = reduceBlocks(model, packed, await engine.counts(model, blocks));
    logLik = counts.logLik;
    model = maximizeModel(model, counts, options);
  }
  return logLik;
}

function fitSetup(scenario: Scenario): { start: HmmModel; prior: Float64Array } {
  const start = buildModel(scenario.floor, { dwell: FIT_DWELL, hit: FIT_HIT });
  const index = new Map(scenario.floor.surfaces.map((s, r) => [s, r] as const));
  const surfaceOfCell = Int32Array.from(scenario.floor.cells, (c) => index.get(c.surface) ?? -1);
  return { start, prior: surveyPrior(surfaceOfCell, scenario.floor.surfaces.length, FIT_HIT) };
}

/** Runs every operation once on a few short runs so the timed passes do not include the JIT's first compilation. */
async function warmUp(seed: number): Promise<void> {
  const s = makeScenario('small', seed);
  const runs = s.runs.slice(0, 10).map((r) => ({ id: r.id, obs: r.obs.subarray(0, 200) }));
  const paths = s.truePaths.slice(0, 10).map((p) => p.subarray(0, 200));
  const packed = packRuns(runs);
  const blocks = toBlocks(runs.length);
  const { start, prior } = fitSetup(s);
  await scoreAll(start, packed, blocks);
  viterbiAll(start, runs);
  viterbiLanesAll(start, runs);
  decodeAll(start, runs, paths);
  decodeFullAll(start, runs, false);
  decodeFullAll(start, runs, true);
  await baumWelch(start, packed, blocks, { mode: 'tied', priorStrength: PRIOR_STRENGTH, prior }, 2);
  await baumWelch(start, packed, blocks, { mode: 'learned', priorStrength: 0 }, 2);
}

async function benchSize(size: ScenarioSize, o: Options): Promise<{ rows: Row[]; agreement: string[]; ok: boolean }> {
  const made = await timed(() => makeScenario(size, o.seed));
  const s = made.value;
  const spec = SCENARIO_SIZES[size];
  const totalSteps = s.runs.reduce((k, r) => k + r.obs.length, 0);
  const nReadings = countReadings(s.runs);
  const base = { size, cells: s.floor.cells.length, nnz: s.truth.structure.nnz, shape: `${spec.nRuns} x ${spec.nSteps}`, totalSteps };
  const rows: Row[] = [];
  const add = (operation: string, t: { seconds: number; cpuSeconds: number }, passes: number | null, peerOp: Row['peerOp'], check: string): void => {
    rows.push({ ...base, operation, seconds: t.seconds, cpuSeconds: t.cpuSeconds, passes, rssMB: peakRssMB(), peerOp, versus: {}, check });
  };
  add('make scenario', made, null, null, `${s.floor.links.length} links`);

  const { start, prior } = fitSetup(s);
  const packed = packRuns(s.runs);
  const blocks = toBlocks(s.runs.length);
  const score = await timed(() => scoreAll(start, packed, blocks));
  add('score (forward)', score, 1, 'score', `loglik/reading ${(score.value / nReadings).toFixed(6)}`);
  const viterbi = await timed(() => viterbiAll(start, s.runs));
  add('Viterbi', viterbi, 1, 'viterbi', `path log P ${viterbi.value.toFixed(3)}`);
  const viterbiLanes = await timed(() => viterbiLanesAll(start, s.runs));
  add('Viterbi (lanes of 8)', viterbiLanes, 1, 'viterbi', `path log P ${viterbiLanes.value.toFixed(3)}${viterbiLanes.value === viterbi.value ? ' (same)' : ' DIFFERS'}`);
  const decode = await timed(() => decodeAll(start, s.runs, s.truePaths));
  add('decode (Viterbi+posteriors)', decode, 1, null, `path = true cell ${(100 * decode.value).toFixed(1)}%`);
  const full = await timed(() => decodeFullAll(start, s.runs, false));
  add('decode, all columns (one run at a time)', full, 1, null, `sum entropy ${full.value.toFixed(3)} bits`);
  const fullLanes = await timed(() => decodeFullAll(start, s.runs, true));
  add('decode, all columns (lanes of 8)', fullLanes, 1, null, `sum entropy ${fullLanes.value.toFixed(3)} bits${fullLanes.value === full.value ? ' (same)' : ' DIFFERS'}`);
  const tied = { mode: 'tied' as const, priorStrength: PRIOR_STRENGTH, prior };
  const em1 = await timed(() => baumWelch(start, packed, blocks, tied, 1));
  add('Baum-Welch x1 (tied, prior)', em1, 1, 'baum-welch', `loglik/reading ${(em1.value / nReadings).toFixed(4)} (start)`);
  const em20 = await timed(() => baumWelch(start, packed, blocks, tied, EM_ITERATIONS));
  add(`Baum-Welch x${EM_ITERATIONS} (tied, prior)`, em20, EM_ITERATIONS, 'baum-welch', `loglik/reading ${(em20.value / nReadings).toFixed(4)} (iter ${EM_ITERATIONS})`);
  const learned = { mode: 'learned' as const, priorStrength: 0 };
  const plain = await timed(() => baumWelch(start, packed, blocks, learned, 1));
  add('Baum-Welch x1 (learned, no prior)', plain, 1, 'baum-welch', `loglik/reading ${(plain.value / nReadings).toFixed(4)} (start)`);
  const plain20 = await timed(() => baumWelch(start, packed, blocks, learned, EM_ITERATIONS));
  add(`Baum-Welch x${EM_ITERATIONS} (learned, no prior)`, plain20, EM_ITERATIONS, 'baum-welch', `loglik/reading ${(plain20.value / nReadings).toFixed(4)} (iter ${EM_ITERATIONS})`);

  // Peers: the same start model and runs.
  const agreement: string[] = [];
  let ok = true;
  for (const peer of o.peers) {
    process.stderr.write(`  ${size}: ${peer}…\n`);
    const calls = peer === 'ghmm' ? o.ghmmIterations : o.pomegranateIterations;
    const res: PeerResult = runPeer(peer, peerInput(start, s.runs.map((r) => r.obs), calls));
    if (!res.ran) {
      rows.push({ ...base, operation: `${peer}: skipped — ${res.reason}`, seconds: NaN, cpuSeconds: null, passes: null, rssMB: NaN, peerOp: null, versus: {}, check: '' });
      continue;
    }
    const peerRow = (operation: string, seconds: number, passes: number, check: string): void => {
      rows.push({ ...base, operation, seconds, cpuSeconds: null, passes, rssMB: res.rssMB, peerOp: null, versus: {}, check });
    };
    peerRow(`${peer} score (forward)`, res.scoreSeconds, 1, `loglik/reading ${(res.logLik / nReadings).toFixed(6)}`);
    peerRow(`${peer} Viterbi`, res.viterbiSeconds, 1, `path log P ${res.pathLogProb.toFixed(3)}`);
    for (const call of res.baumWelch) peerRow(`${peer} Baum-Welch x${call.iterations}`, call.seconds, call.iterations, 'learned, no prior');
    for (const row of rows) {
      if (row.peerOp === null || row.passes === null) continue;
      const ours = row.seconds / row.passes;
      const theirs = row.peerOp === 'score' ? res.scoreSeconds : row.peerOp === 'viterbi' ? res.viterbiSeconds : res.secondsPerIteration;
      row.versus[peer] = theirs / ours;
    }
    const relLik = Math.abs(res.logLik - score.value) / Math.abs(score.value);
    const relPath = Math.abs(res.pathLogProb - viterbi.value) / Math.abs(viterbi.value);
    const agrees = relLik <= AGREEMENT && relPath <= AGREEMENT;
    ok &&= agrees;
    agreement.push(
      `${size}: ${peer} ${agrees ? 'agrees' : 'DISAGREES'} — total log-likelihood ${res.logLik} vs underfoot ${score.value} (relative difference ${relLik.toExponential(2)}), ` +
        `Viterbi path log P ${res.pathLogProb} vs ${viterbi.value} (${relPath.toExponential(2)}); limit ${AGREEMENT}`,
    );
  }
  return { rows, agreement, ok };
}

function formatTable(rows: Row[], peers: PeerName[]): string {
  const header = ['size', 'cells', 'nnz', 'runs x steps', 'operation', 'wall s', 'cpu s', 'ns/step-link', 'peak RSS MB', ...peers.map((p) => `x ${p}`), 'check'];
  const body = rows.map((r) => [
    r.size,
    String(r.cells),
    String(r.nnz),
    r.shape,
    r.operation,
    Number.isNaN(r.seconds) ? '-' : r.seconds.toFixed(3),
    r.cpuSeconds === null ? '-' : r.cpuSeconds.toFixed(3),
    r.passes === null ? '-' : ((r.seconds * 1e9) / (r.passes * r.totalSteps * r.nnz)).toFixed(2),
    Number.isNaN(r.rssMB) ? '-' : r.rssMB.toFixed(0),
    ...peers.map((p) => (r.versus[p] === undefined ? '-' : `${r.versus[p]!.toFixed(1)}x`)),
    r.check,
  ]);
  const widths = header.map((h, c) => Math.max(h.length, ...body.map((row) => row[c].length)));
  const numeric = new Set([1, 2, 5, 6, 7, 8, ...peers.map((_, k) => 9 + k)]);
  const line = (cells: string[]): string =>
    cells.map((v, c) => (numeric.has(c) ? v.padStart(widths[c]) : v.padEnd(widths[c]))).join('  ').trimEnd();
  return [line(header), line(widths.map((w) => '-'.repeat(w))), ...body.map(line)].join('\n');
}

async function main(): Promise<void> {
  const o = parseOptions(process.argv.slice(2));
  const cpus = os.cpus();
  console.log(`underfoot bench — node ${process.version}, ${os.platform()} ${os.arch()}`);
  console.log(`cores (os.availableParallelism): ${os.availableParallelism()}; cpu: ${cpus[0]?.model ?? 'unknown'}; load average ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
  console.log(
    `sizes: ${o.sizes.join(', ')}; seed ${o.seed}; one thread; blocks of ${BLOCK_SIZE} runs; ` +
      `peers: ${o.peers.length ? o.peers.join(', ') : 'none'} (GHMM Baum-Welch calls ${o.ghmmIterations.join(',')}, pomegranate ${o.pomegranateIterations.join(',')})`,
  );
  const w = await timed(() => warmUp(o.seed + 1000));
  console.log(`warm-up: ${w.seconds.toFixed(2)} s`);
  console.log('');
  const rows: Row[] = [];
  const agreement: string[] = [];
  let ok = true;
  for (const size of o.sizes) {
    const res = await benchSize(size, o);
    rows.push(...res.rows);
    agreement.push(...res.agreement);
    ok &&= res.ok;
    process.stderr.write(`done: ${size}\n`);
  }
  console.log(formatTable(rows, o.peers));
  console.log('');
  for (const line of agreement) console.log(line);
  if (agreement.length) console.log('');
  console.log('ns/step-link = wall seconds × 1e9 / (passes × total steps × nnz); passes = 20 for "x20" rows, K for a peer\'s "xK", else 1.');
  console.log('x <peer> = the peer\'s seconds for the same operation (per Baum-Welch iteration for Baum-Welch rows) / underfoot\'s.');
  console.log('Peer Baum-Welch is plain (learned transitions, no prior); per iteration from the difference of its timed calls.');
  console.log('peak RSS = process high-water mark (process.resourceUsage().maxRSS) after the operation; for a peer, its own process.');
  if (!ok) {
    console.log('A peer disagrees with underfoot beyond the limit: the comparison is not of the same work.');
    process.exitCode = 1;
  }
}

await main();
