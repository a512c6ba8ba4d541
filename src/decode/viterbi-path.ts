import type { SparseChain } from '../kernels/sparse-chain.js';
import { viterbiSegment } from '../kernels/viterbi-segment.js';
import { segmentSteps } from '../kernels/segment-steps.js';
import { WasmViterbi } from '../kernels/wasm-viterbi.js';
import type { LogChain } from './log-chain.js';
import { backPointerArray } from './back-pointer-array.js';

/** One WebAssembly Viterbi per thread, reused by every call (its memory grows to the largest run seen). */
let wasm: WasmViterbi | null | undefined;

/**
 * The Viterbi path of one run (ties to the lowest cell index, as `viterbiLog`) into `pathOut`, returning
 * its joint log-probability log P(path, readings), or −Infinity when every path is impossible (then
 * `pathOut` is filled with −1). Runs `viterbiSegment` as WebAssembly (`WasmViterbi`: the same numbers)
 * where available and `useWasm` (and its memory can be had), else in JavaScript.
 *
 * Back-pointers are kept in the narrowest integer type that holds the cell count. When the run's
 * back-pointers would exceed `limitBytes`, the decoding is checkpointed (`segmentSteps`): the first pass
 * keeps only the score vector δ at the entry of each segment, and the trace-back re-runs each segment
 * but the last from its checkpoint to get its back-pointers again — memory stays near the limit (or
 * grows as √T), for up to a second pass, and the path is the same as in one pass (the re-run is
 * bit-identical).
 */
export function viterbiPath(chain: SparseChain, log: LogChain, obs: Int32Array, limitBytes: number, pathOut: Int32Array, useWasm = true): number {
  const n = chain.nCells;
  const T = obs.length;
  if (T === 0) return 0;
  const pointerBytes = n <= 256 ? 1 : n <= 65536 ? 2 : 4;
  const segment = segmentSteps(T, n * pointerBytes, limitBytes);
  const nSegments = Math.ceil(T / segment);
  const checkpoints = new Float64Array(nSegments > 1 ? nSegments * n : 0);
  // The kernels take the dwell apart from the links (both as logs, in the chain's dwell/`in` split).
  const logDwell = Float64Array.from(chain.dwell, Math.log);
  const logInProb = Float64Array.from(chain.inProb, Math.log);

  if (useWasm && wasm === undefined) wasm = WasmViterbi.available() ? WasmViterbi.create() : null;
  // A WebAssembly memory that cannot grow for this run leaves the JavaScript kernel to decode it.
  const prepared = useWasm && wasm ? wasm.prepare(chain, log.logStart, logDwell, logInProb, log.logEmitT, obs, segment) : null;
  let delta: Float64Array;
  let back: Uint8Array | Uint16Array | Int32Array;
  let run: (a: number, b: number) => void;
  if (prepared) {
    const machine = wasm as WasmViterbi;
    ({ delta, back } = prepared);
    run = (a, b) => machine.run(a, b);
  } else {
    delta = new Float64Array(2 * n);
    back = backPointerArray(n, segment * n);
    run = (a, b) => viterbiSegment(n, chain.nReadings, log.logStart, logDwell, chain.inPtr, chain.inIdx, logInProb, log.logEmitT, obs, a, b, delta, back);
  }

  for (let g = 0; g < nSegments; g++) {
    if (g > 0) checkpoints.set(delta.subarray(0, n), g * n);
    run(g * segment, Math.min(T, (g + 1) * segment));
  }
  let cell = 0;
  let best = delta[0];
  for (let j = 1; j < n; j++) {
    if (delta[j] > best) {
      best = delta[j];
      cell = j;
    }
  }
  if (best === -Infinity || Number.isNaN(best)) {
    pathOut.fill(-1, 0, T);
    return -Infinity;
  }
  pathOut[T - 1] = cell;
  for (let g = nSegments - 1; g >= 0; g--) {
    const a = g * segment;
    const b = Math.min(T, a + segment);
    if (g < nSegments - 1) {
      if (g > 0) delta.set(checkpoints.subarray(g * n, (g + 1) * n), 0);
      run(a, b);
    }
    for (let t = b - 1; t >= Math.max(a, 1); t--) {
      cell = back[(t - a) * n + cell];
      pathOut[t - 1] = cell;
    }
  }
  return best;
}
