import type { SparseChain } from '../kernels/sparse-chain.js';
import type { MoveSteps } from '../kernels/move-chain.js';
import { forwardMoveSegment } from '../kernels/forward-move-segment.js';
import { posteriorSummaryMoveSegment } from '../kernels/posterior-summary-move-segment.js';
import { viterbiMoveSegment } from '../kernels/viterbi-move-segment.js';
import type { LogChain } from './log-chain.js';
import { backPointerArray } from './back-pointer-array.js';
import type { TransitionSource } from './transition-source.js';
import { WasmMoveViterbi } from '../kernels/wasm-move-viterbi.js';

/** One WebAssembly Viterbi with odometry per thread, reused by every call (its memory grows to the largest run seen). */
let wasm: WasmMoveViterbi | null | undefined;

/**
 * Per-step transitions from odometry (`steps`) under a chain with movement tables (`chain.move`), for
 * one run: `viterbiMoveSegment` (as WebAssembly, `WasmMoveViterbi`, where available and `useWasm`, and
 * its memory can be had — the same numbers), `forwardMoveSegment`, `posteriorSummaryMoveSegment`.
 */
export function moveTransitions(chain: SparseChain, log: LogChain, obs: Int32Array, steps: MoveSteps, useWasm = true): TransitionSource {
  const move = chain.move;
  if (!move) throw new RangeError('moveTransitions: the chain must have movement tables (a model with movement parameters)');
  const n = chain.nCells;
  const work = new Float64Array(2 * n);
  return {
    nCells: n,
    viterbi(segment) {
      const logDwell = Float64Array.from(chain.dwell, Math.log);
      const logDwellGo = Float64Array.from(chain.dwell, (d) => Math.log(1 - d));
      const logStay = Float64Array.from(move.stayByDistance, Math.log);
      const logGo = Float64Array.from(move.stayByDistance, (s) => Math.log(1 - s));
      const logSplitIn = Float64Array.from(move.splitIn, Math.log);
      if (useWasm && wasm === undefined) wasm = WasmMoveViterbi.available() ? WasmMoveViterbi.create() : null;
      // A WebAssembly memory that cannot grow for this run leaves the JavaScript kernel to decode it.
      const prepared = useWasm && wasm ? wasm.prepare(chain, { logStart: log.logStart, logDwell, logDwellGo, logStay, logGo, logSplitIn, logEmitT: log.logEmitT }, obs, steps, segment) : null;
      if (prepared) {
        const machine = wasm as WasmMoveViterbi;
        return { delta: prepared.delta, back: prepared.back, run: (a, b) => machine.run(a, b) };
      }
      const delta = new Float64Array(2 * n);
      const back = backPointerArray(n, segment * n);
      const scratch = new Float64Array(2 * n);
      return {
        delta,
        back,
        run: (a, b) =>
          viterbiMoveSegment(n, chain.nReadings, log.logStart, logDwell, logDwellGo, logStay, logGo, move, logSplitIn, chain.inPtr, chain.inIdx, log.logEmitT, obs, steps, a, b, delta, back, scratch),
      };
    },
    forward: (t0, t1, table, scale, logIn) => forwardMoveSegment(chain, move, obs, steps, t0, t1, table, scale, logIn, work),
    summary: (t0, t1, table, scale, path, w, wSpare, likelyCell, likelyP, pathP, entropy, position) =>
      posteriorSummaryMoveSegment(chain, move, obs, steps, t0, t1, table, scale, path, w, wSpare, likelyCell, likelyP, pathP, entropy, position),
  };
}
