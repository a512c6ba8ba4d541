import type { SparseChain } from '../kernels/sparse-chain.js';
import { forwardSegment } from '../kernels/forward-segment.js';
import { posteriorSummarySegment } from '../kernels/posterior-summary-segment.js';
import { segmentSteps } from '../kernels/segment-steps.js';
import { positionWorkSize, type PositionGroups, type PositionPass, type PositionSteps } from '../kernels/position-summary.js';
import type { LogChain } from './log-chain.js';
import { viterbiPath } from './viterbi-path.js';

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

const DEFAULT_PLAIN_LIMIT_BYTES = 64 * 1024 * 1024;

/**
 * Decodes one run: the Viterbi path and its log-probability, and per step the posterior of the path's
 * cell, the posterior-marginal best cell and its probability, the posterior entropy and the reading's
 * surprise (from the forward scaling factors: P(o_t | o_<t) = 1 / c_t). `log` is `logChain(chain)`.
 * Besides its outputs (a few numbers per step), a long run needs memory only in proportion to √steps
 * (checkpointed forward-backward and Viterbi, see `DecodeOptions`).
 */
export function decodeRun(chain: SparseChain, log: LogChain, obs: Int32Array, options: DecodeOptions = {}): DecodedRun {
  const limit = options.plainLimitBytes ?? DEFAULT_PLAIN_LIMIT_BYTES;
  const n = chain.nCells;
  const T = obs.length;
  const path = new Int32Array(T);
  const pathLogProb = viterbiPath(chain, log, obs, limit, path);
  const out: DecodedRun = {
    logLik: 0,
    path,
    pathLogProb,
    pathP: new Float64Array(T).fill(NaN),
    likelyCell: new Int32Array(T).fill(-1),
    likelyP: new Float64Array(T).fill(NaN),
    entropyBits: new Float64Array(T).fill(NaN),
    surpriseBits: new Float64Array(T).fill(NaN),
    positions: options.positions ? newPositionSteps(T) : null,
  };
  if (T === 0) return out;

  // Forward, keeping the entry vector of every segment when the run is checkpointed.
  const segment = segmentSteps(T, 8 * n, limit);
  const nSegments = Math.ceil(T / segment);
  const table = new Float64Array((segment + 1) * n);
  const scale = new Float64Array(T);
  const checkpoints = new Float64Array(nSegments > 1 ? nSegments * n : 0);
  let logLik = 0;
  for (let g = 0; g < nSegments && logLik !== -Infinity; g++) {
    if (g > 0) {
      table.copyWithin(0, segment * n, (segment + 1) * n);
      checkpoints.set(table.subarray(0, n), g * n);
    }
    logLik = forwardSegment(chain, obs, g * segment, Math.min(T, (g + 1) * segment), table, scale, logLik);
  }
  out.logLik = logLik;
  if (logLik === -Infinity) return out;

  // Backward with the per-step summaries, last segment first, earlier ones recomputed from checkpoints.
  const w = new Float64Array(n);
  const wSpare = new Float64Array(n);
  const position: PositionPass | undefined =
    options.positions && out.positions
      ? { groups: options.positions, gamma: new Float64Array(n), work: new Float64Array(positionWorkSize(options.positions)), out: out.positions }
      : undefined;
  for (let g = nSegments - 1; g >= 0; g--) {
    const a = g * segment;
    const b = Math.min(T, a + segment);
    if (g < nSegments - 1) {
      if (g > 0) table.set(checkpoints.subarray(g * n, (g + 1) * n), 0);
      forwardSegment(chain, obs, a, b, table, scale, 0);
    }
    posteriorSummarySegment(chain, obs, a, b, table, scale, path, w, wSpare, out.likelyCell, out.likelyP, out.pathP, out.entropyBits, position);
  }
  for (let t = 0; t < T; t++) if (obs[t] >= 0) out.surpriseBits[t] = Math.log2(scale[t]);
  return out;
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
