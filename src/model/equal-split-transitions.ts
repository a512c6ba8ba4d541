import type { TransitionStructure } from './hmm-model.js';

/**
 * Transition probabilities with dwell `dwell` on every cell that has links and `(1 − dwell)` split equally
 * over its links; a cell without links dwells with probability 1. CSR order.
 */
export function equalSplitTransitions(structure: TransitionStructure, dwell: number): Float64Array {
  const { nCells, succPtr, dwellPos } = structure;
  const trans = new Float64Array(structure.nnz);
  for (let i = 0; i < nCells; i++) {
    const nLinks = succPtr[i + 1] - succPtr[i] - 1;
    for (let k = succPtr[i]; k < succPtr[i + 1]; k++) {
      trans[k] = nLinks === 0 ? 1 : k === dwellPos[i] ? dwell : (1 - dwell) / nLinks;
    }
  }
  return trans;
}
