import type { MoveChain } from './move-chain.js';

/**
 * The typed-array view of a hidden Markov model that every kernel reads. No model objects, no files.
 *
 * Index rules, stated once:
 * - cells are `0 … nCells-1`, readings `0 … nReadings-1`, steps `0 … nSteps-1`;
 * - a per-step table (forward, backward, posterior) is row-major steps × cells: entry `t * nCells + i`;
 *   a table of several runs side by side ("lanes", see `lane-group.ts`) is steps × cells × lanes:
 *   entry `(t * nCells + i) * LANES + k` for lane k;
 * - emissions are stored transposed, readings × cells: `emitT[r * nCells + i]` = P(reading r | cell i),
 *   with one extra row `r = nReadings` of ones, so a dropout (code -1) reads row `nReadings` and costs
 *   nothing (emission factor 1) without a branch in the inner loops;
 * - transitions are sparse over the same nonzeros in two orders: CSR ("successors of i":
 *   `succIdx[succPtr[i] … succPtr[i+1]-1]`, probabilities `succProb`) and CSC ("predecessors of j":
 *   `predIdx[predPtr[j] … predPtr[j+1]-1]`, probabilities `predProb`); `predToSucc[p]` is the CSR
 *   position of CSC entry `p`. Within a row (column) the indices are ascending;
 * - the same transitions split into the dwell (diagonal) and the links (off-diagonal), for the fast
 *   kernels: `dwell[i]` = a_ii; links into j in CSC order `inIdx/inProb[inPtr[j] … inPtr[j+1]-1]`; links
 *   out of i in CSR order `outIdx/outProb[outPtr[i] … outPtr[i+1]-1]`, `outPos[q]` the CSR position
 *   (into `succProb`, and into per-nonzero count tables) of link entry q, `dwellPos[i]` that of the
 *   dwell (−1 when the structure has no dwell entry for i; then `dwell[i]` is 0).
 */
export interface SparseChain {
  nCells: number;
  nReadings: number;
  /** Number of transition nonzeros (links in both directions as declared, plus one dwell per cell). */
  nnz: number;
  /** Start probabilities, length nCells. */
  start: Float64Array;
  succPtr: Int32Array;
  succIdx: Int32Array;
  succProb: Float64Array;
  predPtr: Int32Array;
  predIdx: Int32Array;
  predProb: Float64Array;
  predToSucc: Int32Array;
  /** Transposed emissions with the dropout row of ones: (nReadings + 1) × nCells. */
  emitT: Float64Array;
  /** Dwell probability a_ii per cell. */
  dwell: Float64Array;
  /** CSR position of each cell's dwell, or −1. */
  dwellPos: Int32Array;
  /** Links (off-diagonal nonzeros) into each cell, CSC order, ascending source cell. */
  inPtr: Int32Array;
  inIdx: Int32Array;
  inProb: Float64Array;
  /** Links out of each cell, CSR order, ascending target cell. */
  outPtr: Int32Array;
  outIdx: Int32Array;
  outProb: Float64Array;
  /** CSR position of each `out` entry. */
  outPos: Int32Array;
  /**
   * Per-step transitions from odometry (`move-chain.ts`), present when the model has movement
   * parameters; the movement kernels (`*-move-*.ts`) read it, the plain kernels ignore it.
   */
  move?: MoveChain;
}

/** Runs processed side by side by the lane kernels (`forwardLanes`, `backwardCountsLanes`, …). */
export const LANES = 8;

/**
 * Up to `LANES` runs laid side by side so that one pass over the transitions serves all of them: every
 * transition index and probability loaded is used `LANES` times. Lanes may differ in length; a lane is
 * padded with dropouts up to `nSteps`, and the kernels keep its padded steps out of every sum (see
 * `fillLaneGroup`). An unused lane has length 0.
 */
export interface LaneGroup {
  /** Steps of the longest lane. */
  nSteps: number;
  /** Steps of each lane, length `LANES` (0 for an unused lane). */
  laneSteps: Int32Array;
  /**
   * Emission row offset of every step and lane, `rows[t * LANES + k] = r * nCells` where r is the
   * reading, or `nReadings` (the row of ones) for a dropout or a padded step. Length ≥ nSteps · LANES.
   */
  rows: Int32Array;
}
