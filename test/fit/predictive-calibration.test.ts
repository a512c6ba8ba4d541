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
import { denseMoveTransition, randomMoveModel, randomMoveSteps } from '../helpers/movement-oracle.js';
import { forwardMoveSegment } from '../../src/kernels/forward-move-segment.js';
import { sampleOdometry } from '../../src/model/sample-odometry.js';
import { moveStepsFromOdometry } from '../../src/model/move-steps-from-odometry.js';

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

  it('with odometry, forecasts use the per-step movement transitions (oracle: dense A_t from the definition)', () => {
    const model = randomMoveModel(5, 7, 4);
    const chain = chainFromModel(model);
    const rng = new SeededRandom(3);
    const { obs } = sampleRun(model, 60, rng, 0.1);
    const T = obs.length;
    const n = chain.nCells;
    const m = chain.nReadings;
    const raw = randomMoveSteps(rng, T);
    const steps = { dBin: Int32Array.from(raw.dBin), hBin: Int32Array.from(raw.hBin) };
    // Oracle: the normalised filter with the dense per-step matrix A_t written from DEVELOPERS.md ("Movement").
    const expected = new Float64Array(30);
    let filt: number[] = [];
    let logP = 0;
    for (let t = 0; t < T; t++) {
      const pred = new Array<number>(n).fill(0);
      if (t === 0) for (let j = 0; j < n; j++) pred[j] = chain.start[j];
      else {
        const a = denseMoveTransition(model, raw.dBin[t], raw.hBin[t]);
        for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) pred[j] += filt[i] * a[i][j];
      }
      if (obs[t] >= 0) {
        const q = Array.from({ length: m }, (_, r) => pred.reduce((acc, p, j) => acc + p * model.emission[j * m + r], 0));
        const best = q.indexOf(Math.max(...q));
        const b = Math.min(9, Math.floor(q[best] * 10));
        expected[3 * b] += 1;
        expected[3 * b + 1] += q[best];
        expected[3 * b + 2] += obs[t] === best ? 1 : 0;
      }
      const f = pred.map((p, j) => p * (obs[t] < 0 ? 1 : model.emission[j * m + obs[t]]));
      const sum = f.reduce((x, y) => x + y, 0);
      logP += Math.log(sum);
      filt = f.map((v) => v / sum);
    }
    const bins = new Float64Array(30);
    const got = predictiveReliability(chain, obs, T, 10, new Float64Array(2 * n + m), bins, steps);
    expectClose(got, logP, { rel: 1e-10 }, 'log P');
    // The movement forward kernel agrees on log P.
    const table = new Float64Array((T + 1) * n);
    const scale = new Float64Array(T);
    expectClose(got, forwardMoveSegment(chain, chain.move!, obs, steps, 0, T, table, scale, 0, new Float64Array(2 * n)), { rel: 1e-12 }, 'log P (movement forward)');
    for (let x = 0; x < 30; x++) expectClose(bins[x], expected[x], { abs: 1e-9 }, `bins[${x}]`);
    // Without the odometry the plain transitions give a different table (the check can tell them apart).
    const plain = new Float64Array(30);
    predictiveReliability(chain, obs, T, 10, new Float64Array(2 * n + m), plain);
    expect(Array.from(plain).some((v, x) => Math.abs(v - bins[x]) > 1e-6)).toBe(true);
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

  it('on runs with odometry simulated from a movement model itself, the error with the per-step transitions is below 0.01', () => {
    const b = misspecifiedBuilding(MISSPECIFIED_SPECS.test, 9);
    const model = { ...b.truth, movement: { stayLogit: 3, stayPerMetre: 6, kappa: 2 } };
    const n = model.cells.length;
    const m = model.surfaces.length;
    const rng = new SeededRandom(6);
    const draw = (p: ArrayLike<number>): number => {
      let u = rng.next();
      for (let k = 0; k < p.length; k++) if ((u -= p[k]) < 0) return k;
      return p.length - 1;
    };
    const obs: Int32Array[] = [];
    const moves = [];
    for (let k = 0; k < 120; k++) {
      // Odometry as a robot logs it (from a walk of the plain chain), then the walk drawn from the
      // movement model's per-step transitions A_t given that odometry, and its readings.
      const od = sampleOdometry(model, sampleRun(model, 500, rng, 0).cells, rng);
      const steps = moveStepsFromOdometry(od.moved, od.heading);
      const run = new Int32Array(500);
      let cell = draw(model.start);
      for (let t = 0; t < 500; t++) {
        if (t > 0) cell = draw(denseMoveTransition(model, steps.dBin[t], steps.hBin[t])[cell]);
        run[t] = rng.next() < 0.02 ? -1 : draw(model.emission.subarray(cell * m, cell * m + m));
      }
      obs.push(run);
      moves.push(steps);
    }
    expect(n).toBeGreaterThan(1);
    const withMoves = predictiveCalibration(model, obs, 10, moves)!;
    const plain = predictiveCalibration(model, obs)!;
    expect(withMoves.nReadings).toBeGreaterThan(55_000);
    expect(withMoves.nReadings).toBe(plain.nReadings);
    expect(withMoves.bins.reduce((a, x) => a + x.count, 0)).toBe(withMoves.nReadings);
    expect(withMoves.ece).toBeLessThan(0.01);
    // The plain transitions ignore what the odometry says, and their forecasts are visibly worse.
    expect(plain.ece).toBeGreaterThan(withMoves.ece);
  });

  it('fitModel with odometry records the table made with the per-step transitions', async () => {
    const b = misspecifiedBuilding({ ...MISSPECIFIED_SPECS.test, nRuns: 20, nSteps: 200 }, 4);
    const rng = new SeededRandom(8);
    const runs = b.runs.map((r, k) => {
      const od = sampleOdometry(b.truth, b.truePaths[k], rng);
      return { id: r.id, obs: r.obs, moves: moveStepsFromOdometry(od.moved, od.heading) };
    });
    const { record, model } = await fitModel({ floor: b.floor, runs, movement: true, floorDigest: 'x', runsDigests: [] }, { ...DEFAULT_FIT_OPTIONS, transitions: 'tied', restarts: 1, maxIter: 10, finalPass: false }, 1);
    expect(model.movement).toBeDefined();
    const held = record.split.heldOut.map((id) => runs.find((r) => r.id === id)!);
    const withMoves = predictiveCalibration(model, held.map((r) => r.obs), 10, held.map((r) => r.moves))!;
    const plain = predictiveCalibration(model, held.map((r) => r.obs))!;
    expect(record.predictiveCalibration!.nReadings).toBe(record.nReadings.heldOut);
    expectClose(record.predictiveCalibration!.ece, withMoves.ece, { abs: 1e-15 }, 'recorded ECE (per-step transitions)');
    expect(Math.abs(record.predictiveCalibration!.ece - plain.ece)).toBeGreaterThan(1e-6);
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
