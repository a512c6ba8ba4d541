import type { HmmModel, TransitionMode } from './hmm-model.js';
import { equalSplitTransitions } from './equal-split-transitions.js';

/**
 * A warm-start model brought into the transition family of a fit: in `tied` mode one dwell for the
 * whole building (the mean of the model's dwells over cells with links, or `fallbackDwell`), the rest
 * split equally over links; in `per-cell` mode each cell keeps its dwell and its links are made equal;
 * other modes keep the model as it is. (EM never decreases its objective only from a point inside the
 * family its M-step maximises over.)
 */
export function intoFamily(model: HmmModel, mode: TransitionMode, fallbackDwell: number): HmmModel {
  if (mode === 'per-cell') return { ...model, trans: equalLinks(model) };
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

/** Each cell's own dwell kept, the rest split equally over its links. */
function equalLinks(model: HmmModel): Float64Array {
  const s = model.structure;
  const trans = new Float64Array(s.nnz);
  for (let i = 0; i < s.nCells; i++) {
    const nLinks = s.succPtr[i + 1] - s.succPtr[i] - 1;
    const d = nLinks === 0 ? 1 : model.trans[s.dwellPos[i]];
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) trans[k] = k === s.dwellPos[i] ? d : (1 - d) / nLinks;
  }
  return trans;
}
