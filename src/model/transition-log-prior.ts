import type { HmmModel, TransitionMode } from './hmm-model.js';

/**
 * Log density (up to its normalising constant) of the transition prior used by `maximizeModel`, the
 * counterpart of `emissionLogPrior`: in `learned` mode Σ_i Σ_k W·c_k · log a_k over each row's nonzeros
 * (Dirichlet with concentrations 1 + W·c_k, c = `centre`); in `per-cell` mode Σ_i W·d₀ log d_i +
 * W·(1 − d₀) log(1 − d_i) over the cells with links (Beta with concentrations 1 + W·d₀, 1 + W·(1 − d₀),
 * d₀ = the centre's dwell of that cell). 0 in the other modes and when W = 0. The EM objective is
 * log-likelihood + emission log prior + this.
 */
export function transitionLogPrior(model: HmmModel, mode: TransitionMode, strength: number, centre: Float64Array | undefined): number {
  if (!(strength > 0) || !centre) return 0;
  const s = model.structure;
  let sum = 0;
  if (mode === 'learned') {
    for (let k = 0; k < s.nnz; k++) if (centre[k] > 0) sum += strength * centre[k] * Math.log(model.trans[k]);
  } else if (mode === 'per-cell') {
    for (let i = 0; i < s.nCells; i++) {
      if (s.succPtr[i + 1] - s.succPtr[i] <= 1) continue;
      const d0 = centre[s.dwellPos[i]];
      const d = model.trans[s.dwellPos[i]];
      if (d0 > 0) sum += strength * d0 * Math.log(d);
      if (d0 < 1) sum += strength * (1 - d0) * Math.log(1 - d);
    }
  }
  return sum;
}
