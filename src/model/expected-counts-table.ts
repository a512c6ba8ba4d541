/**
 * Expected counts of one or many runs (the E-step's output, the M-step's input): start (per cell),
 * transitions (per nonzero, CSR order) and readings (readings × cells, `r * nCells + i`, the kernels'
 * transposed layout). Also the log-likelihood and reading counts that produced them.
 */
export interface ExpectedCountsTable {
  start: Float64Array;
  trans: Float64Array;
  emitT: Float64Array;
  /** Σ log P(readings) over the runs. */
  logLik: number;
  /** Non-dropout readings over the runs. */
  nReadings: number;
  nRuns: number;
}

export function emptyCounts(nCells: number, nnz: number, nReadings: number): ExpectedCountsTable {
  return {
    start: new Float64Array(nCells),
    trans: new Float64Array(nnz),
    emitT: new Float64Array(nReadings * nCells),
    logLik: 0,
    nReadings: 0,
    nRuns: 0,
  };
}
