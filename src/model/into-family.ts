import type { HmmModel, TransitionMode } from './hmm-model.js';
import { equalSplitTransitions } from './equal-split-transitions.js';

/**
 * A warm-start model brought into the transition family of a fit: in `tied` mode one dwell for the
 * whole building (the mean of the model's dwells over cells with links, or `fallbackDwell`), the rest
 * split equally over links; other modes keep the model as it is.
 */
export function intoFamily(model: HmmModel, mode: TransitionMode, fallbackDwell: number): HmmModel {
  if (mode !== 'tied') return model;
  const s = model.structure;
  let sum = 0;
  let n = 0;
  for (let i = 0; i < s.nCells; i++) {
    if (s.succPtr[i + 1] - s.succPtr[i] > 1) {
      sum += model.trans[s.dwellPos[i]];
      n++;
    }
  }
  return { ...model, trans: equalSplitTransitions(s, n ? sum / n : fallbackDwell) };
}
