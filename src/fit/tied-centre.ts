import type { HmmModel, TransitionMode } from '../model/hmm-model.js';
import type { LoopRecord } from './fit-record.js';
import { selectRestart } from './select-restart.js';
import { equalSplitTransitions } from '../model/equal-split-transitions.js';
import { firstDwell } from '../model/first-dwell.js';

/**
 * Centre of the `per-cell`/`learned` transition priors inside `--transitions auto`: the dwell of the
 * `tied` restart that `selectRestart` would choose among the `tied` restarts fitted so far (`modes[k]`
 * is restart k's mode), with the rest split equally over each cell's links — the building's dwell as
 * the data give it, in place of the `--dwell` guess (measured: DEVELOPERS.md, "Calibration"). Null when
 * no `tied` restart was fitted.
 */
export function tiedCentre(modes: readonly TransitionMode[], restarts: readonly LoopRecord[], models: readonly HmmModel[], byHeldOut: boolean): Float64Array | null {
  const tied = restarts.map((_, k) => k).filter((k) => modes[k] === 'tied');
  if (tied.length === 0) return null;
  const best = tied[selectRestart(tied.map((k) => restarts[k]), byHeldOut)];
  return equalSplitTransitions(models[best].structure, firstDwell(models[best]));
}
