import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { fcSeed } from '../helpers/fc-seed.js';
import { randomMoveModel } from '../helpers/movement-oracle.js';
import { denseTransitions } from '../helpers/random-model.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { forwardSegment } from '../../src/kernels/forward-segment.js';
import { forwardMoveSegment } from '../../src/kernels/forward-move-segment.js';
import { decodeMoveRun } from '../../src/decode/decode-move-run.js';
import { logChain } from '../../src/decode/log-chain.js';
import { emIteration } from '../../src/fit/em-iteration.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { sampleOdometry } from '../../src/model/sample-odometry.js';
import { moveStepsFromOdometry } from '../../src/model/move-steps-from-odometry.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { surveyPrior } from '../../src/model/survey-prior.js';
import { equalSplitTransitions } from '../../src/model/equal-split-transitions.js';
import { HEADING_BINS, type MoveSteps } from '../../src/kernels/move-chain.js';
import type { HmmModel, TransitionMode } from '../../src/model/hmm-model.js';
import { expectClose } from '../helpers/close.js';

const params = { seed: fcSeed, numRuns: 50 };

/** A random model with movement parameters, and runs with odometry sampled from it (some of it unknown). */
const scenario = fc.record({
  seed: fc.integer({ min: 1, max: 2 ** 30 }),
  nCells: fc.integer({ min: 1, max: 9 }),
  nReadings: fc.integer({ min: 2, max: 5 }),
  nSteps: fc.integer({ min: 1, max: 40 }),
  nRuns: fc.integer({ min: 1, max: 4 }),
  dropout: fc.constantFrom(0, 0.1, 0.3),
  unknown: fc.constantFrom(0, 0.2, 1),
});

function runsFor(model: HmmModel, seed: number, nRuns: number, nSteps: number, dropout: number, unknown: number): Array<{ id: string; obs: Int32Array; moves: MoveSteps }> {
  const rng = new SeededRandom(seed ^ 0x5bd1e995);
  return Array.from({ length: nRuns }, (_, r) => {
    const run = sampleRun(model, nSteps, rng, dropout);
    const od = sampleOdometry(model, run.cells, rng);
    for (let t = 0; t < nSteps; t++) {
      if (rng.next() < unknown) od.moved[t] = NaN;
      if (rng.next() < unknown) od.heading[t] = NaN;
    }
    return { id: `r${r}`, obs: run.obs, moves: moveStepsFromOdometry(od.moved, od.heading) };
  });
}

describe('engine properties with movement columns (fast-check)', () => {
  it('every per-step transition row sums to 1 and is zero wherever the floor has no link', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const model = randomMoveModel(s.seed, s.nCells, s.nReadings);
        const chain = chainFromModel(model);
        const move = chain.move!;
        const nLinks = chain.outPtr[s.nCells];
        for (let b = 0; b <= HEADING_BINS; b++) {
          for (let i = 0; i < s.nCells; i++) {
            let sum = 0;
            for (let q = chain.outPtr[i]; q < chain.outPtr[i + 1]; q++) {
              const v = move.splitOut[b * nLinks + q];
              expect(v).toBeGreaterThanOrEqual(0);
              sum += v;
            }
            if (chain.outPtr[i + 1] > chain.outPtr[i]) expectClose(sum, 1, { abs: 1e-12 }, `split of cell ${i}, heading bin ${b}`);
          }
        }
        for (const s0 of move.stayByDistance) expect(s0 >= 0 && s0 <= 1).toBe(true);
        // The split tables only hold the floor's links: every `in` entry is a link of the plain chain.
        const plain = denseTransitions(model);
        for (let j = 0; j < s.nCells; j++) for (let p = chain.inPtr[j]; p < chain.inPtr[j + 1]; p++) expect(plain[chain.inIdx[p]][j]).toBeGreaterThan(0);
      }),
      params,
    );
  });

  it('with every odometry value unknown, log P equals that of the plain chain; checkpointed decoding equals one pass', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const model = randomMoveModel(s.seed, s.nCells, s.nReadings);
        const chain = chainFromModel(model);
        const log = logChain(chain);
        const n = s.nCells;
        for (const run of runsFor(model, s.seed, s.nRuns, s.nSteps, s.dropout, s.unknown)) {
          const T = run.obs.length;
          const none: MoveSteps = { dBin: new Int32Array(T).fill(-1), hBin: new Int32Array(T).fill(-1) };
          const plain = forwardSegment(chain, run.obs, 0, T, new Float64Array((T + 1) * n), new Float64Array(T), 0);
          const moving = forwardMoveSegment(chain, chain.move!, run.obs, none, 0, T, new Float64Array((T + 1) * n), new Float64Array(T), 0, new Float64Array(2 * n));
          expectClose(moving, plain, { abs: 1e-12, rel: 1e-12 }, 'unknown odometry vs plain');
          const one = decodeMoveRun(chain, log, run.obs, run.moves);
          const pieces = decodeMoveRun(chain, log, run.obs, run.moves, { plainLimitBytes: 8 * n * 3 });
          expect(pieces.logLik).toBe(one.logLik);
          expect(Array.from(pieces.path)).toEqual(Array.from(one.path));
          expect(Array.from(pieces.likelyP)).toEqual(Array.from(one.likelyP));
        }
      }),
      params,
    );
  });

  it('the Viterbi path moves only along links or dwell and is at least as probable as sampled paths', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const model = randomMoveModel(s.seed, s.nCells, s.nReadings);
        const chain = chainFromModel(model);
        const log = logChain(chain);
        const a = denseTransitions(model);
        const rng = new SeededRandom(s.seed + 17);
        for (const run of runsFor(model, s.seed, s.nRuns, s.nSteps, s.dropout, s.unknown)) {
          const dec = decodeMoveRun(chain, log, run.obs, run.moves);
          for (let t = 1; t < run.obs.length; t++) expect(a[dec.path[t - 1]][dec.path[t]], `move at ${t}`).toBeGreaterThan(0);
          expect(dec.pathLogProb).toBeLessThanOrEqual(dec.logLik + 1e-12 * Math.abs(dec.logLik));
          // The log-probability of the decoded path, recomputed from the tables, is the Viterbi score.
          const other = sampleRun(model, run.obs.length, rng).cells;
          const score = (path: ArrayLike<number>): number => {
            let lp = Math.log(model.start[path[0]]);
            const m = s.nReadings;
            const nLinks = chain.outPtr[s.nCells];
            for (let t = 0; t < run.obs.length; t++) {
              if (t > 0) {
                const i = path[t - 1];
                const j = path[t];
                const db = run.moves.dBin[t];
                const hb = run.moves.hBin[t];
                const known = db >= 0 && chain.move!.eligible[i] === 1;
                const stay = known ? chain.move!.stayByDistance[db] : chain.dwell[i];
                if (i === j) lp += Math.log(stay);
                else {
                  let q = chain.outPtr[i];
                  while (chain.outIdx[q] !== j) q++;
                  lp += Math.log(1 - stay) + Math.log(chain.move!.splitOut[(hb < 0 ? HEADING_BINS : hb) * nLinks + q]);
                }
              }
              if (run.obs[t] >= 0) lp += Math.log(model.emission[path[t] * m + run.obs[t]]);
            }
            return lp;
          };
          expectClose(score(dec.path), dec.pathLogProb, { abs: 1e-9, rel: 1e-12 }, 'Viterbi score');
          expect(score(other)).toBeLessThanOrEqual(dec.pathLogProb + 1e-12 * Math.abs(dec.pathLogProb));
        }
      }),
      params,
    );
  });

  it('the EM objective never decreases with movement parameters learned (tied) or held (fixed)', () => {
    fc.assert(
      fc.property(scenario, fc.constantFrom<TransitionMode>('fixed', 'tied'), fc.constantFrom(0, 5), (s, mode, priorStrength) => {
        const truth = randomMoveModel(s.seed, s.nCells, s.nReadings);
        const trans = equalSplitTransitions(truth.structure, 0.3 + 0.4 * new SeededRandom(s.seed).next());
        const model: HmmModel = { ...truth, trans, movement: { stayLogit: 1, stayPerMetre: 2, kappa: 0.5 } };
        const runs = runsFor({ ...truth, trans }, s.seed, s.nRuns, s.nSteps, s.dropout, s.unknown);
        const prior = surveyPrior(Int32Array.from(model.cells, (_, i) => i % s.nReadings), s.nReadings, 0.7);
        let current = model;
        let previous = -Infinity;
        for (let it = 0; it < 8; it++) {
          const res = emIteration(current, runs, { mode, priorStrength, prior });
          expect(Number.isFinite(res.objective)).toBe(true);
          expect(res.objective, `iteration ${it}`).toBeGreaterThanOrEqual(previous - 1e-9 * Math.abs(previous) - 1e-12);
          if (mode === 'fixed') expect(res.model.movement).toEqual(model.movement);
          previous = res.objective;
          current = res.model;
        }
      }),
      { ...params, numRuns: 80 },
    );
  });
});
