import type { SparseChain } from '../kernels/sparse-chain.js';
import { forwardSegment } from '../kernels/forward-segment.js';
import { posteriorSummarySegment } from '../kernels/posterior-summary-segment.js';
import { viterbiSegment } from '../kernels/viterbi-segment.js';
import { WasmViterbi } from '../kernels/wasm-viterbi.js';
import type { LogChain } from './log-chain.js';
import { backPointerArray } from './back-pointer-array.js';
import type { TransitionSource } from './transition-source.js';

/** One WebAssembly Viterbi per thread, reused by every call (its memory grows to the largest run seen). */
let wasm: WasmViterbi | null | undefined;

/**
 * The plain chain's transitions for one run: `viterbiSegment` (as WebAssembly, `WasmViterbi`, where
 * available and `useWasm`, and its memory can be had — the same numbers), `forwardSegment`,
 * `posteriorSummarySegment`.
 */
export function plainTransitions(chain: SparseChain, log: LogChain, obs: Int32Array, useWasm = true): TransitionSource {
  const n = chain.nCells;
  return {
    nCells: n,
    viterbi(segment) {
      // The kernels take the dwell apart from the links (both as logs, in the chain's dwell/`in` split).
      const logDwell = Float64Array.from(chain.dwell, Math.log);
      const logInProb = Float64Array.from(chain.inProb, Math.log);
      if (useWasm && wasm === undefined) wasm = WasmViterbi.available() ? WasmViterbi.create() : null;
      // A WebAssembly memory that cannot grow for this run leaves the JavaScript kernel to decode it.
      const prepared = useWasm && wasm ? wasm.prepare(chain, log.logStart, logDwell, logInProb, log.logEmitT, obs, segment) : null;
      if (prepared) {
        const machine = wasm as WasmViterbi;
        return { ...prepared, run: (a, b) => machine.run(a, b) };
      }
      const delta = new Float64Array(2 * n);
      const back = backPointerArray(n, segment * n);
      return {
        delta,
        back,
        run: (a, b) => viterbiSegment(n, chain.nReadings, log.logStart, logDwell, chain.inPtr, chain.inIdx, logInProb, log.logEmitT, obs, a, b, delta, back),
      };
    },
    forward: (t0, t1, table, scale, logIn) => forwardSegment(chain, obs, t0, t1, table, scale, logIn),
    summary: (t0, t1, table, scale, path, w, wSpare, likelyCell, likelyP, pathP, entropy, position) =>
      posteriorSummarySegment(chain, obs, t0, t1, table, scale, path, w, wSpare, likelyCell, likelyP, pathP, entropy, position),
  };
}
