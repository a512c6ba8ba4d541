import type { SparseChain } from './sparse-chain.js';

/**
 * E-step of Baum-Welch for one run (Rabiner 1989, eqs. 37–40 for ξ and γ, section V.A scaling) over the
 * steps t1-1 … t0 of a segment, fused with the scaled backward recursion so the backward table is never
 * stored. With u_t and c_t from `forwardSegment` (α̂_t = c_t u_t; same table layout) and the backward
 * vector carried with the scaling folded in, β'_t = c_t β̂_t:
 *
 *   ŵ_t(j)     = c_{t-1} b_j(o_t) β'_t(j)                      (ŵ_T = 0 past the end of the run)
 *   β'_t(i)    = a_ii ŵ_{t+1}(i) + Σ_{i → j} a_ij ŵ_{t+1}(j)  + c_t [t = T-1]
 *   ξ_t(i, j)  = u_t(i) a_ij ŵ_{t+1}(j),   γ_t(i) = u_t(i) β'_t(i),
 *
 * it ADDS Σ_t ξ_t(i, j) per link into `linkCount` (the chain's `out` order), Σ_t ξ_t(i, i) into
 * `dwellCount[i]`, γ_t(i) into `emitCount[r * nCells + i]` for the reading r at t (`emitCount` has
 * nReadings + 1 rows; dropouts land in the last one), and γ_0 into `startCount` when t0 = 0. `w`
 * (nCells) holds ŵ_{t1} on entry (zeros when t1 = T) and ŵ_{t0} on return; `wSpare` is scratch of the
 * same size. T = `obs.length`.
 *
 * Loop tricks: the dwell is a contiguous term outside the link loop; one pass over the links per step
 * does the backward product and the ξ accumulation together (2 multiply-adds per step-link); ŵ_t is
 * produced in the same pass as β'_t. The arithmetic, in this order, is that of each lane of
 * `backwardCountsLanes`. No allocation.
 */
export function backwardCountsSegment(
  chain: SparseChain,
  obs: Int32Array,
  t0: number,
  t1: number,
  table: Float64Array,
  scale: Float64Array,
  w: Float64Array,
  wSpare: Float64Array,
  emitCount: Float64Array,
  linkCount: Float64Array,
  dwellCount: Float64Array,
  startCount: Float64Array,
): void {
  const { nCells: n, nReadings: m, dwell, outPtr, outIdx, outProb, emitT } = chain;
  const last = obs.length - 1;
  let next = w; // ŵ_{t+1}
  let out = wSpare; // ŵ_t
  for (let t = t1 - 1; t >= t0; t--) {
    const row = (t - t0 + 1) * n;
    const o = obs[t];
    const e = (o < 0 ? m : o) * n;
    const z = t === last ? scale[t] : 0;
    const p = t > 0 ? scale[t - 1] : 1;
    for (let i = 0; i < n; i++) {
      const u = table[row + i];
      const d = dwell[i] * next[i];
      dwellCount[i] += u * d;
      let l = 0;
      const end = outPtr[i + 1];
      for (let q = outPtr[i]; q < end; q++) {
        const v = outProb[q] * next[outIdx[q]];
        l += v;
        linkCount[q] += u * v;
      }
      const b = d + l + z;
      const g = u * b;
      emitCount[e + i] += g;
      if (t === 0) startCount[i] += g;
      out[i] = p * emitT[e + i] * b;
    }
    const swap = next;
    next = out;
    out = swap;
  }
  if (next !== w) w.set(next.subarray(0, n));
}
