import betainc from '@stdlib/math-base-special-betainc';

/**
 * P(F ≥ f) for F ~ F(d1, d2) (Snedecor's F): the regularised incomplete beta function
 * I_x(d2/2, d1/2) at x = d2 / (d2 + d1·f) (Abramowitz & Stegun, "Handbook of Mathematical Functions",
 * 26.6.2), from stdlib's `betainc`. Evaluated as the lower tail at small x, so tiny p-values keep
 * their precision instead of being lost in 1 − CDF.
 */
export function fSurvival(f: number, d1: number, d2: number): number {
  if (f === Infinity) return 0;
  if (!(f > 0)) return 1;
  return betainc(d2 / (d2 + d1 * f), d2 / 2, d1 / 2, true, false);
}
