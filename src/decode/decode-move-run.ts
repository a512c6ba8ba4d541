import type { SparseChain } from '../kernels/sparse-chain.js';
import type { MoveSteps } from '../kernels/move-chain.js';
import type { LogChain } from './log-chain.js';
import type { DecodedRun, DecodeOptions } from './decoded-run.js';
import { decodeWith } from './decode-with.js';
import { moveTransitions } from './move-transitions.js';

/**
 * `decodeRun` for a run with odometry (`steps`) under a chain with movement tables (`chain.move`): the
 * same driver (`decodeWith`) over per-step transitions (`moveTransitions`). Same outputs, same
 * checkpointing; the Viterbi pass as WebAssembly where available (`moveTransitions`).
 */
export function decodeMoveRun(chain: SparseChain, log: LogChain, obs: Int32Array, steps: MoveSteps, options: DecodeOptions = {}): DecodedRun {
  if (!chain.move) throw new RangeError('decodeMoveRun: the chain must have movement tables (a model with movement parameters)');
  return decodeWith(moveTransitions(chain, log, obs, steps), obs, options);
}
