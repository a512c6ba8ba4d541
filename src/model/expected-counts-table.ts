import { DISTANCE_BINS, HEADING_BINS } from '../kernels/move-chain.js';
import type { MoveAccumulators } from '../kernels/backward-move-segment.js';
/**
 * Expected counts of one or many runs (the E-step's output, the M-step's input): start (per cell),
 * transitions (per nonzero, CSR order) and readings (readings × cells, `r * nCells + i`, the kernels'
 * transposed layout). Also the log-likelihood and reading counts that produced them.
 */
export interface ExpectedCountsTable {
  start: Float64Array;
  /**
   * Expected transitions per nonzero, CSR order. An E-step run for the `tied` or `fixed` M-step (which
   * read only each cell's dwell count and its total) may store the totals form instead: the dwell count
   * at the dwell's position and the cell's total over its links at its first link's position, 0 at its
   * other links (see `accumulateBlock`). Per-link counts satisfy that form too, so the two add up.
   */
  trans: Float64Array;
  emitT: Float64Array;
  /** Σ log P(readings) over the runs. */
  logLik: number;
  /** Non-dropout readings over the runs. */
  nReadings: number;
  nRuns: number;
  /**
   * Counts of the movement parameters (`MoveAccumulators`: expected stays and moves per distance bin,
   * expected link uses per heading bin and link), present when the E-step ran with odometry.
   */
  move?: MoveAccumulators;
}

export function emptyCounts(nCells: number, nnz: number, nReadings: number, withMove = false): ExpectedCountsTable {
  const counts: ExpectedCountsTable = {
    start: new Float64Array(nCells),
    trans: new Float64Array(nnz),
    emitT: new Float64Array(nReadings * nCells),
    logLik: 0,
    nReadings: 0,
    nRuns: 0,
  };
  if (withMove) counts.move = emptyMoveAccumulators(nCells);
  return counts;
}

/** Zeroed movement counts for `nCells` cells (`emptyCounts(…, true)` adds them). */
export function emptyMoveAccumulators(nCells: number): MoveAccumulators {
  return {
    stayByDistance: new Float64Array(DISTANCE_BINS),
    moveByDistance: new Float64Array(DISTANCE_BINS),
    moveByHeading: new Float64Array(HEADING_BINS * nCells),
    headingCos: new Float64Array(HEADING_BINS),
    headingSin: new Float64Array(HEADING_BINS),
  };
}
