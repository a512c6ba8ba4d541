import type { MoveSteps } from '../kernels/move-chain.js';
import { sampleOdometry } from '../model/sample-odometry.js';
import { moveStepsFromOdometry } from '../model/move-steps-from-odometry.js';
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
  like: ReadonlyArray<{ id: string; obs: Int32Array; moves?: MoveSteps }>,
  seed: number,
): Array<{ id: string; obs: Int32Array; moves?: MoveSteps }> {
  const rng = new SeededRandom(seed);
  // Odometry of a copy (when the observed run has it): drawn along the copy's walk with the noise of
  // `simulate`, from a generator of its own, unknown wherever the observed run's is unknown.
  const odometryRng = new SeededRandom((seed ^ 0x6f646f6d) >>> 0);
  return like.map((run) => {
    const { obs, cells } = sampleRun(model, run.obs.length, rng);
    for (let t = 0; t < obs.length; t++) if (run.obs[t] < 0) obs[t] = -1;
    if (!run.moves) return { id: run.id, obs };
    const od = sampleOdometry(model, cells, odometryRng);
    const moves = moveStepsFromOdometry(od.moved, od.heading);
    for (let t = 0; t < obs.length; t++) {
      if (run.moves.dBin[t] < 0) moves.dBin[t] = -1;
      if (run.moves.hBin[t] < 0) moves.hBin[t] = -1;
    }
    return { id: run.id, obs, moves };
  });
}
