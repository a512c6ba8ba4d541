import { describe, it, expect } from 'vitest';
import { randomModel } from '../helpers/random-model.js';
import { expectClose } from '../helpers/close.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { logChain } from '../../src/decode/log-chain.js';
import { forwardScaled } from '../../src/kernels/forward-scaled.js';
import { forwardSegment } from '../../src/kernels/forward-segment.js';
import { viterbiLog } from '../../src/kernels/viterbi-log.js';
import { viterbiSegment } from '../../src/kernels/viterbi-segment.js';
import { posteriorSummary } from '../../src/kernels/posterior-summary.js';
import { posteriorSummarySegment } from '../../src/kernels/posterior-summary-segment.js';
import { segmentSteps } from '../../src/kernels/segment-steps.js';
import { equalSplitTransitions } from '../../src/model/equal-split-transitions.js';

// Oracle: the one-pass kernels `forwardScaled`, `viterbiLog` and `posteriorSummary` (Rabiner 1989,
// Proc. IEEE 77(2), eqs. 19–20, 24–27 and 32–35; Viterbi 1967), which test/reference checks against
// pomegranate fixtures and brute force. Models and runs are invented (seeded random).

const model = randomModel(12, { nCells: 11, nReadings: 5, linksPerCell: 3, startShare: 0.4 });
const chain = chainFromModel(model);
const n = chain.nCells;
const obs = sampleRun(model, 301, new SeededRandom(5), 0.15).obs;
const T = obs.length;

describe('segment kernels', () => {
  it('forwardSegment run in segments of 7 (row 0 carrying the previous segment) equals one pass, and log P matches forwardScaled', () => {
    const whole = new Float64Array((T + 1) * n);
    const scaleWhole = new Float64Array(T);
    const logWhole = forwardSegment(chain, obs, 0, T, whole, scaleWhole, 0);
    const B = 7;
    const table = new Float64Array((B + 1) * n);
    const scale = new Float64Array(T);
    let logP = 0;
    for (let a = 0; a < T; a += B) {
      if (a > 0) table.copyWithin(0, B * n, (B + 1) * n);
      logP = forwardSegment(chain, obs, a, Math.min(T, a + B), table, scale, logP);
      const b = Math.min(T, a + B);
      for (let t = a; t < b; t++) {
        for (let i = 0; i < n; i++) expect(table[(t - a + 1) * n + i]).toBe(whole[(t + 1) * n + i]);
      }
    }
    expect(logP).toBe(logWhole);
    expect(Array.from(scale)).toEqual(Array.from(scaleWhole));
    const ref = forwardScaled(chain, obs, T, new Float64Array(n * T), new Float64Array(T));
    expectClose(logWhole, ref, { rel: 1e-12 }, 'log P');
  });

  it('forwardSegment normalised (c_t u_t) equals forwardScaled α̂ (≤ 1e-12)', () => {
    const table = new Float64Array((T + 1) * n);
    const scale = new Float64Array(T);
    forwardSegment(chain, obs, 0, T, table, scale, 0);
    const alpha = new Float64Array(n * T);
    forwardScaled(chain, obs, T, alpha, new Float64Array(T));
    for (let t = 0; t < T; t++) for (let i = 0; i < n; i++) expectClose(table[(t + 1) * n + i] * scale[t], alpha[t * n + i], { abs: 1e-12 }, `t ${t} i ${i}`);
  });

  it('viterbiSegment in segments of 13 gives viterbiLog’s scores and back-pointers, ties included', () => {
    const log = logChain(chain);
    const back = new Int32Array(T * n);
    const path = new Int32Array(T);
    const best = viterbiLog(n, chain.nReadings, log.logStart, chain.predPtr, chain.predIdx, log.logPredProb, log.logEmitT, obs, T, new Float64Array(2 * n), back, path);
    const B = 13;
    const logDwell = Float64Array.from(chain.dwell, Math.log);
    const logInProb = Float64Array.from(chain.inProb, Math.log);
    const delta = new Float64Array(2 * n);
    const segBack = new Int32Array(B * n);
    for (let a = 0; a < T; a += B) {
      const b = Math.min(T, a + B);
      viterbiSegment(n, chain.nReadings, log.logStart, logDwell, chain.inPtr, chain.inIdx, logInProb, log.logEmitT, obs, a, b, delta, segBack);
      for (let t = Math.max(a, 1); t < b; t++) for (let j = 0; j < n; j++) expect(segBack[(t - a) * n + j]).toBe(back[t * n + j]);
    }
    let top = -Infinity;
    for (let j = 0; j < n; j++) top = Math.max(top, delta[j]);
    expect(top).toBe(best);
  });

  it('viterbiSegment breaks exact ties like viterbiLog (lowest cell index), with the dwell taken first', () => {
    // Equal-split transitions (dwell 0.1, below the links) and one shared emission row: predecessors tie exactly.
    const flat = { ...model, trans: equalSplitTransitions(model.structure, 0.1), emission: Float64Array.from({ length: n * 5 }, (_, x) => [0.1, 0.2, 0.3, 0.15, 0.25][x % 5]), start: new Float64Array(n).fill(1 / n) };
    const c = chainFromModel(flat);
    const log = logChain(c);
    const back = new Int32Array(T * n);
    const path = new Int32Array(T);
    const best = viterbiLog(n, c.nReadings, log.logStart, c.predPtr, c.predIdx, log.logPredProb, log.logEmitT, obs, T, new Float64Array(2 * n), back, path);
    const delta = new Float64Array(2 * n);
    const segBack = new Int32Array(T * n);
    viterbiSegment(n, c.nReadings, log.logStart, Float64Array.from(c.dwell, Math.log), c.inPtr, c.inIdx, Float64Array.from(c.inProb, Math.log), log.logEmitT, obs, 0, T, delta, segBack);
    // At step 1 every δ_0 is equal, so a cell's best predecessors tie whenever two of them share the best
    // transition probability: make sure the case exercises ties at all.
    let tiedCells = 0;
    for (let j = 0; j < n; j++) {
      const scores: number[] = [];
      for (let p = c.predPtr[j]; p < c.predPtr[j + 1]; p++) scores.push(log.logPredProb[p]);
      const top = Math.max(...scores);
      if (scores.filter((v) => v === top).length > 1) tiedCells++;
    }
    expect(tiedCells).toBeGreaterThan(0);
    for (let t = 1; t < T; t++) for (let j = 0; j < n; j++) expect(segBack[t * n + j], `ψ ${t} ${j}`).toBe(back[t * n + j]);
    let top = -Infinity;
    for (let j = 0; j < n; j++) top = Math.max(top, delta[j]);
    expect(top).toBe(best);
  });

  it('posteriorSummarySegment in segments of 10 gives posteriorSummary’s figures (≤ 1e-12)', () => {
    const path = Int32Array.from({ length: T }, (_, t) => (t * 7) % n);
    const alpha = new Float64Array(n * T);
    const scaleRef = new Float64Array(T);
    forwardScaled(chain, obs, T, alpha, scaleRef);
    const ref = { cell: new Int32Array(T), p: new Float64Array(T), pathP: new Float64Array(T), h: new Float64Array(T) };
    posteriorSummary(chain, obs, T, alpha, scaleRef, path, new Float64Array(2 * n), ref.cell, ref.p, ref.pathP, ref.h);

    const B = 10;
    const nSeg = Math.ceil(T / B);
    const table = new Float64Array((B + 1) * n);
    const scale = new Float64Array(T);
    const checkpoints = new Float64Array(nSeg * n);
    for (let g = 0; g < nSeg; g++) {
      if (g > 0) {
        table.copyWithin(0, B * n, (B + 1) * n);
        checkpoints.set(table.subarray(0, n), g * n);
      }
      forwardSegment(chain, obs, g * B, Math.min(T, (g + 1) * B), table, scale, 0);
    }
    const got = { cell: new Int32Array(T), p: new Float64Array(T), pathP: new Float64Array(T), h: new Float64Array(T) };
    const w = new Float64Array(n);
    const wSpare = new Float64Array(n);
    for (let g = nSeg - 1; g >= 0; g--) {
      const a = g * B;
      const b = Math.min(T, a + B);
      if (g < nSeg - 1) {
        if (g > 0) table.set(checkpoints.subarray(g * n, (g + 1) * n), 0);
        forwardSegment(chain, obs, a, b, table, scale, 0);
      }
      posteriorSummarySegment(chain, obs, a, b, table, scale, path, w, wSpare, got.cell, got.p, got.pathP, got.h);
    }
    for (let t = 0; t < T; t++) {
      expectClose(got.p[t], ref.p[t], { abs: 1e-12 }, `likely p ${t}`);
      expectClose(got.pathP[t], ref.pathP[t], { abs: 1e-12 }, `path p ${t}`);
      expectClose(got.h[t], ref.h[t], { abs: 1e-12 }, `entropy ${t}`);
      // The argmax may differ only between cells whose posteriors tie to rounding.
      if (got.cell[t] !== ref.cell[t]) expectClose(got.p[t], ref.p[t], { abs: 1e-15 }, `tie at ${t}`);
    }
  });

  it('segmentSteps(nSteps, rowBytes, limit) is the whole run when it fits, else as long as the limit allows but ≥ ⌈√nSteps⌉', () => {
    expect(segmentSteps(1000, 8, 8 * 1001)).toBe(1000);
    expect(segmentSteps(1000, 8, 8 * 1000)).toBe(999);
    expect(segmentSteps(1000, 8, 8 * 400)).toBe(399);
    expect(segmentSteps(1000, 8, 8 * 10)).toBe(32);
    expect(segmentSteps(1000, 8, 0)).toBe(32);
    expect(segmentSteps(1_000_000, 3200, 0)).toBe(1000);
    expect(segmentSteps(0, 8, 0)).toBe(1);
  });
});
