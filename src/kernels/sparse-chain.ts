/**
 * The typed-array view of a hidden Markov model that every kernel reads. No model objects, no files.
 *
 * Index rules, stated once:
 * - cells are `0 … nCells-1`, readings `0 … nReadings-1`, steps `0 … nSteps-1`;
 * - a per-step table (forward, backward, posterior) is row-major steps × cells: entry `t * nCells + i`;
 * - emissions are stored transposed, readings × cells: `emitT[r * nCells + i]` = P(reading r | cell i),
 *   with one extra row `r = nReadings` of ones, so a dropout (code -1) reads row `nReadings` and costs
 *   nothing (emission factor 1) without a branch in the inner loops;
 * - transitions are sparse over the same nonzeros in two orders: CSR ("successors of i":
 *   `succIdx[succPtr[i] … succPtr[i+1]-1]`, probabilities `succProb`) and CSC ("predecessors of j":
 *   `predIdx[predPtr[j] … predPtr[j+1]-1]`, probabilities `predProb`); `predToSucc[p]` is the CSR
 *   position of CSC entry `p`. Within a row (column) the indices are ascending.
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
}
