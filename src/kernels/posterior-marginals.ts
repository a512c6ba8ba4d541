/**
 * Posterior marginals γ_t(i) = α̂_t(i) β̂_t(i) from the scaled forward and backward tables (Rabiner 1989,
 * eq. 27; with the section V.A scaling the product is already normalised). Tables are steps × cells,
 * `t * nCells + i`. Writes into `gammaOut` (may alias neither input). No allocation.
 */
export function posteriorMarginals(
  nCells: number,
  nSteps: number,
  alpha: Float64Array,
  beta: Float64Array,
  gammaOut: Float64Array,
): void {
  const size = nCells * nSteps;
  for (let x = 0; x < size; x++) gammaOut[x] = alpha[x] * beta[x];
}
