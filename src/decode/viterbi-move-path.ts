import type { SparseChain } from '../kernels/sparse-chain.js';
import type { MoveSteps } from '../kernels/move-chain.js';
import type { LogChain } from './log-chain.js';
import { moveTransitions } from './move-transitions.js';
import { traceViterbi } from './trace-viterbi.js';

/**
 * `viterbiPath` for a run with odometry: the Viterbi path under per-step transitions, `traceViterbi`
 * over `moveTransitions` — as WebAssembly (`WasmMoveViterbi`: the same scores and back-pointers) where
 * available and `useWasm` (and its memory can be had), else `viterbiMoveSegment` in JavaScript.
 * Checkpointed the same way above `limitBytes`. Returns log P(path, readings), or −Infinity (path filled
 * with −1) when every path is impossible.
 */
export function viterbiMovePath(chain: SparseChain, log: LogChain, obs: Int32Array, steps: MoveSteps, limitBytes: number, pathOut: Int32Array, useWasm = true): number {
  return traceViterbi(moveTransitions(chain, log, obs, steps, useWasm), obs.length, limitBytes, pathOut);
}
