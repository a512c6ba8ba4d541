import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { fcSeed } from '../helpers/fc-seed.js';
import { randomModel, denseTransitions } from '../helpers/random-model.js';
import { expectClose } from '../helpers/close.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { forwardScaled } from '../../src/kernels/forward-scaled.js';
import { backwardScaled } from '../../src/kernels/backward-scaled.js';
import { forwardPruned } from '../../src/kernels/forward-pruned.js';
import { emptyCounts } from '../../src/model/expected-counts-table.js';
import { EStepWorkspace } from '../../src/fit/e-step-workspace.js';
import { addPrunedRunCounts } from '../../src/fit/add-pruned-run-counts.js';
import { addRunCounts } from '../../src/fit/add-run-counts.js';
import type { HmmModel } from '../../src/model/hmm-model.js';

// Oracles: the exact scaled forward-backward kernels (`forwardScaled`, `backwardScaled`; Rabiner 1989,
// Proc. IEEE 77(2), eqs. 19–27) and, for the counts, a dense forward-backward written here over the
// masked model (emissions at step t zeroed outside the cells `forwardPruned` kept). Models and runs are
// invented (seeded random).

const params = { seed: fcSeed, numRuns: 80 };

const scenario = fc.record({
  seed: fc.integer({ min: 1, max: 2 ** 30 }),
  nCells: fc.integer({ min: 1, max: 30 }),
  nReadings: fc.integer({ min: 2, max: 6 }),
  nSteps: fc.integer({ min: 1, max: 150 }),
  links: fc.integer({ min: 1, max: 4 }),
  dropout: fc.constantFrom(0, 0.2),
  eps: fc.constantFrom(0, 1e-9, 1e-6, 1e-4, 1e-2, 0.1),
  /** Low emission floor: sharper rows, more cells dropped. */
  floor: fc.constantFrom(0.02, 0.001),
});

interface Pruned {
  logP: number;
  bound: number;
  kept: boolean[][];
}

function runPruned(model: HmmModel, obs: Int32Array, eps: number): Pruned {
  const chain = chainFromModel(model);
  const n = chain.nCells;
  const T = obs.length;
  const keptIdx = new Int32Array(T * n);
  const keptPtr = new Int32Array(T + 1);
  const out = new Float64Array(1);
  const logP = forwardPruned(chain, obs, eps, new Float64Array(T), keptIdx, new Float64Array(T * n), keptPtr, new Float64Array(n), new Uint8Array(n), new Int32Array(n + 1), out);
  const kept = Array.from({ length: T }, (_, t) => {
    const row = new Array<boolean>(n).fill(false);
    for (let k = keptPtr[t]; k < keptPtr[t + 1]; k++) row[keptIdx[k]] = true;
    return row;
  });
  return { logP, bound: out[0], kept };
}

/** Exact log P and posteriors γ_t(i) (steps × cells). */
function exact(model: HmmModel, obs: Int32Array): { logP: number; gamma: number[][] } {
  const chain = chainFromModel(model);
  const n = chain.nCells;
  const T = obs.length;
  const alpha = new Float64Array(T * n);
  const scale = new Float64Array(T);
  const logP = forwardScaled(chain, obs, T, alpha, scale);
  const beta = new Float64Array(T * n);
  backwardScaled(chain, obs, T, scale, beta);
  return { logP, gamma: Array.from({ length: T }, (_, t) => Array.from({ length: n }, (_, i) => alpha[t * n + i] * beta[t * n + i])) };
}

/** Dense E-step of the masked model: start, transition (dense) and emission (cells × readings) counts. */
function maskedCounts(model: HmmModel, obs: Int32Array, kept: boolean[][]): { start: number[]; trans: number[][]; emit: number[][] } {
  const n = model.cells.length;
  const m = model.surfaces.length;
  const T = obs.length;
  const a = denseTransitions(model);
  const b = (i: number, t: number): number => (kept[t][i] ? (obs[t] < 0 ? 1 : model.emission[i * m + obs[t]]) : 0);
  const alpha: number[][] = [];
  for (let t = 0; t < T; t++) {
    const row = Array.from({ length: n }, (_, j) => (t === 0 ? model.start[j] : alpha[t - 1].reduce((s, x, i) => s + x * a[i][j], 0)) * b(j, t));
    const s = row.reduce((x, y) => x + y, 0);
    alpha.push(row.map((x) => x / s));
  }
  const beta: number[][] = new Array(T);
  beta[T - 1] = new Array(n).fill(1);
  for (let t = T - 2; t >= 0; t--) {
    const row = Array.from({ length: n }, (_, i) => a[i].reduce((s, x, j) => s + x * b(j, t + 1) * beta[t + 1][j], 0));
    const s = row.reduce((x, y) => x + y, 0);
    beta[t] = row.map((x) => x / s);
  }
  const start = new Array(n).fill(0);
  const trans = Array.from({ length: n }, () => new Array(n).fill(0));
  const emit = Array.from({ length: n }, () => new Array(m).fill(0));
  for (let t = 0; t < T; t++) {
    const g = alpha[t].map((x, i) => x * beta[t][i]);
    const gs = g.reduce((x, y) => x + y, 0);
    for (let i = 0; i < n; i++) {
      if (t === 0) start[i] += g[i] / gs;
      if (obs[t] >= 0) emit[i][obs[t]] += g[i] / gs;
    }
    if (t + 1 < T) {
      let xs = 0;
      const xi = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (xs += alpha[t][i] * a[i][j] * b(j, t + 1) * beta[t + 1][j], alpha[t][i] * a[i][j] * b(j, t + 1) * beta[t + 1][j])));
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) trans[i][j] += xi[i][j] / xs;
    }
  }
  return { start, trans, emit };
}

describe('pruned E-step (forwardPruned, backwardPruned, addPrunedRunCounts)', () => {
  it('log-likelihood within its bound: L̂ − log P ≤ B, log P − L̂ ≤ −log(1 − Γ) − B, B ≤ −T·log(1 − eps)', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const model = randomModel(s.seed, { nCells: s.nCells, nReadings: s.nReadings, linksPerCell: s.links, floor: s.floor });
        const obs = sampleRun(model, s.nSteps, new SeededRandom(s.seed ^ 0x2545f491), s.dropout).obs;
        const ex = exact(model, obs);
        const pr = runPruned(model, obs, s.eps);
        expect(pr.logP).toBeGreaterThan(-Infinity);
        const tol = 1e-10 * Math.abs(ex.logP) + 1e-12;
        expect(pr.bound).toBeGreaterThanOrEqual(0);
        expect(pr.bound).toBeLessThanOrEqual(-s.nSteps * Math.log1p(-s.eps) * (1 + 1e-12) + 1e-15);
        expect(pr.logP - ex.logP).toBeLessThanOrEqual(pr.bound + tol);
        // Γ: exact posterior of the cells not kept, summed over steps (≥ the posterior of the paths lost).
        let big = 0;
        for (let t = 0; t < s.nSteps; t++) for (let i = 0; i < s.nCells; i++) if (!pr.kept[t][i]) big += ex.gamma[t][i];
        if (big < 1) expect(ex.logP - pr.logP).toBeLessThanOrEqual(-Math.log1p(-big) - pr.bound + tol);
        if (s.eps === 0) expectClose(pr.logP, ex.logP, { rel: 1e-12, abs: 1e-12 }, 'eps 0');
      }),
      params,
    );
  });

  it('counts are the masked model’s exact E-step (dense oracle, ≤ 1e-10); with eps 0 they equal the exact E-step (≤ 1e-12)', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const model = randomModel(s.seed, { nCells: Math.min(s.nCells, 12), nReadings: s.nReadings, linksPerCell: s.links, floor: s.floor });
        const n = model.cells.length;
        const m = model.surfaces.length;
        const obs = sampleRun(model, Math.min(s.nSteps, 60), new SeededRandom(s.seed ^ 0x2545f491), s.dropout).obs;
        const chain = chainFromModel(model);
        const ws = new EStepWorkspace();
        const counts = emptyCounts(n, chain.nnz, m);
        const logP = addPrunedRunCounts(chain, obs, counts, ws, s.eps);
        const pr = runPruned(model, obs, s.eps);
        expect(logP).toBe(pr.logP);
        const oracle = maskedCounts(model, obs, pr.kept);
        const st = model.structure;
        for (let i = 0; i < n; i++) {
          expectClose(counts.start[i], oracle.start[i], { abs: 1e-10 }, `start ${i}`);
          for (let r = 0; r < m; r++) expectClose(counts.emitT[r * n + i], oracle.emit[i][r], { abs: 1e-10 * obs.length }, `emit ${i},${r}`);
          for (let k = st.succPtr[i]; k < st.succPtr[i + 1]; k++) expectClose(counts.trans[k], oracle.trans[i][st.succIdx[k]], { abs: 1e-10 * obs.length }, `trans ${i}`);
        }
        if (s.eps === 0) {
          const ref = emptyCounts(n, chain.nnz, m);
          const refLog = addRunCounts(chain, obs, ref, new EStepWorkspace());
          expectClose(logP, refLog, { rel: 1e-12, abs: 1e-12 }, 'log P');
          for (let k = 0; k < chain.nnz; k++) expectClose(counts.trans[k], ref.trans[k], { abs: 1e-12 * obs.length }, `trans ${k}`);
          for (let x = 0; x < n * m; x++) expectClose(counts.emitT[x], ref.emitT[x], { abs: 1e-12 * obs.length }, `emit ${x}`);
        }
      }),
      { ...params, numRuns: 40 },
    );
  });

  it('forwardPruned returns NaN when the kept cells overflow their buffers, leaving its scratch clean; with room it gives the same numbers', () => {
    const model = randomModel(9, { nCells: 20, nReadings: 4, linksPerCell: 3 });
    const chain = chainFromModel(model);
    const obs = sampleRun(model, 50, new SeededRandom(2), 0).obs;
    const acc = new Float64Array(20);
    const mark = new Uint8Array(20);
    const run = (capacity: number): { logP: number; ptr: Int32Array; idx: Int32Array; val: Float64Array; out: Float64Array } => {
      const idx = new Int32Array(capacity);
      const val = new Float64Array(capacity);
      const ptr = new Int32Array(51);
      const out = new Float64Array(1);
      const logP = forwardPruned(chain, obs, 1e-6, new Float64Array(50), idx, val, ptr, acc, mark, new Int32Array(21), out);
      return { logP, ptr, idx, val, out };
    };
    expect(run(30).logP).toBeNaN();
    expect(Array.from(acc).every((x) => x === 0) && Array.from(mark).every((x) => x === 0)).toBe(true);
    const roomy = run(50 * 20);
    const tight = run(roomy.ptr[50]);
    expect(tight.logP).toBe(roomy.logP);
    expect(tight.out[0]).toBe(roomy.out[0]);
    expect(Array.from(tight.val)).toEqual(Array.from(roomy.val.subarray(0, roomy.ptr[50])));
  });

  it('drops cells when the readings are sharp, and keeps each step’s largest cell', () => {
    const base = randomModel(7, { nCells: 40, nReadings: 8, linksPerCell: 2 });
    // Sharp reading tables: each cell reads its own surface 95 % of the time.
    const model = { ...base, emission: Float64Array.from(base.emission, (_, x) => (x % 8 === Math.floor(x / 8) % 8 ? 0.95 : 0.05 / 7)) };
    const obs = sampleRun(model, 200, new SeededRandom(3), 0).obs;
    const pr = runPruned(model, obs, 1e-3);
    const ex = exact(model, obs);
    const keptTotal = pr.kept.reduce((s, row) => s + row.filter(Boolean).length, 0);
    expect(keptTotal).toBeLessThan(0.8 * 40 * 200);
    for (let t = 0; t < 200; t++) expect(pr.kept[t].some(Boolean)).toBe(true);
    expect(pr.bound).toBeGreaterThan(0);
    expect(Math.abs(pr.logP - ex.logP)).toBeLessThan(-200 * Math.log1p(-1e-3));
  });
});
