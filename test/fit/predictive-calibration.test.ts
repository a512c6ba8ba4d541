import { describe, it, expect } from 'vitest';
import { predictiveCalibration, calibrationFromSums } from '../../src/fit/predictive-calibration.js';
import { predictiveReliability } from '../../src/kernels/predictive-reliability.js';
import { forwardScaled } from '../../src/kernels/forward-scaled.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { fitModel, DEFAULT_FIT_OPTIONS } from '../../src/fit/fit-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { randomModel } from '../helpers/random-model.js';
import { expectClose } from '../helpers/close.js';
import { misspecifiedBuilding, MISSPECIFIED_SPECS } from '../../bench/misspecified-building.js';

describe('predictiveReliability (kernel)', () => {
  it('bins the top one-step-ahead forecast computed from the forward pass, and returns log P(readings)', () => {
    const model = randomModel(11, { nCells: 6, nReadings: 4 });
    const chain = chainFromModel(model);
    const rng = new SeededRandom(2);
    const { obs } = sampleRun(model, 40, rng, 0.1);
    const T = obs.length;
    const n = chain.nCells;
    const m = chain.nReadings;
    // Oracle: α̂ from forwardScaled; predicted state before t = Σ_i α̂_{t-1}(i) a_ij (start at t = 0).
    const alpha = new Float64Array(T * n);
    const scale = new Float64Array(T);
    const logP = forwardScaled(chain, obs, T, alpha, scale);
    const expected = new Float64Array(30);
    for (let t = 0; t < T; t++) {
      const pred = new Float64Array(n);
      if (t === 0) pred.set(chain.start);
      else for (let i = 0; i < n; i++) for (let k = chain.succPtr[i]; k < chain.succPtr[i + 1]; k++) pred[chain.succIdx[k]] += alpha[(t - 1) * n + i] * chain.succProb[k];
      if (obs[t] < 0) continue;
      const q = Array.from({ length: m }, (_, r) => pred.reduce((acc, p, j) => acc + p * model.emission[j * m + r], 0));
      const best = q.indexOf(Math.max(...q));
      const b = Math.min(9, Math.floor(q[best] * 10));
      expected[3 * b] += 1;
      expected[3 * b + 1] += q[best];
      expected[3 * b + 2] += obs[t] === best ? 1 : 0;
    }
    const bins = new Float64Array(30);
    const got = predictiveReliability(chain, obs, T, 10, new Float64Array(2 * n + m), bins);
    expectClose(got, logP, { rel: 1e-12 }, 'log P');
    for (let x = 0; x < 30; x++) expectClose(bins[x], expected[x], { abs: 1e-12 }, `bins[${x}]`);
  });

  it('ECE is Σ (count/N)·|mean predicted − observed| over non-empty bins', () => {
    const sums = new Float64Array(30);
    sums.set([10, 5.5, 4], 3 * 5); // bin 0.5–0.6: mean 0.55, observed 0.4
    sums.set([30, 27, 27], 3 * 9); // bin 0.9–1.0: mean 0.9, observed 0.9
    const c = calibrationFromSums(sums, 10)!;
    expect(c.nReadings).toBe(40);
    expectClose(c.ece, (10 / 40) * 0.15, { abs: 1e-15 }, 'ece');
    expect(c.bins[0].meanPredicted).toBeNull();
    expect(calibrationFromSums(new Float64Array(30), 10)).toBeNull();
  });
});

describe('predictiveCalibration (fit level)', () => {
  it('on runs simulated from the model itself the error is below 0.01', () => {
    const b = misspecifiedBuilding(MISSPECIFIED_SPECS.test, 9);
    const rng = new SeededRandom(4);
    const runs = Array.from({ length: 120 }, () => sampleRun(b.truth, 500, rng, 0.02).obs);
    const c = predictiveCalibration(b.truth, runs)!;
    expect(c.nReadings).toBeGreaterThan(55_000);
    expect(c.ece).toBeLessThan(0.01);
    expect(c.bins.reduce((a, x) => a + x.count, 0)).toBe(c.nReadings);
  });

  it('a model that is not the one the runs came from is visibly miscalibrated (the check can fail)', () => {
    const b = misspecifiedBuilding(MISSPECIFIED_SPECS.test, 9);
    const rng = new SeededRandom(4);
    const runs = Array.from({ length: 40 }, () => sampleRun(b.truth, 500, rng, 0.02).obs);
    // Overconfident sensor: every cell reads its surveyed surface with probability 0.97.
    const m = b.truth.surfaces.length;
    const sharp = { ...b.truth, emission: b.truth.emission.map((_, x) => (b.floor.surfaces.indexOf(b.floor.cells[Math.floor(x / m)].surface) === x % m ? 0.97 : 0.03 / (m - 1))) };
    expect(predictiveCalibration(sharp, runs)!.ece).toBeGreaterThan(0.05);
  });

  it('fitModel records the table of the selected restart on the held-out runs; its counts sum to the held-out readings', async () => {
    const b = misspecifiedBuilding({ ...MISSPECIFIED_SPECS.test, nRuns: 20, nSteps: 200 }, 4);
    const { record } = await fitModel({ floor: b.floor, runs: b.runs, floorDigest: 'x', runsDigests: [] }, { ...DEFAULT_FIT_OPTIONS, transitions: 'tied', restarts: 2, maxIter: 30 }, 1);
    const c = record.predictiveCalibration!;
    expect(c.forecast).toBe('top-reading');
    expect(c.nReadings).toBe(record.nReadings.heldOut);
    expect(c.bins.reduce((a, x) => a + x.count, 0)).toBe(record.nReadings.heldOut);
    expect(c.bins).toHaveLength(10);
    const none = await fitModel({ floor: b.floor, runs: b.runs, floorDigest: 'x', runsDigests: [] }, { ...DEFAULT_FIT_OPTIONS, transitions: 'tied', holdout: 0, restarts: 1, maxIter: 5 }, 1);
    expect(none.record.predictiveCalibration).toBeNull();
  });
});
