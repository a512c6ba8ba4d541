import type { SparseChain } from '../kernels/sparse-chain.js';
import type { MoveSteps } from '../kernels/move-chain.js';
import { forwardMoveSegment } from '../kernels/forward-move-segment.js';
import { posteriorSummaryMoveSegment } from '../kernels/posterior-summary-move-segment.js';
import { segmentSteps } from '../kernels/segment-steps.js';
import type { LogChain } from './log-chain.js';
import { newPositionSteps, type DecodedRun, type DecodeOptions } from './decode-run.js';
import { positionWorkSize, type PositionPass } from '../kernels/position-summary.js';
import { viterbiMovePath } from './viterbi-move-path.js';

const DEFAULT_PLAIN_LIMIT_BYTES = 64 * 1024 * 1024;

/**
 * `decodeRun` for a run with odometry (`steps`) under a chain with movement tables (`chain.move`): the
 * Viterbi path, posteriors and surprise with per-step transitions. Same outputs, same checkpointing.
 * JavaScript only (no WebAssembly Viterbi for per-step transitions yet).
 */
export function decodeMoveRun(chain: SparseChain, log: LogChain, obs: Int32Array, steps: MoveSteps, options: DecodeOptions = {}): DecodedRun {
  const move = chain.move;
  if (!move) throw new RangeError('decodeMoveRun: the chain must have movement tables (a model with movement parameters)');
  const limit = options.plainLimitBytes ?? DEFAULT_PLAIN_LIMIT_BYTES;
  const n = chain.nCells;
  const T = obs.length;
  const path = new Int32Array(T);
  const pathLogProb = viterbiMovePath(chain, log, obs, steps, limit, path);
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
  const segment = segmentSteps(T, 8 * n, limit);
  const nSegments = Math.ceil(T / segment);
  const table = new Float64Array((segment + 1) * n);
  const scale = new Float64Array(T);
  const work = new Float64Array(2 * n);
  const checkpoints = new Float64Array(nSegments > 1 ? nSegments * n : 0);
  let logLik = 0;
  for (let g = 0; g < nSegments && logLik !== -Infinity; g++) {
    if (g > 0) {
      table.copyWithin(0, segment * n, (segment + 1) * n);
      checkpoints.set(table.subarray(0, n), g * n);
    }
    logLik = forwardMoveSegment(chain, move, obs, steps, g * segment, Math.min(T, (g + 1) * segment), table, scale, logLik, work);
  }
  out.logLik = logLik;
  if (logLik === -Infinity) return out;
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
      forwardMoveSegment(chain, move, obs, steps, a, b, table, scale, 0, work);
    }
    posteriorSummaryMoveSegment(chain, move, obs, steps, a, b, table, scale, path, w, wSpare, out.likelyCell, out.likelyP, out.pathP, out.entropyBits, position);
  }
  for (let t = 0; t < T; t++) if (obs[t] >= 0) out.surpriseBits[t] = Math.log2(scale[t]);
  return out;
}
