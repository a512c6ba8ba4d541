import type { SparseChain } from '../kernels/sparse-chain.js';
import type { LogLanes } from '../kernels/decode-lane-kernels.js';
import { linkSplit } from '../kernels/viterbi-lanes.js';
import type { LogChain } from './log-chain.js';

/** The lane Viterbi's log-probability tables, with the `logChain` they were made from. */
export type LaneTables = LogLanes & { log: LogChain };

/** The log-probability tables of the lane Viterbi for a chain and its `logChain`. */
export function logLanes(chain: SparseChain, log: LogChain): LaneTables {
  return {
    log,
    logStart: log.logStart,
    logDwell: Float64Array.from(chain.dwell, Math.log),
    logInProb: Float64Array.from(chain.inProb, Math.log),
    logEmitT: log.logEmitT,
    inSplit: linkSplit(chain.nCells, chain.inPtr, chain.inIdx),
  };
}
