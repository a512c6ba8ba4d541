import type { SparseChain } from '../kernels/sparse-chain.js';
import { forwardScore } from '../kernels/forward-score.js';

/** log P(readings) of one run under the chain, in O(nCells) memory (any run length). */
export function scoreRun(chain: SparseChain, obs: Int32Array, work: Float64Array = new Float64Array(2 * chain.nCells)): number {
  return forwardScore(chain, obs, obs.length, work);
}
