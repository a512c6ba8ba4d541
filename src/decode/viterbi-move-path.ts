import type { SparseChain } from '../kernels/sparse-chain.js';
import type { MoveSteps } from '../kernels/move-chain.js';
import { viterbiMoveSegment } from '../kernels/viterbi-move-segment.js';
import { segmentSteps } from '../kernels/segment-steps.js';
import type { LogChain } from './log-chain.js';
import { backPointerArray } from './back-pointer-array.js';
import { WasmMoveViterbi } from '../kernels/wasm-move-viterbi.js';

/** One WebAssembly Viterbi with odometry per thread, reused by every call (its memory grows to the largest run seen). */
let wasm: WasmMoveViterbi | null | undefined;

/**
 * `viterbiPath` for a run with odometry: the Viterbi path under per-step transitions
 * (`viterbiMoveSegment`), checkpointed the same way above `limitBytes`. Runs as WebAssembly
 * (`WasmMoveViterbi`: the same scores and back-pointers) where available and `useWasm` (and its memory
 * can be had), else in JavaScript. Returns log P(path, readings), or −Infinity (path filled with −1)
 * when every path is impossible.
 */
export function viterbiMovePath(chain: SparseChain, log: LogChain, obs: Int32Array, steps: MoveSteps, limitBytes: number, pathOut: Int32Array, useWasm = true): number {
  const move = chain.move!;
  const n = chain.nCells;
  const T = obs.length;
  if (T === 0) return 0;
  const pointerBytes = n <= 256 ? 1 : n <= 65536 ? 2 : 4;
  const segment = segmentSteps(T, n * pointerBytes, limitBytes);
  const nSegments = Math.ceil(T / segment);
  const checkpoints = new Float64Array(nSegments > 1 ? nSegments * n : 0);
  const logDwell = Float64Array.from(chain.dwell, Math.log);
  const logDwellGo = Float64Array.from(chain.dwell, (d) => Math.log(1 - d));
  const logStay = Float64Array.from(move.stayByDistance, Math.log);
  const logGo = Float64Array.from(move.stayByDistance, (s) => Math.log(1 - s));
  const logSplitIn = Float64Array.from(move.splitIn, Math.log);
  if (useWasm && wasm === undefined) wasm = WasmMoveViterbi.available() ? WasmMoveViterbi.create() : null;
  // A WebAssembly memory that cannot grow for this run leaves the JavaScript kernel to decode it.
  const prepared = useWasm && wasm ? wasm.prepare(chain, { logStart: log.logStart, logDwell, logDwellGo, logStay, logGo, logSplitIn, logEmitT: log.logEmitT }, obs, steps, segment) : null;
  let delta: Float64Array;
  let back: Uint8Array | Uint16Array | Int32Array;
  let run: (a: number, b: number) => void;
  if (prepared) {
    const machine = wasm as WasmMoveViterbi;
    ({ delta, back } = prepared);
    run = (a, b) => machine.run(a, b);
  } else {
    delta = new Float64Array(2 * n);
    const work = new Float64Array(2 * n);
    back = backPointerArray(n, segment * n);
    run = (a, b) =>
      viterbiMoveSegment(n, chain.nReadings, log.logStart, logDwell, logDwellGo, logStay, logGo, move, logSplitIn, chain.inPtr, chain.inIdx, log.logEmitT, obs, steps, a, b, delta, back, work);
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
