import type { MoveAccumulators } from '../kernels/backward-move-segment.js';
import type { ExpectedCountsTable } from './expected-counts-table.js';
import type { HmmModel } from './hmm-model.js';
import { equalSplitTransitions } from './equal-split-transitions.js';

/**
 * The plain dwell of a `tied` model fitted with odometry when no step's distance was unknown: then the
 * plain dwell enters no run's likelihood (it is used only for runs or steps without odometry, by
 * `decode`, `simulate`, `compare` and the report), and EM has nothing to learn it from. It is set to the
 * expected share of stays over all steps with a known distance, Σ stays / Σ (stays + moves) — the
 * building's overall staying rate — which leaves the fit's objective unchanged. When some step's
 * distance was unknown (plain counts exist), `maximizeModel` has already learned the dwell from those
 * steps, exactly, and the model is returned as it is.
 */
export function marginalDwell(model: HmmModel, counts: ExpectedCountsTable, move: MoveAccumulators): HmmModel {
  const s = model.structure;
  for (let i = 0; i < s.nCells; i++) {
    if (s.succPtr[i + 1] - s.succPtr[i] <= 1) continue;
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) if (counts.trans[k] > 0) return model;
  }
  let stays = 0;
  let all = 0;
  for (let b = 0; b < move.stayByDistance.length; b++) {
    stays += move.stayByDistance[b];
    all += move.stayByDistance[b] + move.moveByDistance[b];
  }
  if (!(all > 0)) return model;
  return { ...model, trans: equalSplitTransitions(s, stays / all) };
}
