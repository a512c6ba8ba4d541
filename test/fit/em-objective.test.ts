import { describe, it, expect } from 'vitest';
import { runEm, type EmLoopOptions } from '../../src/fit/em-loop.js';
import { LocalEngine } from '../../src/fit/local-engine.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import { toBlocks } from '../../src/fit/to-blocks.js';
import type { EStepEngine } from '../../src/fit/e-step-engine.js';
import { buildModel } from '../../src/model/build-model.js';
import { surveyPrior } from '../../src/model/survey-prior.js';
import { equalSplitTransitions } from '../../src/model/equal-split-transitions.js';
import { transitionLogPrior } from '../../src/model/transition-log-prior.js';
import { WorkError } from '../../src/errors.js';
import { misspecifiedBuilding, MISSPECIFIED_SPECS } from '../../bench/misspecified-building.js';

const b = misspecifiedBuilding({ ...MISSPECIFIED_SPECS.test, nRuns: 16, nSteps: 200 }, 3);
const start = buildModel(b.floor, { dwell: 0.5, hit: 0.8 });
const surfaceOf = Int32Array.from(b.floor.cells, (c) => b.floor.surfaces.indexOf(c.surface));
const prior = surveyPrior(surfaceOf, b.floor.surfaces.length, 0.8);
const centre = equalSplitTransitions(start.structure, 0.5);
const packed = packRuns(b.runs);
const blocks = toBlocks(b.runs.map((_, r) => r), 8);
const options = (mode: 'learned' | 'per-cell', w: number): EmLoopOptions => ({ mode, priorStrength: 10, prior, maxIter: 60, tol: 0, transitionPriorStrength: w, transitionCentre: centre });

describe('EM objective with transition priors', () => {
  for (const mode of ['learned', 'per-cell'] as const) {
    for (const w of [0, 5, 200]) {
      it(`${mode}, W = ${w}: the objective (log-likelihood + emission and transition log priors) never decreases over 60 iterations`, async () => {
        const engine = new LocalEngine(packed, { mode });
        const res = await runEm(engine, packed, start, blocks, options(mode, w));
        expect(res.iterations).toBe(60);
        for (let i = 1; i < res.history.length; i++) expect(res.history[i]).toBeGreaterThanOrEqual(res.history[i - 1] - 1e-12 * Math.abs(res.history[i - 1]));
        // The prior is part of the objective: the history exceeds the log-likelihood alone by it.
        const logPrior = transitionLogPrior(res.model, mode, w, centre);
        if (w > 0) expect(logPrior).toBeLessThan(0);
        else expect(logPrior).toBe(0);
      });
    }
  }

  it('a decrease of the objective is an error, not convergence', async () => {
    const inner = new LocalEngine(packed, { mode: 'learned' });
    let calls = 0;
    // An engine whose log-likelihood drops by 1 per reading on every call: EM cannot do that.
    const broken: EStepEngine = {
      workers: 1,
      counts: async (model, bl) => {
        const out = await inner.counts(model, bl);
        calls++;
        for (const c of out) c.counts.logLik -= calls * c.counts.nReadings;
        return out;
      },
      score: (model, bl) => inner.score(model, bl),
      close: () => inner.close(),
    };
    await expect(runEm(broken, packed, start, blocks, options('learned', 20))).rejects.toThrow(WorkError);
    await expect(runEm(broken, packed, start, blocks, options('learned', 20))).rejects.toThrow(/objective must not decrease/);
  });
});
