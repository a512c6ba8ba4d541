import type { SparseChain } from './sparse-chain.js';
import type { MoveChain, MoveSteps } from './move-chain.js';
import { positionSummary, type PositionPass } from './position-summary.js';

/**
 * `posteriorSummarySegment` with per-step transitions from odometry (`MoveChain`): the same per-step
 * summaries of γ_t (most likely cell and its probability, the given path's posterior, entropy in bits)
 * from the scaled backward recursion of `backwardMoveSegment`, with `u_t`, `c_t` from
 * `forwardMoveSegment`. Same conventions as `posteriorSummarySegment`, including the optional `position`
 * pass (area and position summaries of γ_t). No allocation.
 */
export function posteriorSummaryMoveSegment(
  chain: SparseChain,
  move: MoveChain,
  obs: Int32Array,
  steps: MoveSteps,
  t0: number,
  t1: number,
  table: Float64Array,
  scale: Float64Array,
  path: Int32Array,
  w: Float64Array,
  wSpare: Float64Array,
  likelyCellOut: Int32Array,
  likelyPOut: Float64Array,
  pathPOut: Float64Array,
  entropyOut: Float64Array,
  position?: PositionPass,
): void {
  const { nCells: n, nReadings: m, dwell, outPtr, outIdx, emitT } = chain;
  const { stayByDistance, eligible, splitOut, nHeadingBins } = move;
  const nLinks = outPtr[n];
  const { dBin, hBin } = steps;
  const last = obs.length - 1;
  let next = w;
  let out = wSpare;
  const gammaOut = position ? position.gamma : null;
  for (let t = t1 - 1; t >= t0; t--) {
    const row = (t - t0 + 1) * n;
    const o = obs[t];
    const e = (o < 0 ? m : o) * n;
    const z = t === last ? scale[t] : 0;
    const p = t > 0 ? scale[t - 1] : 1;
    const inside = t < last;
    const db = inside ? dBin[t + 1] : -1;
    const hb = inside ? hBin[t + 1] : -1;
    const off = (hb < 0 ? nHeadingBins : hb) * nLinks;
    const sd = db >= 0 ? stayByDistance[db] : 0;
    const onPath = path[t];
    let best = -1;
    let bestI = 0;
    let h = 0;
    let pathP = NaN;
    for (let i = 0; i < n; i++) {
      const s = db >= 0 && eligible[i] === 1 ? sd : dwell[i];
      let l = 0;
      const end = outPtr[i + 1];
      for (let q = outPtr[i]; q < end; q++) l += splitOut[off + q] * next[outIdx[q]];
      const b = s * next[i] + (1 - s) * l + z;
      const g = table[row + i] * b;
      if (g > best) {
        best = g;
        bestI = i;
      }
      if (g > 0) h -= g * Math.log2(g);
      if (i === onPath) pathP = g;
      if (gammaOut) gammaOut[i] = g;
      out[i] = p * emitT[e + i] * b;
    }
    likelyCellOut[t] = bestI;
    likelyPOut[t] = best;
    pathPOut[t] = pathP;
    entropyOut[t] = h;
    if (position) positionSummary(n, position, t);
    const swap = next;
    next = out;
    out = swap;
  }
  if (next !== w) w.set(next.subarray(0, n));
}
