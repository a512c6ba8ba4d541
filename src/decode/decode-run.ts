import type { SparseChain } from '../kernels/sparse-chain.js';
import { forwardScaled } from '../kernels/forward-scaled.js';
import { viterbiLog } from '../kernels/viterbi-log.js';
import { posteriorSummary } from '../kernels/posterior-summary.js';
import type { LogChain } from './log-chain.js';
import { backPointerArray } from './back-pointer-array.js';

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
}

/**
 * Decodes one run: the Viterbi path and its log-probability, and per step the posterior of the path's
 * cell, the posterior-marginal best cell and its probability, the posterior entropy and the reading's
 * surprise (from the forward scaling factors: P(o_t | o_<t) = 1 / c_t). `log` is `logChain(chain)`.
 */
export function decodeRun(chain: SparseChain, log: LogChain, obs: Int32Array): DecodedRun {
  const n = chain.nCells;
  const T = obs.length;
  const alpha = new Float64Array(n * T);
  const scale = new Float64Array(T);
  const logLik = forwardScaled(chain, obs, T, alpha, scale);
  const path = new Int32Array(T);
  const pathLogProb = viterbiLog(
    n,
    chain.nReadings,
    log.logStart,
    chain.predPtr,
    chain.predIdx,
    log.logPredProb,
    log.logEmitT,
    obs,
    T,
    new Float64Array(2 * n),
    backPointerArray(n, n * T),
    path,
  );
  const out: DecodedRun = {
    logLik,
    path,
    pathLogProb,
    pathP: new Float64Array(T).fill(NaN),
    likelyCell: new Int32Array(T).fill(-1),
    likelyP: new Float64Array(T).fill(NaN),
    entropyBits: new Float64Array(T).fill(NaN),
    surpriseBits: new Float64Array(T).fill(NaN),
  };
  if (logLik === -Infinity) return out;
  posteriorSummary(chain, obs, T, alpha, scale, path, new Float64Array(2 * n), out.likelyCell, out.likelyP, out.pathP, out.entropyBits);
  for (let t = 0; t < T; t++) if (obs[t] >= 0) out.surpriseBits[t] = Math.log2(scale[t]);
  return out;
}
