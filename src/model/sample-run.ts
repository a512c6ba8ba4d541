import type { HmmModel } from './hmm-model.js';
import type { SeededRandom } from './seeded-random.js';

export interface SampledRun {
  /** True cell per step. */
  cells: Int32Array;
  /** Reading code per step (−1 = dropout). */
  obs: Int32Array;
}

/**
 * Draws one run of `nSteps` steps from the model: a start cell from the start distribution, then moves
 * along the transitions, a reading from each visited cell's emission row; each reading is replaced by a
 * dropout with probability `dropoutRate`.
 */
export function sampleRun(model: HmmModel, nSteps: number, rng: SeededRandom, dropoutRate = 0): SampledRun {
  const s = model.structure;
  const m = model.surfaces.length;
  const cells = new Int32Array(nSteps);
  const obs = new Int32Array(nSteps);
  let cell = rng.pick(model.start);
  for (let t = 0; t < nSteps; t++) {
    if (t > 0) {
      const k = rng.pick(model.trans, s.succPtr[cell], s.succPtr[cell + 1] - s.succPtr[cell]);
      cell = s.succIdx[s.succPtr[cell] + k];
    }
    cells[t] = cell;
    obs[t] = rng.pick(model.emission, cell * m, m);
    if (dropoutRate > 0 && rng.next() < dropoutRate) obs[t] = -1;
  }
  return { cells, obs };
}
