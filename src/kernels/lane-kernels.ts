import type { LaneGroup, SparseChain } from './sparse-chain.js';

/** Count accumulators of the lane kernels (see `backwardCountsLanes`, `backwardTotalsLanes`); ADDED to. */
export interface LaneAccumulators {
  /** (nReadings + 1) × nCells; the last row takes dropouts and padded steps. */
  emitCount: Float64Array;
  /** Per link, in the chain's `out` order (per-link counts only). */
  linkCount: Float64Array;
  dwellCount: Float64Array;
  /** γ at each run's last step (totals only). */
  lastGamma: Float64Array;
  startCount: Float64Array;
}

/**
 * The lane kernels behind one interface, so the E-step and scoring drive either implementation the same
 * way: `WasmLaneKernels` (WebAssembly SIMD, the fast one) or `JsLaneKernels` (the reference, and the
 * fallback where WebAssembly SIMD or its memory is missing). Both give the same numbers, bit for bit.
 *
 * `prepare(chain, group, segment)` sizes the buffers for the group processed in segments of `segment`
 * steps and loads the chain and the group; `table` (rows of nCells × LANES numbers, `segment + 1` rows)
 * and `accumulators` are valid until the next `prepare`. `forward` is `forwardLanes` over steps
 * `t0 … t1-1` (row 0 of `table` holds u_{t0-1}); `resetBackward` zeroes the carried ŵ before the last
 * segment; `backward` is `backwardCountsLanes` (`perLink`) or `backwardTotalsLanes` over `t1-1 … t0`,
 * adding into `accumulators`. `prepare` returns false, and the kernels are not to be used for the
 * group, when their memory cannot be had (WebAssembly only: the caller then turns to `JsLaneKernels`,
 * whose ordinary arrays throw a RangeError only when memory has truly run out).
 */
export interface LaneKernels {
  readonly table: Float64Array;
  readonly accumulators: LaneAccumulators;
  prepare(chain: SparseChain, group: LaneGroup, segment: number): boolean;
  forward(t0: number, t1: number, logOut: Float64Array): void;
  resetBackward(): void;
  backward(t0: number, t1: number, perLink: boolean): void;
}
