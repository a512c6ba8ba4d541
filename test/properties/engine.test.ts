import { describe, it, expect } from 'vitest';
import { itSlow } from '../helpers/slow.js';
import fc from 'fast-check';
import { fcSeed } from '../helpers/fc-seed.js';
import { randomModel, denseTransitions } from '../helpers/random-model.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { forwardScaled } from '../../src/kernels/forward-scaled.js';
import { backwardScaled } from '../../src/kernels/backward-scaled.js';
import { posteriorMarginals } from '../../src/kernels/posterior-marginals.js';
import { forwardLog } from '../../src/kernels/forward-log.js';
import { forwardScore } from '../../src/kernels/forward-score.js';
import { decodeRun } from '../../src/decode/decode-run.js';
import { logChain } from '../../src/decode/log-chain.js';
import { emIteration } from '../../src/fit/em-iteration.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { surveyPrior } from '../../src/model/survey-prior.js';
import { buildStructure } from '../../src/model/build-structure.js';
import { equalSplitTransitions } from '../../src/model/equal-split-transitions.js';
import type { HmmModel, TransitionMode } from '../../src/model/hmm-model.js';
import { expectClose } from '../helpers/close.js';

const params = { seed: fcSeed, numRuns: 60 };

/** A random model and a few runs sampled from another random model on the same structure (so fitting has work to do). */
const scenario = fc.record({
  seed: fc.integer({ min: 1, max: 2 ** 30 }),
  nCells: fc.integer({ min: 1, max: 9 }),
  nReadings: fc.integer({ min: 2, max: 5 }),
  nSteps: fc.integer({ min: 1, max: 40 }),
  nRuns: fc.integer({ min: 1, max: 4 }),
  dropout: fc.constantFrom(0, 0.1, 0.3),
});

function runsFor(model: HmmModel, seed: number, nRuns: number, nSteps: number, dropout: number): Int32Array[] {
  const rng = new SeededRandom(seed ^ 0x5bd1e995);
  return Array.from({ length: nRuns }, () => sampleRun(model, nSteps, rng, dropout).obs);
}

function surfaceCodes(model: HmmModel): Int32Array {
  return Int32Array.from(model.cells, (_, i) => i % model.surfaces.length);
}

describe('engine properties (fast-check)', () => {
  it('posterior marginals sum to 1 at every step', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const model = randomModel(s.seed, s);
        const chain = chainFromModel(model);
        for (const obs of runsFor(model, s.seed, s.nRuns, s.nSteps, s.dropout)) {
          const T = obs.length;
          const n = s.nCells;
          const alpha = new Float64Array(n * T);
          const scale = new Float64Array(T);
          const beta = new Float64Array(n * T);
          const gamma = new Float64Array(n * T);
          forwardScaled(chain, obs, T, alpha, scale);
          backwardScaled(chain, obs, T, scale, beta);
          posteriorMarginals(n, T, alpha, beta, gamma);
          for (let t = 0; t < T; t++) {
            let sum = 0;
            for (let i = 0; i < n; i++) sum += gamma[t * n + i];
            expectClose(sum, 1, { abs: 1e-12 }, `step ${t}`);
          }
        }
      }),
      params,
    );
  });

  it('scaled, log-space and O(cells)-memory forward recursions agree on log P', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const model = randomModel(s.seed, s);
        const chain = chainFromModel(model);
        const log = logChain(chain);
        for (const obs of runsFor(model, s.seed, s.nRuns, s.nSteps, s.dropout)) {
          const T = obs.length;
          const scaled = forwardScaled(chain, obs, T, new Float64Array(s.nCells * T), new Float64Array(T));
          const inLogs = forwardLog(s.nCells, s.nReadings, log.logStart, chain.predPtr, chain.predIdx, log.logPredProb, log.logEmitT, obs, T, new Float64Array(2 * s.nCells));
          const lean = forwardScore(chain, obs, T, new Float64Array(2 * s.nCells));
          expectClose(inLogs, scaled, { abs: 1e-12, rel: 1e-12 }, 'log-space vs scaled');
          expect(lean).toBe(scaled);
        }
      }),
      params,
    );
  });

  it('the Viterbi path moves only along links or dwell, and log P(any sampled path) ≤ log P(Viterbi path) ≤ log P(readings)', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const model = randomModel(s.seed, s);
        const chain = chainFromModel(model);
        const log = logChain(chain);
        const a = denseTransitions(model);
        const rng = new SeededRandom(s.seed + 17);
        const m = s.nReadings;
        for (const obs of runsFor(model, s.seed, s.nRuns, s.nSteps, s.dropout)) {
          const dec = decodeRun(chain, log, obs);
          for (let t = 1; t < obs.length; t++) expect(a[dec.path[t - 1]][dec.path[t]], `move at ${t}`).toBeGreaterThan(0);
          expect(dec.pathLogProb).toBeLessThanOrEqual(dec.logLik + 1e-12 * Math.abs(dec.logLik));
          for (let k = 0; k < 20; k++) {
            const other = sampleRun(model, obs.length, rng).cells;
            let lp = Math.log(model.start[other[0]]);
            for (let t = 0; t < obs.length; t++) {
              if (t > 0) lp += Math.log(a[other[t - 1]][other[t]]);
              if (obs[t] >= 0) lp += Math.log(model.emission[other[t] * m + obs[t]]);
            }
            expect(lp).toBeLessThanOrEqual(dec.pathLogProb + 1e-12 * Math.abs(dec.pathLogProb));
          }
        }
      }),
      params,
    );
  });

  it('the EM objective (log-likelihood + log prior) never decreases, every iteration, in every mode', () => {
    fc.assert(
      fc.property(
        scenario,
        fc.constantFrom<TransitionMode>('fixed', 'tied', 'learned'),
        fc.constantFrom(0, 2, 10),
        (s, mode, priorStrength) => {
          const truth = randomModel(s.seed, s);
          const start = randomModel(s.seed + 1, s);
          // Start inside the mode's parameter family (EM is monotone within it): equal split for fixed/tied.
          const trans = mode === 'learned' ? truth.trans : equalSplitTransitions(truth.structure, 0.3 + 0.4 * new SeededRandom(s.seed).next());
          const model: HmmModel = { ...truth, emission: start.emission, trans };
          const runs = runsFor(truth, s.seed, s.nRuns, s.nSteps, s.dropout).map((obs, r) => ({ id: `r${r}`, obs }));
          const prior = surveyPrior(surfaceCodes(model), s.nReadings, 0.7);
          let current = model;
          let previous = -Infinity;
          for (let it = 0; it < 8; it++) {
            const res = emIteration(current, runs, { mode, priorStrength, prior });
            expect(Number.isFinite(res.objective)).toBe(true);
            // 1e-9 relative, plus 1e-12 absolute for objectives that are 0 up to rounding (certain readings).
            expect(res.objective, `iteration ${it}`).toBeGreaterThanOrEqual(previous - 1e-9 * Math.abs(previous) - 1e-12);
            previous = res.objective;
            current = res.model;
          }
        },
      ),
      { ...params, numRuns: 80 },
    );
  });

  it('transitions that are not links or dwell stay exactly zero after any number of iterations, in every mode', () => {
    fc.assert(
      fc.property(scenario, fc.constantFrom<TransitionMode>('fixed', 'tied', 'learned'), fc.integer({ min: 1, max: 6 }), (s, mode, iterations) => {
        const model = randomModel(s.seed, s);
        const before = denseTransitions(model);
        const runs = runsFor(model, s.seed, s.nRuns, s.nSteps, s.dropout).map((obs, r) => ({ id: `r${r}`, obs }));
        const prior = surveyPrior(surfaceCodes(model), s.nReadings, 0.8);
        let current = model;
        for (let it = 0; it < iterations; it++) current = emIteration(current, runs, { mode, priorStrength: 5, prior }).model;
        const after = denseTransitions(current);
        for (let i = 0; i < s.nCells; i++) {
          let rowSum = 0;
          for (let j = 0; j < s.nCells; j++) {
            if (before[i][j] === 0 && i !== j) expect(after[i][j]).toBe(0);
            rowSum += after[i][j];
          }
          expectClose(rowSum, 1, { abs: 1e-12 }, `row ${i}`);
        }
      }),
      params,
    );
  });

  it('relabelling (permuting) the cells leaves log P unchanged', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const model = randomModel(s.seed, s);
        const n = s.nCells;
        const rng = new SeededRandom(s.seed + 3);
        const perm = Array.from({ length: n }, (_, i) => i);
        for (let i = n - 1; i > 0; i--) {
          const j = rng.int(i + 1);
          [perm[i], perm[j]] = [perm[j], perm[i]];
        }
        const a = denseTransitions(model);
        const edges: Array<[number, number]> = [];
        for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) if (i !== j && a[i][j] > 0) edges.push([perm[i], perm[j]]);
        const structure = buildStructure(n, edges);
        const trans = new Float64Array(structure.nnz);
        for (let i = 0; i < n; i++) for (let k = structure.succPtr[i]; k < structure.succPtr[i + 1]; k++) {
          trans[k] = a[perm.indexOf(i)][perm.indexOf(structure.succIdx[k])];
        }
        const m = s.nReadings;
        const emission = new Float64Array(n * m);
        const start = new Float64Array(n);
        for (let i = 0; i < n; i++) {
          start[perm[i]] = model.start[i];
          for (let r = 0; r < m; r++) emission[perm[i] * m + r] = model.emission[i * m + r];
        }
        const permuted: HmmModel = { ...model, structure, trans, emission, start };
        const c1 = chainFromModel(model);
        const c2 = chainFromModel(permuted);
        for (const obs of runsFor(model, s.seed, s.nRuns, s.nSteps, s.dropout)) {
          const w = new Float64Array(2 * n);
          expectClose(forwardScore(c2, obs, obs.length, w), forwardScore(c1, obs, obs.length, w), { abs: 1e-12, rel: 1e-12 });
        }
      }),
      params,
    );
  });

  it('a one-cell model fitted by one EM iteration without prior equals the plain reading frequencies', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -1, max: 3 }), { minLength: 1, maxLength: 200 }), (readings) => {
        fc.pre(readings.some((r) => r >= 0));
        const model = randomModel(7, { nCells: 1, nReadings: 4 });
        const res = emIteration(model, [{ id: 'only', obs: Int32Array.from(readings) }], { mode: 'learned', priorStrength: 0 });
        const counts = [0, 0, 0, 0];
        for (const r of readings) if (r >= 0) counts[r]++;
        const total = counts.reduce((x, y) => x + y, 0);
        counts.forEach((c, r) => expectClose(res.model.emission[r], c / total, { abs: 1e-15 }, `reading ${r}`));
      }),
      params,
    );
  });
});

describe('long runs', () => {
  itSlow('forwardScore on a 10⁶-step run is finite and within the bounds of its per-reading emissions', () => {
    // 30 cells, 1 000 000 steps: O(cells) memory, no underflow thanks to per-step scaling.
    const model = randomModel(99, { nCells: 30, nReadings: 6 });
    const chain = chainFromModel(model);
    const obs = sampleRun(model, 1_000_000, new SeededRandom(5), 0.05).obs;
    const logP = forwardScore(chain, obs, obs.length, new Float64Array(60));
    expect(Number.isFinite(logP)).toBe(true);
    // Per-reading log-likelihood must lie between log(min emission) and 0.
    const perStep = logP / obs.length;
    expect(perStep).toBeLessThan(0);
    expect(perStep).toBeGreaterThan(Math.log(Math.min(...model.emission)));
  });
});
