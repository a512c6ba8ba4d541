import type { TransitionStructure } from './hmm-model.js';

/**
 * M-step of `per-cell` transitions: each cell its own dwell d_i, the rest (1 − d_i) split equally over
 * its links, with a Beta prior on d_i of concentrations 1 + W·d₀ and 1 + W·(1 − d₀) (W = `strength`
 * pseudo-transitions per cell, d₀ = `centreDwell`, the building's starting dwell). With D_i the
 * expected dwell transitions of cell i and L_i those along its links, the exact maximiser of
 *
 *   (D_i + W·d₀) log d_i + (L_i + W·(1 − d₀)) log(1 − d_i)      (the links' 1/nLinks is a constant)
 *
 * is d_i = (D_i + W·d₀) / (D_i + L_i + W). W = 0 is maximum likelihood; a cell without counts then keeps
 * its previous dwell. A cell without links dwells with probability 1. `counts` may be per nonzero or the
 * totals form (dwell at the dwell's position, the link total at any link: only row sums are read).
 * Returns a new array, CSR order.
 */
export function perCellDwellTransitions(
  structure: TransitionStructure,
  counts: Float64Array,
  previous: Float64Array,
  strength: number,
  centreDwell: number,
): Float64Array {
  const { nCells, succPtr, dwellPos } = structure;
  const trans = new Float64Array(structure.nnz);
  for (let i = 0; i < nCells; i++) {
    const nLinks = succPtr[i + 1] - succPtr[i] - 1;
    if (nLinks === 0) {
      trans[dwellPos[i]] = 1;
      continue;
    }
    let total = 0;
    for (let k = succPtr[i]; k < succPtr[i + 1]; k++) total += counts[k];
    const stay = counts[dwellPos[i]];
    const d = strength > 0 ? (stay + strength * centreDwell) / (total + strength) : total > 0 ? stay / total : previous[dwellPos[i]];
    for (let k = succPtr[i]; k < succPtr[i + 1]; k++) trans[k] = k === dwellPos[i] ? d : (1 - d) / nLinks;
  }
  return trans;
}
