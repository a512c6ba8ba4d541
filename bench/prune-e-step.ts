/**
 * The pruned E-step (`fit --prune EPS`) against the exact one on a benchmark scenario: EM from the same
 * start (tied transitions, survey prior, as `run-bench.ts`), K iterations each way. Prints, per EPS:
 * seconds per E-step (median of the timed iterations) and ns per step-link, the share of (step, cell)
 * pairs kept at the last model, the log-likelihood error of the pruned E-step at the exact fit's last
 * model against its bound B, and how far the fitted emission rows and log-likelihood per reading end
 * from the exact fit's.
 *
 *     npm run build && node dist/bench/prune-e-step.js medium 40 10 1e-9,1e-6,1e-4
 *     node dist/bench/prune-e-step.js lookalike 40 10 1e-6     # 2 surfaces only: many look-alike cells
 *
 * Exact E-steps use the lane kernels (WebAssembly when available), pruned ones the single-run kernels.
 */
import os from 'node:os';
import { makeScenario, type ScenarioSize } from './make-scenario.js';
import { chainFromModel } from '../src/model/chain-from-model.js';
import { LocalEngine } from '../src/fit/local-engine.js';
import { packRuns, type PackedRuns } from '../src/fit/packed-runs.js';
import { reduceBlocks } from '../src/fit/reduce-blocks.js';
import { buildModel } from '../src/model/build-model.js';
import { surveyPrior } from '../src/model/survey-prior.js';
import { maximizeModel, type MaximizeOptions } from '../src/model/maximize-model.js';
import type { HmmModel } from '../src/model/hmm-model.js';
import type { FloorGraph } from '../src/model/floor-graph.js';
import { sampleRun } from '../src/model/sample-run.js';
import { SeededRandom } from '../src/model/seeded-random.js';
import { forwardPruned } from '../src/kernels/forward-pruned.js';
import { forwardScore } from '../src/kernels/forward-score.js';

const size = (process.argv[2] ?? 'medium') as ScenarioSize | 'lookalike';
const nRuns = Number(process.argv[3] ?? 40);
const iterations = Number(process.argv[4] ?? 10);
const epsList = (process.argv[5] ?? '1e-9,1e-6,1e-4').split(',').map(Number);

function scenario(): { floor: FloorGraph; runs: Array<{ id: string; obs: Int32Array }> } {
  if (size !== 'lookalike') {
    const s = makeScenario(size, 1);
    return { floor: s.floor, runs: s.runs.slice(0, nRuns) };
  }
  // The medium building with two surfaces only (alternating rooms/corridors keep their pattern): most
  // cells look like hundreds of others, so the forward mass spreads.
  const s = makeScenario('medium', 1);
  const surfaces = ['oak', 'tile'];
  const floor: FloorGraph = { ...s.floor, surfaces, cells: s.floor.cells.map((c) => ({ ...c, surface: surfaces[s.floor.surfaces.indexOf(c.surface) % 2] })) };
  const truth = buildModel(floor, { dwell: 0.6, hit: 0.8 });
  const rng = new SeededRandom(11);
  return { floor, runs: Array.from({ length: nRuns }, (_, r) => ({ id: `r${r}`, obs: sampleRun(truth, 2000, rng, 0.02).obs })) };
}

const { floor, runs } = scenario();
const start = buildModel(floor, { dwell: 0.5, hit: 0.8 });
const index = new Map(floor.surfaces.map((x, r) => [x, r] as const));
const prior = surveyPrior(Int32Array.from(floor.cells, (c) => index.get(c.surface) ?? -1), floor.surfaces.length, 0.8);
const options: MaximizeOptions = { mode: 'tied', priorStrength: 10, prior };
const packed: PackedRuns = packRuns(runs);
const blocks: number[][] = [];
for (let r = 0; r < runs.length; r += 8) blocks.push(Array.from({ length: Math.min(8, runs.length - r) }, (_, k) => r + k));
const totalSteps = runs.reduce((k, r) => k + r.obs.length, 0);
const nReadings = runs.reduce((k, r) => k + r.obs.filter((o) => o >= 0).length, 0);

async function em(prune: number): Promise<{ model: HmmModel; logLik: number; secondsPerStep: number }> {
  const engine = new LocalEngine(packed, { mode: 'tied', prune });
  let model = start;
  let logLik = NaN;
  const times: number[] = [];
  for (let k = 0; k < iterations; k++) {
    const t0 = process.hrtime.bigint();
    const counts = reduceBlocks(model, packed, await engine.counts(model, blocks));
    times.push(Number(process.hrtime.bigint() - t0) / 1e9);
    logLik = counts.logLik;
    model = maximizeModel(model, counts, options);
  }
  times.sort((a, b) => a - b);
  return { model, logLik, secondsPerStep: times[times.length >> 1] };
}

/** Share of (step, cell) pairs kept, L̂ − log P and the bound B summed over runs, at `model`. */
function pruneStats(model: HmmModel, eps: number): { kept: number; error: number; bound: number } {
  const chain = chainFromModel(model);
  const n = chain.nCells;
  let kept = 0;
  let error = 0;
  let bound = 0;
  const T = Math.max(...runs.map((r) => r.obs.length));
  let capacity = T * Math.min(n, 256);
  let keptIdx = new Int32Array(capacity);
  let keptVal = new Float64Array(capacity);
  const keptPtr = new Int32Array(T + 1);
  const out = new Float64Array(1);
  const acc = new Float64Array(n);
  const mark = new Uint8Array(n);
  const cand = new Int32Array(n + 1);
  const scale = new Float64Array(T);
  for (const r of runs) {
    let lp = forwardPruned(chain, r.obs, eps, scale, keptIdx, keptVal, keptPtr, acc, mark, cand, out);
    while (Number.isNaN(lp)) {
      capacity *= 2;
      keptIdx = new Int32Array(capacity);
      keptVal = new Float64Array(capacity);
      lp = forwardPruned(chain, r.obs, eps, scale, keptIdx, keptVal, keptPtr, acc, mark, cand, out);
    }
    kept += keptPtr[r.obs.length];
    error += lp - forwardScore(chain, r.obs, r.obs.length, new Float64Array(2 * n));
    bound += out[0];
  }
  return { kept: kept / (totalSteps * n), error, bound };
}

const nnz = start.structure.nnz;
console.log(`prune-e-step — ${size}, ${floor.cells.length} cells, nnz ${nnz}, ${runs.length} runs, ${totalSteps} steps, ${iterations} EM iterations (tied, prior 10); load average ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
const exact = await em(0);
const ns = (s: number): string => ((s * 1e9) / (totalSteps * nnz)).toFixed(2);
console.log(`exact : ${exact.secondsPerStep.toFixed(3)} s per E-step, ${ns(exact.secondsPerStep)} ns/step-link; loglik/reading ${(exact.logLik / nReadings).toFixed(6)}`);
for (const eps of epsList) {
  const pr = await em(eps);
  const st = pruneStats(exact.model, eps);
  let maxRow = 0;
  for (let x = 0; x < pr.model.emission.length; x++) maxRow = Math.max(maxRow, Math.abs(pr.model.emission[x] - exact.model.emission[x]));
  console.log(
    `eps ${eps}: ${pr.secondsPerStep.toFixed(3)} s per E-step, ${ns(pr.secondsPerStep)} ns/step-link (×${(exact.secondsPerStep / pr.secondsPerStep).toFixed(2)} vs exact); ` +
      `kept ${(100 * st.kept).toFixed(2)} % of (step, cell); at the exact fit's model L̂ − log P = ${st.error.toExponential(2)} (bound B = ${st.bound.toExponential(2)}, T·eps = ${(totalSteps * eps).toExponential(2)}); ` +
      `after ${iterations} iterations: loglik/reading ${(pr.logLik / nReadings).toFixed(6)} (Δ ${((pr.logLik - exact.logLik) / nReadings).toExponential(2)}), max |Δ emission| ${maxRow.toExponential(2)}`,
  );
}
