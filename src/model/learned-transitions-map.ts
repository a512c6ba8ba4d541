import type { TransitionStructure } from './hmm-model.js';

/**
 * M-step of `learned` transitions with a Dirichlet prior on each cell's row, maximum a posteriori: the
 * row's concentrations are 1 + W·c_k over its own nonzeros (W = `strength` pseudo-transitions per
 * cell, c = `centre`, the floor's movement model: dwell plus an equal split over links), whose mode is
 *
 *   a_k = (ξ_k + W·c_k) / (Σ_row ξ + W).
 *
 * W = 0 is plain maximum likelihood (Rabiner 1989, eq. 40b): a row with no expected transitions keeps
 * its previous values. Only the row's own nonzeros are written, so absent links stay exactly zero.
 * `counts` must hold one count per nonzero (CSR order). Returns a new array.
 */
export function learnedTransitionsMap(
  structure: TransitionStructure,
  counts: Float64Array,
  previous: Float64Array,
  strength: number,
  centre: Float64Array,
): Float64Array {
  const { nCells, succPtr } = structure;
  const trans = new Float64Array(structure.nnz);
  for (let i = 0; i < nCells; i++) {
    let total = 0;
    for (let k = succPtr[i]; k < succPtr[i + 1]; k++) total += counts[k];
    if (strength > 0) {
      const denom = total + strength;
      for (let k = succPtr[i]; k < succPtr[i + 1]; k++) trans[k] = (counts[k] + strength * centre[k]) / denom;
    } else {
      for (let k = succPtr[i]; k < succPtr[i + 1]; k++) trans[k] = total > 0 ? counts[k] / total : previous[k];
    }
  }
  return trans;
}
