import type { SparseChain } from './sparse-chain.js';
import { positionSummary, type PositionPass } from './position-summary.js';

/**
 * Per-step summaries of the posterior over cells for the steps t1-1 … t0 of a segment, computed during
 * the scaled backward recursion (Rabiner 1989, eqs. 24–27, section V.A scaling) so that no steps × cells
 * posterior table is stored. With u_t and c_t from `forwardSegment` (α̂_t = c_t u_t; same table layout)
 * and the backward vector carried with the scaling folded in, β'_t = c_t β̂_t, as in
 * `backwardCountsSegment`:
 *
 *   ŵ_t(j) = c_{t-1} b_j(o_t) β'_t(j),   β'_t(i) = a_ii ŵ_{t+1}(i) + Σ_{i → j} a_ij ŵ_{t+1}(j) + c_t [t = T-1],
 *
 * the posterior is γ_t(i) = α̂_t(i) β̂_t(i) = u_t(i) β'_t(i), and at each step t:
 * - `likelyCellOut[t]` = argmax_i γ_t(i) (lowest index on ties), `likelyPOut[t]` its probability;
 * - `pathPOut[t]` = γ_t(path[t]), the posterior of the given path's cell (e.g. the Viterbi path);
 * - `entropyOut[t]` = −Σ_i γ_t(i) log2 γ_t(i), in bits.
 *
 * - with `position`: γ_t is copied into `position.gamma` and `positionSummary` writes the step's area
 *   and position summaries (the outputs above are unchanged by it).
 *
 * `w` (nCells) holds ŵ_{t1} on entry (zeros when t1 = T) and ŵ_{t0} on return; `wSpare` is scratch of
 * the same size; T = `obs.length`. Same arithmetic as `backwardCountsSegment`. No allocation.
 */
export function posteriorSummarySegment(
  chain: SparseChain,
  obs: Int32Array,
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
  const { nCells: n, nReadings: m, dwell, outPtr, outIdx, outProb, emitT } = chain;
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
    const onPath = path[t];
    let best = -1;
    let bestI = 0;
    let h = 0;
    let pathP = NaN;
    for (let i = 0; i < n; i++) {
      let l = 0;
      const end = outPtr[i + 1];
      for (let q = outPtr[i]; q < end; q++) l += outProb[q] * next[outIdx[q]];
      const b = dwell[i] * next[i] + l + z;
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
