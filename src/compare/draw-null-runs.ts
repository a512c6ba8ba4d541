import type { HmmModel } from '../model/hmm-model.js';
import { sampleRun } from '../model/sample-run.js';
import { SeededRandom } from '../model/seeded-random.js';

/**
 * Runs drawn from `model` in the shape of `like`: the same run ids, the same number of steps, and a
 * dropout exactly where the observed run has one — a parametric-bootstrap copy of the observed runs
 * under the hypothesis that nothing changed. Deterministic for a given seed.
 */
export function drawNullRuns(
  model: HmmModel,
  like: ReadonlyArray<{ id: string; obs: Int32Array }>,
  seed: number,
): Array<{ id: string; obs: Int32Array }> {
  const rng = new SeededRandom(seed);
  return like.map((run) => {
    const { obs } = sampleRun(model, run.obs.length, rng);
    for (let t = 0; t < obs.length; t++) if (run.obs[t] < 0) obs[t] = -1;
    return { id: run.id, obs };
  });
}
