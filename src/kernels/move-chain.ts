/**
 * Per-step transitions from wheel odometry, in the kernels' terms (see DEVELOPERS.md, "Movement").
 *
 * A run that carries odometry gives, for every step t ≥ 1 (the transition t−1 → t), a distance bin
 * `dBin[t]` (−1 = unknown) and a heading bin `hBin[t]` (−1 = unknown); entry 0 is not used. With the
 * plain chain's dwell a_ii and links a_ij, the transition at step t is
 *
 *   A_t(i, i) = s_i,   A_t(i, j) = (1 − s_i) · split_{h}(i → j),
 *
 *   s_i = stayByDistance[dBin[t]] when the distance is known and cell i is `eligible` (0 < a_ii < 1),
 *         else a_ii;
 *   split_h = the row `hBin[t]` of `splitOut` / `splitIn` (the plain split a_ij / (1 − a_ii) weighted
 *         by the heading and normalised over the cell's links), or the last row (the plain split) when
 *         the heading is unknown.
 *
 * Links absent from the plain chain (and a zero dwell) stay exactly zero: every factor multiplies the
 * plain probability's support. Index rules as in `sparse-chain.ts`; `splitOut` is in the chain's `out`
 * order and `splitIn` in its `in` order, both (nHeadingBins + 1) × nLinks, row-major.
 */
export interface MoveChain {
  /** Heading bins (360° / HEADING_BIN_DEGREES); row `nHeadingBins` of the split tables is the plain split. */
  nHeadingBins: number;
  /** Staying probability per distance bin (DISTANCE_BINS entries). */
  stayByDistance: Float64Array;
  /** 1 for a cell whose plain dwell is strictly between 0 and 1 (its dwell follows the distance). */
  eligible: Uint8Array;
  splitOut: Float64Array;
  splitIn: Float64Array;
  /** cos θ and sin θ of every link's bearing (out order; 0 for a link without one), for the κ counts. */
  linkCos: Float64Array;
  linkSin: Float64Array;
}

/** The odometry of one run as bins, index t = the transition into step t (entry 0 unused). */
export interface MoveSteps {
  dBin: Int32Array;
  hBin: Int32Array;
}

/** Distance resolution: distances are rounded to this many metres. */
export const DISTANCE_BIN_METRES = 0.01;
/** Distance bins 0 … DISTANCE_BINS − 1; the last one takes every distance of 20 m or more. */
export const DISTANCE_BINS = 2001;
/** Heading resolution: bin b covers [b·5°, (b+1)·5°) and stands for its centre (b + ½)·5°. */
export const HEADING_BIN_DEGREES = 5;
export const HEADING_BINS = 72;

/** Distance (metres, ≥ 0) → bin. */
export function distanceBin(d: number): number {
  return Math.min(DISTANCE_BINS - 1, Math.round(d / DISTANCE_BIN_METRES));
}

/** Heading (degrees, [0, 360)) → bin. */
export function headingBin(h: number): number {
  return Math.min(HEADING_BINS - 1, Math.floor(h / HEADING_BIN_DEGREES));
}
