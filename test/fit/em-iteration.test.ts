import { describe, it, expect } from 'vitest';
import { randomModel } from '../helpers/random-model.js';
import { expectClose } from '../helpers/close.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { emptyCounts } from '../../src/model/expected-counts-table.js';
import { maximizeModel } from '../../src/model/maximize-model.js';
import { emissionLogPrior } from '../../src/model/emission-log-prior.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { accumulateRun } from '../../src/fit/accumulate-run.js';
import { emIteration } from '../../src/fit/em-iteration.js';
import { EStepWorkspace } from '../../src/fit/e-step-workspace.js';
import { WorkError } from '../../src/errors.js';

// Oracle: the single-run path `emIteration` used before it went through the blocks and lane kernels —
// `accumulateRun` run by run (the one-run kernels, checked against the plain Rabiner 1989 kernels in
// test/kernels and against pomegranate in test/reference), then `maximizeModel`. Model and runs are
// invented (seeded random); 21 runs of ragged lengths make two full lane groups, a partial one and
// runs alone.

const model = randomModel(17, { nCells: 14, nReadings: 4, linksPerCell: 3 });
const rng = new SeededRandom(23);
const LENGTHS = [80, 79, 81, 77, 80, 80, 78, 75, 40, 200, 41, 39, 42, 38, 40, 43, 1, 0, 60, 61, 12];
const runs = LENGTHS.map((T, r) => ({ id: `run-${r}`, obs: sampleRun(model, T, rng, 0.1).obs }));
const TOL = { abs: 1e-12, rel: 1e-12 };

describe('emIteration(model, runs, options)', () => {
  for (const mode of ['learned', 'tied'] as const) {
    it(`gives the run-by-run counts, objective and M-step within 1e-12 (${mode})`, () => {
      const chain = chainFromModel(model);
      const want = emptyCounts(chain.nCells, chain.nnz, chain.nReadings);
      const ws = new EStepWorkspace();
      for (const run of runs) accumulateRun(chain, run.obs, want, ws);
      const prior = model.emission;
      const got = emIteration(model, runs, { mode, priorStrength: 3, prior });
      expectClose(got.logLik, want.logLik, { rel: 1e-12 }, 'log-likelihood');
      expect(got.counts.nReadings).toBe(want.nReadings);
      expect(got.counts.nRuns).toBe(runs.length);
      got.counts.start.forEach((v, i) => expectClose(v, want.start[i], TOL, `start ${i}`));
      got.counts.trans.forEach((v, k) => expectClose(v, want.trans[k], TOL, `trans ${k}`));
      got.counts.emitT.forEach((v, x) => expectClose(v, want.emitT[x], TOL, `emit ${x}`));
      expectClose(got.objective, want.logLik + emissionLogPrior(model, prior, 3), { rel: 1e-12 }, 'objective');
      const next = maximizeModel(model, want, { mode, priorStrength: 3, prior });
      got.model.trans.forEach((v, k) => expectClose(v, next.trans[k], TOL, `next trans ${k}`));
      got.model.emission.forEach((v, x) => expectClose(v, next.emission[x], TOL, `next emission ${x}`));
    });
  }

  it('names the first impossible run in the order given', () => {
    const emission = Float64Array.from(model.emission);
    // Reading 3 impossible everywhere: runs 9 and 12 (in later blocks than 0) are the ones that hold it.
    for (let i = 0; i < model.cells.length; i++) {
      const row = emission.subarray(i * 4, i * 4 + 4);
      const kept = row[0] + row[1] + row[2];
      row.set([row[0] / kept, row[1] / kept, row[2] / kept, 0]);
    }
    const changed = runs.map((run) => ({ id: run.id, obs: Int32Array.from(run.obs, (o) => (o === 3 ? 0 : o)) }));
    changed[12].obs[5] = 3;
    changed[9].obs[20] = 3;
    expect(() => emIteration({ ...model, emission }, changed, { priorStrength: 0 })).toThrow(WorkError);
    expect(() => emIteration({ ...model, emission }, changed, { priorStrength: 0 })).toThrow(/"run-9"/);
  });
});
