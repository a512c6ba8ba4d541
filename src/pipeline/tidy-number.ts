/**
 * Numbers as written to output tables. A posterior computed in floating point can overshoot its range by
 * a few units in the last place (a probability of 1.0000000000000007, an entropy of −9.6e-16); tables
 * state the quantity, so such values are clamped to it. NaN (no value) passes through unchanged.
 */
export function unitInterval(v: number): number {
  return v > 1 ? 1 : v < 0 ? 0 : v;
}

/** `v` clamped to ≥ 0 (entropies, surprises, spreads); NaN passes through. */
export function nonNegative(v: number): number {
  return v < 0 ? 0 : v;
}
