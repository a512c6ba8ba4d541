/**
 * Times the E-step's two passes separately on the medium scenario (a profiling aid for the kernels):
 *   npm run build && node dist/bench/kernel-split.js [runs]
 */
import { makeScenario } from './make-scenario.js';
import { chainFromModel } from '../src/model/chain-from-model.js';
import { forwardScaled } from '../src/kernels/forward-scaled.js';
import { expectedCounts } from '../src/kernels/expected-counts.js';
import { forwardScore } from '../src/kernels/forward-score.js';

const nRuns = Number(process.argv[2] ?? 40);
const sc = makeScenario('medium', 1);
const chain = chainFromModel(sc.truth);
const runs = sc.runs.slice(0, nRuns);
const n = chain.nCells;
const T = runs[0].obs.length;
const alpha = new Float64Array(n * T);
const scale = new Float64Array(T);
const work = new Float64Array(3 * n);
const start = new Float64Array(n);
const trans = new Float64Array(chain.nnz);
const emit = new Float64Array(chain.nReadings * n);
const stepLinks = runs.reduce((s, r) => s + r.obs.length, 0) * chain.nnz;
const time = (label: string, fn: () => void): void => {
  fn(); // warm-up
  const t0 = process.hrtime.bigint();
  fn();
  const ns = Number(process.hrtime.bigint() - t0);
  console.log(`${label.padEnd(28)} ${(ns / 1e9).toFixed(3)} s  ${(ns / stepLinks).toFixed(2)} ns/step-link`);
};
console.log(`medium scenario: ${n} cells, ${chain.nnz} nonzeros, ${runs.length} runs × ${T} steps`);
time('forwardScore (O(n) memory)', () => { for (const r of runs) forwardScore(chain, r.obs, r.obs.length, work); });
time('forwardScaled (stores α)', () => { for (const r of runs) forwardScaled(chain, r.obs, r.obs.length, alpha, scale); });
time('forward + expectedCounts', () => {
  for (const r of runs) {
    forwardScaled(chain, r.obs, r.obs.length, alpha, scale);
    expectedCounts(chain, r.obs, r.obs.length, alpha, scale, work, start, trans, emit);
  }
});
