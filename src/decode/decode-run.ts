import type { SparseChain } from '../kernels/sparse-chain.js';
import type { LogChain } from './log-chain.js';
import type { DecodedRun, DecodeOptions } from './decoded-run.js';
import { decodeWith } from './decode-with.js';
import { plainTransitions } from './plain-transitions.js';

export type { DecodedRun, DecodeOptions } from './decoded-run.js';
export { newPositionSteps } from './decoded-run.js';

/**
 * Decodes one run under the plain chain (`decodeWith` with `plainTransitions`): the Viterbi path and its
 * log-probability, and per step the posterior of the path's cell, the posterior-marginal best cell and
 * its probability, the posterior entropy and the reading's surprise. `log` is `logChain(chain)`. The
 * reference for the lane decoder (`decodeLanes`), which gives the same numbers for eight runs at once.
 */
export function decodeRun(chain: SparseChain, log: LogChain, obs: Int32Array, options: DecodeOptions = {}): DecodedRun {
  return decodeWith(plainTransitions(chain, log, obs), obs, options);
}
