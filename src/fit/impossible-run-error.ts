import type { HmmModel } from '../model/hmm-model.js';
import { chainFromModel } from '../model/chain-from-model.js';
import { forwardScore } from '../kernels/forward-score.js';
import { WorkError } from '../errors.js';
import type { RunReadings } from './run-readings.js';

/** The error for a run with probability zero under the model, naming the step where it became impossible. */
export function impossibleRunError(model: HmmModel, run: RunReadings): WorkError {
  const chain = chainFromModel(model);
  const where = new Int32Array(1);
  forwardScore(chain, run.obs, run.obs.length, new Float64Array(2 * chain.nCells), where);
  const t = where[0];
  const reading = t >= 0 && run.obs[t] >= 0 ? model.surfaces[run.obs[t]] : 'no reading';
  return new WorkError(
    `run ${JSON.stringify(run.id)}: readings must be possible under the model, got probability zero at step index ${t} (reading ${JSON.stringify(reading)}); ` +
      'a cell that can never show a reading (e.g. with --prior-strength 0) or a start the floor forbids causes this',
  );
}
