import type { SparseChain } from '../kernels/sparse-chain.js';
import type { LogChain } from './log-chain.js';
import { plainTransitions } from './plain-transitions.js';
import { traceViterbi } from './trace-viterbi.js';

/**
 * The Viterbi path of one run under the plain chain (ties to the lowest cell index, as `viterbiLog`)
 * into `pathOut`, returning its joint log-probability log P(path, readings), or −Infinity when every
 * path is impossible (then `pathOut` is filled with −1): `traceViterbi` over `plainTransitions`, the
 * segment kernel as WebAssembly (`WasmViterbi`: the same numbers) where available and `useWasm`, else
 * JavaScript. Checkpointed above `limitBytes` of back-pointers (see `traceViterbi`).
 */
export function viterbiPath(chain: SparseChain, log: LogChain, obs: Int32Array, limitBytes: number, pathOut: Int32Array, useWasm = true): number {
  return traceViterbi(plainTransitions(chain, log, obs, useWasm), obs.length, limitBytes, pathOut);
}
