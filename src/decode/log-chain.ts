import type { SparseChain } from '../kernels/sparse-chain.js';

/** Log-probability copies of a chain's start, CSC transitions and transposed emissions, for the log-space kernels. */
export interface LogChain {
  logStart: Float64Array;
  logPredProb: Float64Array;
  logEmitT: Float64Array;
}

export function logChain(chain: SparseChain): LogChain {
  return {
    logStart: Float64Array.from(chain.start, Math.log),
    logPredProb: Float64Array.from(chain.predProb, Math.log),
    logEmitT: Float64Array.from(chain.emitT, Math.log),
  };
}
