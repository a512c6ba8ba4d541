import { LANES, type LaneGroup } from '../kernels/sparse-chain.js';

/** Forward tables above this size are processed in checkpointed segments (see `segmentSteps`). */
export const DEFAULT_PLAIN_LIMIT_BYTES = 64 * 1024 * 1024;

/**
 * Reusable buffers for the E-step and scoring, one run or one lane group at a time, grown on demand and
 * never shrunk, so a long fit allocates once per worker rather than once per run. Sizes are in numbers
 * (float64) unless said otherwise.
 */
export class EStepWorkspace {
  /**
   * A run (or lane group) whose forward table would take more bytes than this is processed in
   * checkpointed segments of ⌈√steps⌉ steps: memory then grows with √steps instead of steps.
   * @default 64 MiB
   */
  plainLimitBytes = DEFAULT_PLAIN_LIMIT_BYTES;
  /** Forward table of one segment, with its entry row: (segment steps + 1) × cells × lanes. */
  table = new Float64Array(0);
  /** Scaling factors c_t of the whole run or group: steps × lanes. */
  scale = new Float64Array(0);
  /** Forward vectors at the entry of every segment (checkpointed runs only): segments × cells × lanes. */
  checkpoints = new Float64Array(0);
  /** w vectors of the backward pass and their ping-pong partner: cells × lanes each. */
  w = new Float64Array(0);
  wSpare = new Float64Array(0);
  /** Per-run (per-group) count accumulators, folded into the counts table when the run is done. */
  emitCount = new Float64Array(0);
  linkCount = new Float64Array(0);
  dwellCount = new Float64Array(0);
  lastGamma = new Float64Array(0);
  /** Scratch for the log sums of recomputed segments (discarded). */
  logs = new Float64Array(LANES);
  /** The lane group being processed (its `rows` buffer grows on demand). */
  group: LaneGroup = { nSteps: 0, laneSteps: new Int32Array(LANES), rows: new Int32Array(0) };

  /**
   * Makes sure the buffers hold a run (`lanes` = 1) or a lane group (`lanes` = LANES) of `nSteps` steps
   * processed in segments of `segment` steps, with `nSegments` checkpoints, over `nCells` cells,
   * `nReadings` readings and `nLinks` links; returns this.
   */
  ensure(nCells: number, nReadings: number, nLinks: number, lanes: number, nSteps: number, segment: number, nSegments: number): this {
    const row = nCells * lanes;
    if (this.table.length < (segment + 1) * row) this.table = new Float64Array((segment + 1) * row);
    if (this.scale.length < nSteps * lanes) this.scale = new Float64Array(nSteps * lanes);
    if (nSegments > 1 && this.checkpoints.length < nSegments * row) this.checkpoints = new Float64Array(nSegments * row);
    if (this.w.length < row) {
      this.w = new Float64Array(row);
      this.wSpare = new Float64Array(row);
    }
    if (this.emitCount.length < (nReadings + 1) * nCells) this.emitCount = new Float64Array((nReadings + 1) * nCells);
    if (this.linkCount.length < nLinks) this.linkCount = new Float64Array(nLinks);
    if (this.dwellCount.length < nCells) {
      this.dwellCount = new Float64Array(nCells);
      this.lastGamma = new Float64Array(nCells);
    }
    return this;
  }
}
