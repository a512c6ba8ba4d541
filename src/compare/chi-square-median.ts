import { chiSquareSurvival } from './chi-square-survival.js';

/** Median of the chi-square distribution with `df` degrees of freedom, by bisection on the survival function (to 1e-12). */
export function chiSquareMedian(df: number): number {
  let lo = 0;
  let hi = df + 10 * Math.sqrt(2 * df) + 10;
  while (hi - lo > 1e-12 * hi) {
    const mid = (lo + hi) / 2;
    if (chiSquareSurvival(mid, df) > 0.5) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}
