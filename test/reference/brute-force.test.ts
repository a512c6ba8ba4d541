import { describe, it, expect } from 'vitest';
import { randomModel, denseTransitions } from '../helpers/random-model.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { forwardScaled } from '../../src/kernels/forward-scaled.js';
import { decodeRun } from '../../src/decode/decode-run.js';
import { logChain } from '../../src/decode/log-chain.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { expectClose } from '../helpers/close.js';
import type { HmmModel } from '../../src/model/hmm-model.js';

/** Every path's joint probability, by explicit enumeration (independent of the kernels' recursions). */
function enumeratePaths(model: HmmModel, obs: number[]): { total: number; best: number; second: number; bestPath: number[] } {
  const n = model.cells.length;
  const m = model.surfaces.length;
  const a = denseTransitions(model);
  const T = obs.length;
  let total = 0;
  let best = -1;
  let second = -1;
  let bestPath: number[] = [];
  const path = new Array<number>(T).fill(0);
  const count = n ** T;
  for (let code = 0; code < count; code++) {
    let c = code;
    for (let t = T - 1; t >= 0; t--) {
      path[t] = c % n;
      c = Math.floor(c / n);
    }
    let p = model.start[path[0]];
    for (let t = 0; t < T; t++) {
      if (t > 0) p *= a[path[t - 1]][path[t]];
      if (obs[t] >= 0) p *= model.emission[path[t] * m + obs[t]];
    }
    total += p;
    if (p > best) {
      second = best;
      best = p;
      bestPath = path.slice();
    } else if (p > second) {
      second = p;
    }
  }
  return { total, best, second, bestPath };
}

describe('kernels against brute-force enumeration of all paths', () => {
  // Invented random models (≤ 5 cells, ≤ 7 steps, some dropouts); enumeration is the reference.
  const rng = new SeededRandom(20261202);
  for (let trial = 0; trial < 40; trial++) {
    const nCells = 1 + rng.int(5);
    const nReadings = 2 + rng.int(3);
    const T = 1 + rng.int(7);
    const seed = rng.nextUint32();
    const obs = Array.from({ length: T }, () => (rng.next() < 0.15 ? -1 : rng.int(nReadings)));
    it(`forwardScaled and viterbiLog equal enumeration (trial ${trial}: ${nCells} cells, ${T} steps)`, () => {
      const model = randomModel(seed, { nCells, nReadings, startShare: 0.6 });
      const chain = chainFromModel(model);
      const ref = enumeratePaths(model, obs);
      const o = Int32Array.from(obs);
      const logP = forwardScaled(chain, o, T, new Float64Array(nCells * T), new Float64Array(T));
      expectClose(logP, Math.log(ref.total), { abs: 1e-12, rel: 1e-12 }, 'log P');
      const dec = decodeRun(chain, logChain(chain), o);
      expectClose(dec.pathLogProb, Math.log(ref.best), { abs: 1e-12, rel: 1e-12 }, 'Viterbi log-probability');
      // The path itself: equal to the enumerated best unless another path ties (then equal probability).
      const joint = enumerateOne(model, obs, Array.from(dec.path));
      expectClose(joint, ref.best, { rel: 1e-12 }, 'decoded path probability');
      if (ref.best - ref.second > 1e-9 * ref.best) expect(Array.from(dec.path)).toEqual(ref.bestPath);
    });
  }
});

function enumerateOne(model: HmmModel, obs: number[], path: number[]): number {
  const a = denseTransitions(model);
  const m = model.surfaces.length;
  let p = model.start[path[0]];
  for (let t = 0; t < obs.length; t++) {
    if (t > 0) p *= a[path[t - 1]][path[t]];
    if (obs[t] >= 0) p *= model.emission[path[t] * m + obs[t]];
  }
  return p;
}
