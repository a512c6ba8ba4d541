import type { HmmModel } from './hmm-model.js';

/** The dwell probability of the first cell that has links (1 when no cell has any). */
export function firstDwell(model: HmmModel): number {
  const s = model.structure;
  for (let i = 0; i < s.nCells; i++) if (s.succPtr[i + 1] - s.succPtr[i] > 1) return model.trans[s.dwellPos[i]];
  return 1;
}
