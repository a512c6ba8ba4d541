/**
 * The stopping rule on the objectives per reading so far (`history`, last entry the current model's):
 * the relative change of the last iteration is at most `tol`; with `projected`, also the gain still to
 * come if EM keeps converging linearly at its current rate, by Aitken's δ² extrapolation of the
 * objective sequence (a stopping rule for slow EM, common practice):
 * a = Δ_k / Δ_{k−1}, remaining = Δ_k · a / (1 − a), where Δ_k is the k-th change. A rate a ≥ 1 (not
 * yet converging linearly) does not stop; a rate ≤ 0 (a flat or jittering objective) falls back to
 * the plain rule. The projected rule never stops earlier than the plain one.
 */
export function emConverged(history: readonly number[], tol: number, projected: boolean): boolean {
  const k = history.length - 1;
  if (k < 1) return false;
  const delta = history[k] - history[k - 1];
  const bound = tol * Math.abs(history[k - 1]) + 1e-15;
  if (Math.abs(delta) > bound) return false;
  if (!projected || k < 2) return !projected || Math.abs(delta) <= 1e-15;
  const before = history[k - 1] - history[k - 2];
  if (!(delta > 0) || !(before > 0)) return true;
  const a = delta / before;
  if (a >= 1) return false;
  return (delta * a) / (1 - a) <= bound;
}
