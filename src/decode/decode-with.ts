import { segmentSteps } from '../kernels/segment-steps.js';
import { positionWorkSize, type PositionPass } from '../kernels/position-summary.js';
import { DEFAULT_PLAIN_LIMIT_BYTES, emptyDecodedRun, type DecodedRun, type DecodeOptions } from './decoded-run.js';
import type { TransitionSource } from './transition-source.js';
import { traceViterbi } from './trace-viterbi.js';

/**
 * Decodes one run of `obs` under `source`: the Viterbi path (`traceViterbi`) and its log-probability,
 * and per step the posterior of the path's cell, the posterior-marginal best cell and its probability,
 * the posterior entropy and the reading's surprise (from the forward scaling factors:
 * P(o_t | o_<t) = 1 / c_t), with the area and position summaries when `options.positions` is given.
 * Besides its outputs (a few numbers per step), a long run needs memory only in proportion to √steps
 * (checkpointed forward-backward and Viterbi, see `DecodeOptions`).
 */
export function decodeWith(source: TransitionSource, obs: Int32Array, options: DecodeOptions = {}): DecodedRun {
  const limit = options.plainLimitBytes ?? DEFAULT_PLAIN_LIMIT_BYTES;
  const n = source.nCells;
  const T = obs.length;
  const out = emptyDecodedRun(T, options.positions !== undefined);
  out.pathLogProb = traceViterbi(source, T, limit, out.path);
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
    logLik = source.forward(g * segment, Math.min(T, (g + 1) * segment), table, scale, logLik);
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
      source.forward(a, b, table, scale, 0);
    }
    source.summary(a, b, table, scale, out.path, w, wSpare, out.likelyCell, out.likelyP, out.pathP, out.entropyBits, position);
  }
  for (let t = 0; t < T; t++) if (obs[t] >= 0) out.surpriseBits[t] = Math.log2(scale[t]);
  return out;
}
