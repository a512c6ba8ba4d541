import type { LaneGroup, SparseChain } from './sparse-chain.js';
import type { PositionGroups } from './position-summary.js';
import type { LaneSummaries } from './posterior-summary-lanes.js';

/**
 * The log-probability copies the lane Viterbi reads: start, dwell, links into each cell (the chain's
 * `in` order) and transposed emissions with the dropout row of zeros, and each cell's `linkSplit`.
 */
export interface LogLanes {
  logStart: Float64Array;
  logDwell: Float64Array;
  logInProb: Float64Array;
  logEmitT: Float64Array;
  inSplit: Int32Array;
}

/**
 * The decode kernels for eight runs at once behind one interface, so one driver (`decodeLanes`) runs
 * either implementation: `WasmDecodeLanes` (WebAssembly SIMD, the fast one) or `JsDecodeLanes` (the
 * reference, and the fallback). Both give the same numbers, bit for bit, and each lane's numbers are
 * those of its run decoded alone by `decodeRun`.
 *
 * `prepare` loads the chain and the group and sizes the buffers for Viterbi segments of `viterbiSegment`
 * steps and forward-backward segments of `segment` steps; every array below is valid until the next
 * `prepare` (false: the memory could not be had, use the other implementation).
 * - `viterbi(t0, t1)` is `viterbiLanes` on `delta` (2 × nCells × 8), `back` (viterbiSegment × nCells × 8)
 *   and `last` (nCells × 8);
 * - `forward(t0, t1, logOut)` is `forwardLanes` on `table` ((segment + 1) × nCells × 8) and `scale`
 *   (steps × 8);
 * - `resetBackward()` zeroes the carried ŵ; `summary(t0, t1)` is `posteriorSummaryLanes` for steps
 *   t1-1 … t0, reading the path from `path` and writing `out`, both indexed `(t - t0) * 8 + k`.
 */
export interface DecodeLaneKernels {
  readonly delta: Float64Array;
  readonly back: Uint8Array | Uint16Array | Int32Array;
  readonly last: Float64Array;
  readonly table: Float64Array;
  readonly scale: Float64Array;
  readonly path: Int32Array;
  readonly out: LaneSummaries;
  prepare(chain: SparseChain, log: LogLanes, group: LaneGroup, viterbiSegment: number, segment: number, positions: PositionGroups | null): boolean;
  viterbi(t0: number, t1: number): void;
  forward(t0: number, t1: number, logOut: Float64Array): void;
  resetBackward(): void;
  summary(t0: number, t1: number): void;
}
