import type { PositionPass } from '../kernels/position-summary.js';

/** Back-pointers in the narrowest integer type for the cell count (`backPointerArray`). */
export type BackPointers = Uint8Array | Uint16Array | Int32Array;

/**
 * The transitions one run is decoded under, as the three kernels the single-run drivers (`traceViterbi`,
 * `decodeWith`) call: the plain chain's (`plainTransitions`) or per-step ones from odometry
 * (`moveTransitions`). The drivers own the segmenting and checkpointing; a source only runs a segment.
 */
export interface TransitionSource {
  readonly nCells: number;
  /**
   * Viterbi over segments of up to `segment` steps: the score vectors (`delta`, 2 · nCells: δ_{t0-1} in
   * the first half before `run(t0, t1)`, δ_{t1-1} after), the segment's back-pointers (row t − t0 for
   * step t ≥ 1) and the runner (`viterbiSegment` or its movement or WebAssembly form).
   */
  viterbi(segment: number): { delta: Float64Array; back: BackPointers; run(t0: number, t1: number): void };
  /** The scaled forward pass over steps t0 … t1-1 (`forwardSegment` conventions); returns logIn + the segment's log-likelihood. */
  forward(t0: number, t1: number, table: Float64Array, scale: Float64Array, logIn: number): number;
  /** The backward pass with the per-step summaries (`posteriorSummarySegment` conventions). */
  summary(
    t0: number,
    t1: number,
    table: Float64Array,
    scale: Float64Array,
    path: Int32Array,
    w: Float64Array,
    wSpare: Float64Array,
    likelyCell: Int32Array,
    likelyP: Float64Array,
    pathP: Float64Array,
    entropy: Float64Array,
    position?: PositionPass,
  ): void;
}
