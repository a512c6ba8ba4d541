/**
 * The likelihood-ratio (G) statistic of observed counts against fixed probabilities (Sokal & Rohlf,
 * "Biometry", G-test for goodness of fit): G = 2 Σ_r n_r ln(n_r / (N p_r)), summing over readings with
 * n_r > 0. Counts may be fractional (expected counts from an E-step). Infinity when a reading with
 * positive count has probability zero.
 */
export function gStatistic(counts: ArrayLike<number>, probs: ArrayLike<number>): number {
  let total = 0;
  for (let r = 0; r < counts.length; r++) total += counts[r];
  if (!(total > 0)) return 0;
  let g = 0;
  for (let r = 0; r < counts.length; r++) {
    const n = counts[r];
    if (n > 0) {
      if (!(probs[r] > 0)) return Infinity;
      g += n * Math.log(n / (total * probs[r]));
    }
  }
  return Math.max(0, 2 * g);
}
