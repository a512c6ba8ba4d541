import type { PositionGroups, PositionSteps } from '../kernels/position-summary.js';

/** Everything decoded about one run, one entry per step. */
export interface DecodedRun {
  /** log P(readings), natural log; −Infinity when the run is impossible under the model. */
  logLik: number;
  /** Viterbi path (cell indices). */
  path: Int32Array;
  /** log P(path, readings) of the Viterbi path. */
  pathLogProb: number;
  /** Posterior probability of the path's cell at each step. */
  pathP: Float64Array;
  /** Most probable cell at each step on its own (posterior marginal). */
  likelyCell: Int32Array;
  likelyP: Float64Array;
  /** Entropy of the posterior over cells, bits. */
  entropyBits: Float64Array;
  /** −log2 P(reading_t | readings before t); NaN for dropouts. */
  surpriseBits: Float64Array;
  /** Area and position summaries per step (`positionSummary`), when `DecodeOptions.positions` is given; else null. */
  positions: PositionSteps | null;
}

export interface DecodeOptions {
  /**
   * A run whose forward table (or Viterbi back-pointers) would take more bytes than this is decoded in
   * checkpointed segments (`segmentSteps`): memory then stays near the limit, or grows with √steps for
   * very long runs, for up to one more forward and one more Viterbi pass. The results are the same
   * either way. @default 64 MiB
   */
  plainLimitBytes?: number;
  /** Cells grouped into areas and levels (`positionLayout(model).groups`): adds `DecodedRun.positions`. */
  positions?: PositionGroups;
}

export const DEFAULT_PLAIN_LIMIT_BYTES = 64 * 1024 * 1024;

/** A run's outputs before decoding: path 0, per-step figures NaN / −1 (they stay so for an impossible run). */
export function emptyDecodedRun(T: number, positions: boolean): DecodedRun {
  return {
    logLik: 0,
    path: new Int32Array(T),
    pathLogProb: 0,
    pathP: new Float64Array(T).fill(NaN),
    likelyCell: new Int32Array(T).fill(-1),
    likelyP: new Float64Array(T).fill(NaN),
    entropyBits: new Float64Array(T).fill(NaN),
    surpriseBits: new Float64Array(T).fill(NaN),
    positions: positions ? newPositionSteps(T) : null,
  };
}

/** Per-step area and position outputs, NaN / −1 until decoded (they stay so for an impossible run). */
export function newPositionSteps(T: number): PositionSteps {
  return {
    likelyZone: new Int32Array(T).fill(-1),
    zoneP: new Float64Array(T).fill(NaN),
    meanLevel: new Int32Array(T).fill(-1),
    meanX: new Float64Array(T).fill(NaN),
    meanY: new Float64Array(T).fill(NaN),
    spreadM: new Float64Array(T).fill(NaN),
  };
}
