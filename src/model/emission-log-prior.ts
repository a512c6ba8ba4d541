import type { HmmModel } from './hmm-model.js';

/**
 * Log density (up to its normalising constant) of the emission prior used by `maximizeModel`:
 * Σ_i Σ_r W·prior_ir · log b_ir (Dirichlet with concentrations 1 + W·prior_ir). The EM objective is
 * log-likelihood + this; 0 when W = 0.
 */
export function emissionLogPrior(model: HmmModel, prior: Float64Array | undefined, priorStrength: number): number {
  if (!(priorStrength > 0) || !prior) return 0;
  let sum = 0;
  for (let x = 0; x < model.emission.length; x++) {
    const p = prior[x];
    if (p > 0) sum += priorStrength * p * Math.log(model.emission[x]);
  }
  return sum;
}
