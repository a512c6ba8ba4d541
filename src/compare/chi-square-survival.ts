import gammainc from '@stdlib/math-base-special-gammainc';

/**
 * P(X ≥ x) for X ~ chi-square with `df` degrees of freedom: the upper regularised incomplete gamma
 * function Q(df/2, x/2), from stdlib's `gammainc` (computed directly in the upper tail, so tiny p-values
 * keep their precision instead of being lost in 1 − CDF).
 */
export function chiSquareSurvival(x: number, df: number): number {
  if (x === Infinity) return 0;
  if (!(x > 0)) return 1;
  return gammainc(x / 2, df / 2, true, true);
}
