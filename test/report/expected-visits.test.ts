import { describe, it, expect } from 'vitest';
import { expectedVisits } from '../../src/report/expected-visits.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { forwardScaled } from '../../src/kernels/forward-scaled.js';
import { backwardScaled } from '../../src/kernels/backward-scaled.js';
import { posteriorMarginals } from '../../src/kernels/posterior-marginals.js';
import { buildModel } from '../../src/model/build-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { expectAllClose, expectClose } from '../helpers/close.js';

const floor = gridFloor(3, 2, ['oak', 'carpet', 'tile'], (x, y) => x + y);
const model = buildModel(floor, { hit: 0.8, dwell: 0.6 });

describe('expectedVisits(model, runs)', () => {
  it('equals Σ_t γ_t(i) over the non-dropout steps, computed directly from forward-backward posteriors', () => {
    const rng = new SeededRandom(4);
    const runs = [0, 1, 2].map((k) => ({ id: `r${k}`, obs: sampleRun(model, 40, rng, 0.1).obs }));
    const chain = chainFromModel(model);
    const n = chain.nCells;
    const expected = new Float64Array(n);
    for (const run of runs) {
      const T = run.obs.length;
      const alpha = new Float64Array(n * T);
      const beta = new Float64Array(n * T);
      const gamma = new Float64Array(n * T);
      const scale = new Float64Array(T);
      forwardScaled(chain, run.obs, T, alpha, scale);
      backwardScaled(chain, run.obs, T, scale, beta);
      posteriorMarginals(n, T, alpha, beta, gamma);
      for (let t = 0; t < T; t++) if (run.obs[t] >= 0) for (let i = 0; i < n; i++) expected[i] += gamma[t * n + i];
    }
    const got = expectedVisits(model, runs);
    expect(got.impossibleRuns).toEqual([]);
    expectAllClose(got.readings, expected, { abs: 1e-9, rel: 1e-9 }, 'expected readings');
    const nReadings = runs.reduce((s, r) => s + r.obs.filter((o) => o >= 0).length, 0);
    expectClose(got.readings.reduce((a, b) => a + b, 0), nReadings, { rel: 1e-12 });
  });

  it('leaves out and names runs that are impossible under the model', () => {
    // A row oak – carpet – tile read with certainty: oak straight to tile skips a cell, so it is impossible.
    const certain = buildModel(gridFloor(3, 1, ['oak', 'carpet', 'tile'], (x) => x), { hit: 1 });
    const impossible = { id: 'jump', obs: Int32Array.from([0, 2, 2]) };
    const possible = { id: 'fine', obs: Int32Array.from([0, 1, 1]) };
    const got = expectedVisits(certain, [possible, impossible]);
    expect(got.impossibleRuns).toEqual(['jump']);
    expectClose(got.readings.reduce((a, b) => a + b, 0), 3, { rel: 1e-12 });
  });
});
