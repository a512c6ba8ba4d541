import { describe, it } from 'vitest';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { forwardMoveSegment } from '../../src/kernels/forward-move-segment.js';
import { backwardMoveScaled } from '../../src/kernels/backward-move-scaled.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { expectClose } from '../helpers/close.js';
import { enumerateMovePaths, randomMoveModel, randomMoveSteps } from '../helpers/movement-oracle.js';

const TOL = { abs: 1e-12, rel: 1e-12 };

describe('backwardMoveScaled: posteriors with per-step transitions against brute-force enumeration', () => {
  // Invented random models (≤ 5 cells on two levels, ≤ 7 steps, dropouts, unknown odometry).
  const rng = new SeededRandom(20261202);
  for (let trial = 0; trial < 30; trial++) {
    const nCells = 1 + rng.int(5);
    const nReadings = 2 + rng.int(3);
    const T = 1 + rng.int(7);
    const seed = rng.nextUint32();
    const obs = Array.from({ length: T }, () => (rng.next() < 0.15 ? -1 : rng.int(nReadings)));
    const { dBin, hBin } = randomMoveSteps(rng, T);
    it(`c_t u_t(i) β̂_t(i) equals the enumerated posterior of every cell at every step (trial ${trial}: ${nCells} cells, ${T} steps)`, () => {
      const model = randomMoveModel(seed, nCells, nReadings);
      const chain = chainFromModel(model);
      const steps = { dBin: Int32Array.from(dBin), hBin: Int32Array.from(hBin) };
      const ref = enumerateMovePaths(model, obs, dBin, hBin);
      const o = Int32Array.from(obs);
      const table = new Float64Array((T + 1) * nCells);
      const scale = new Float64Array(T);
      forwardMoveSegment(chain, chain.move!, o, steps, 0, T, table, scale, 0, new Float64Array(2 * nCells));
      const beta = new Float64Array(T * nCells);
      backwardMoveScaled(chain, chain.move!, o, steps, T, scale, beta);
      for (let t = 0; t < T; t++) {
        for (let i = 0; i < nCells; i++) {
          const g = scale[t] * table[(t + 1) * nCells + i] * beta[t * nCells + i];
          expectClose(g, ref.gamma[t][i], TOL, `posterior of cell ${i} at step ${t}`);
        }
      }
    });
  }
});
