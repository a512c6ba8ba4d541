import { segmentSteps } from '../kernels/segment-steps.js';
import type { TransitionSource } from './transition-source.js';

/**
 * The Viterbi path of one run of `nSteps` steps under `source` (ties to the lowest cell index, as
 * `viterbiLog`) into `pathOut`, returning its joint log-probability log P(path, readings), or −Infinity
 * when every path is impossible (then `pathOut` is filled with −1).
 *
 * Back-pointers are kept in the narrowest integer type that holds the cell count. When the run's
 * back-pointers would exceed `limitBytes`, the decoding is checkpointed (`segmentSteps`): the first pass
 * keeps only the score vector δ at the entry of each segment, and the trace-back re-runs each segment
 * but the last from its checkpoint to get its back-pointers again — memory stays near the limit (or
 * grows as √T), for up to a second pass, and the path is the same as in one pass (the re-run is
 * bit-identical).
 */
export function traceViterbi(source: TransitionSource, nSteps: number, limitBytes: number, pathOut: Int32Array): number {
  const n = source.nCells;
  const T = nSteps;
  if (T === 0) return 0;
  const pointerBytes = n <= 256 ? 1 : n <= 65536 ? 2 : 4;
  const segment = segmentSteps(T, n * pointerBytes, limitBytes);
  const nSegments = Math.ceil(T / segment);
  const checkpoints = new Float64Array(nSegments > 1 ? nSegments * n : 0);
  const { delta, back, run } = source.viterbi(segment);
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
