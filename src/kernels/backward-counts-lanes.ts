import type { LaneGroup, SparseChain } from './sparse-chain.js';

/**
 * E-step of Baum-Welch (Rabiner 1989, eqs. 37–40 for ξ and γ, section V.A scaling) for the eight runs of
 * a lane group, over the steps t1-1 … t0 of a segment, fused with the scaled backward recursion so the
 * backward table is never stored. With u_t and c_t from `forwardLanes` (α̂_t = c_t u_t; same table
 * layout), the backward vector is carried with the scaling folded in, β'_t = c_t β̂_t, as
 *
 *   ŵ_t(j)     = c_{t-1} b_j(o_t) β'_t(j)                      (ŵ_T = 0 past the end of the run)
 *   β'_t(i)    = a_ii ŵ_{t+1}(i) + Σ_{i → j} a_ij ŵ_{t+1}(j)  + c_t [t = T-1]
 *   ξ_t(i, j)  = u_t(i) a_ij ŵ_{t+1}(j),   γ_t(i) = u_t(i) β'_t(i)
 *
 * (the same numbers as α̂_t(i) a_ij c_{t+1} b_j(o_{t+1}) β̂_{t+1}(j) and α̂_t(i) β̂_t(i); folding c in saves
 * a multiply per cell and lane). It ADDS, summed over the lanes: Σ_t ξ_t(i, j) per link into `linkCount`
 * (the chain's `out` order), Σ_t ξ_t(i, i) into `dwellCount[i]`, γ_t(i) into `emitCount[r * nCells + i]`
 * for the reading r at t (`emitCount` has nReadings + 1 rows; dropouts and padded steps land in the last
 * one), and γ_0 into `startCount` when t0 = 0.
 *
 * `w` (8 · nCells, lane-interleaved like the table) holds ŵ_{t1} on entry (zeros when t1 is the group's
 * length) and ŵ_{t0} on return; `wSpare` is scratch of the same size. The end-of-run term makes
 * β̂_{T-1} = 1 exactly for each lane at its own length; padded steps have ŵ = 0, hence β' = 0, and add
 * exact zeros, so lanes of different lengths share the pass without changing any sum.
 *
 * Sums across lanes are taken in the order ((k0 + k2) + (k4 + k6)) + ((k1 + k3) + (k5 + k7)) — that of
 * four two-lane vectors added pairwise — so that `backwardLanesWasm` gives the same numbers bit for bit.
 *
 * Loop tricks, and why: eight lanes per pass (each link's index and probability loaded once for eight
 * runs, see `forwardLanes`); the dwell is a contiguous term outside the link loop; one pass over the
 * links per step does the backward product and the ξ accumulation together; ŵ_t is produced in the
 * same pass as β'_t, so no separate pass prepares it. No allocation.
 */
export function backwardCountsLanes(
  chain: SparseChain,
  group: LaneGroup,
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
  const { nCells: n, dwell, outPtr, outIdx, outProb, emitT } = chain;
  const rows = group.rows;
  const lens = group.laneSteps;
  const stride = 8 * n;
  let next = w; // ŵ_{t+1}
  let out = wSpare; // ŵ_t
  for (let t = t1 - 1; t >= t0; t--) {
    const row = (t - t0 + 1) * stride;
    const rb = t * 8;
    const e0 = rows[rb + 0];
    const e1 = rows[rb + 1];
    const e2 = rows[rb + 2];
    const e3 = rows[rb + 3];
    const e4 = rows[rb + 4];
    const e5 = rows[rb + 5];
    const e6 = rows[rb + 6];
    const e7 = rows[rb + 7];
    // c_t at each lane's last step (the end term); c_{t-1} for ŵ_t (1 at t = 0, where ŵ_0 is not used).
    const z0 = t === lens[0] - 1 ? scale[rb + 0] : 0;
    const z1 = t === lens[1] - 1 ? scale[rb + 1] : 0;
    const z2 = t === lens[2] - 1 ? scale[rb + 2] : 0;
    const z3 = t === lens[3] - 1 ? scale[rb + 3] : 0;
    const z4 = t === lens[4] - 1 ? scale[rb + 4] : 0;
    const z5 = t === lens[5] - 1 ? scale[rb + 5] : 0;
    const z6 = t === lens[6] - 1 ? scale[rb + 6] : 0;
    const z7 = t === lens[7] - 1 ? scale[rb + 7] : 0;
    const p0 = t > 0 ? scale[rb - 8] : 1;
    const p1 = t > 0 ? scale[rb - 7] : 1;
    const p2 = t > 0 ? scale[rb - 6] : 1;
    const p3 = t > 0 ? scale[rb - 5] : 1;
    const p4 = t > 0 ? scale[rb - 4] : 1;
    const p5 = t > 0 ? scale[rb - 3] : 1;
    const p6 = t > 0 ? scale[rb - 2] : 1;
    const p7 = t > 0 ? scale[rb - 1] : 1;
    for (let i = 0; i < n; i++) {
      const x = row + 8 * i;
      const u0 = table[x + 0];
      const u1 = table[x + 1];
      const u2 = table[x + 2];
      const u3 = table[x + 3];
      const u4 = table[x + 4];
      const u5 = table[x + 5];
      const u6 = table[x + 6];
      const u7 = table[x + 7];
      const y = 8 * i;
      const dw = dwell[i];
      const d0 = dw * next[y + 0];
      const d1 = dw * next[y + 1];
      const d2 = dw * next[y + 2];
      const d3 = dw * next[y + 3];
      const d4 = dw * next[y + 4];
      const d5 = dw * next[y + 5];
      const d6 = dw * next[y + 6];
      const d7 = dw * next[y + 7];
      dwellCount[i] += ((u0 * d0 + u2 * d2) + (u4 * d4 + u6 * d6)) + ((u1 * d1 + u3 * d3) + (u5 * d5 + u7 * d7));
      let l0 = 0;
      let l1 = 0;
      let l2 = 0;
      let l3 = 0;
      let l4 = 0;
      let l5 = 0;
      let l6 = 0;
      let l7 = 0;
      const end = outPtr[i + 1];
      for (let q = outPtr[i]; q < end; q++) {
        const v = (outIdx[q] << 3) | 0;
        const pr = outProb[q];
        const v0 = pr * next[(v + 0) | 0];
        const v1 = pr * next[(v + 1) | 0];
        const v2 = pr * next[(v + 2) | 0];
        const v3 = pr * next[(v + 3) | 0];
        const v4 = pr * next[(v + 4) | 0];
        const v5 = pr * next[(v + 5) | 0];
        const v6 = pr * next[(v + 6) | 0];
        const v7 = pr * next[(v + 7) | 0];
        l0 += v0;
        l1 += v1;
        l2 += v2;
        l3 += v3;
        l4 += v4;
        l5 += v5;
        l6 += v6;
        l7 += v7;
        linkCount[q] += ((u0 * v0 + u2 * v2) + (u4 * v4 + u6 * v6)) + ((u1 * v1 + u3 * v3) + (u5 * v5 + u7 * v7));
      }
      const b0 = d0 + l0 + z0;
      const b1 = d1 + l1 + z1;
      const b2 = d2 + l2 + z2;
      const b3 = d3 + l3 + z3;
      const b4 = d4 + l4 + z4;
      const b5 = d5 + l5 + z5;
      const b6 = d6 + l6 + z6;
      const b7 = d7 + l7 + z7;
      const g0 = u0 * b0;
      const g1 = u1 * b1;
      const g2 = u2 * b2;
      const g3 = u3 * b3;
      const g4 = u4 * b4;
      const g5 = u5 * b5;
      const g6 = u6 * b6;
      const g7 = u7 * b7;
      emitCount[e0 + i] += g0;
      emitCount[e1 + i] += g1;
      emitCount[e2 + i] += g2;
      emitCount[e3 + i] += g3;
      emitCount[e4 + i] += g4;
      emitCount[e5 + i] += g5;
      emitCount[e6 + i] += g6;
      emitCount[e7 + i] += g7;
      if (t === 0) startCount[i] += ((g0 + g2) + (g4 + g6)) + ((g1 + g3) + (g5 + g7));
      out[y + 0] = p0 * emitT[e0 + i] * b0;
      out[y + 1] = p1 * emitT[e1 + i] * b1;
      out[y + 2] = p2 * emitT[e2 + i] * b2;
      out[y + 3] = p3 * emitT[e3 + i] * b3;
      out[y + 4] = p4 * emitT[e4 + i] * b4;
      out[y + 5] = p5 * emitT[e5 + i] * b5;
      out[y + 6] = p6 * emitT[e6 + i] * b6;
      out[y + 7] = p7 * emitT[e7 + i] * b7;
    }
    const swap = next;
    next = out;
    out = swap;
  }
  if (next !== w) w.set(next.subarray(0, stride));
}
