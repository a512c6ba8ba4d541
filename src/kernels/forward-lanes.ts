import type { LaneGroup, SparseChain } from './sparse-chain.js';

/**
 * Scaled forward recursion (Rabiner 1989, eqs. 19–20 with the scaling of section V.A) for the eight runs
 * of a lane group at once, over the steps `t0 … t1-1` of a segment (the whole run, or one checkpointed
 * block of it):
 *
 *   u_0(j) = π_j b_j(o_0),   u_t(j) = b_j(o_t) c_{t-1} [a_jj u_{t-1}(j) + Σ_{i → j} a_ij u_{t-1}(i)],
 *   c_t = 1 / Σ_j u_t(j),
 *
 * so that α̂_t = c_t u_t is the normalised forward vector and log P = −Σ_t log c_t = Σ_t log Σ_j u_t(j).
 *
 * Table: rows of nCells × 8 numbers (`(row * nCells + j) * 8 + k`); row `t - t0 + 1` receives u_t, and
 * row 0 must hold u_{t0-1} when t0 > 0 (a checkpoint, or the previous segment's last row). `scale` is
 * steps × 8 (`t * 8 + k`) and receives c_t; c_{t0-1} must be there when t0 > 0. For each lane with
 * t < its length, log Σ_j u_t(j) is added to `logOut[k]`; a lane whose readings become impossible gets
 * −Infinity there (its later numbers are meaningless but finite). Padded steps add nothing.
 *
 * Loop tricks, and why:
 * - eight lanes per pass: each link's source index and probability are loaded once and used eight
 *   times, and the independent sums keep the floating-point units busy (1 load + 1 multiply-add per
 *   lane-link, against 3 loads for one run alone). The lanes are written out by hand: a loop over a
 *   runtime lane count runs several times slower in V8, and eight lanes measured about 7 % faster than
 *   four on the medium scenario (bench/kernel-split.ts);
 * - the dwell is a separate, contiguous term (every cell has one), so the gather loop runs over links
 *   only; padding rows to a fixed width (ELL) was measured slower than this loop once lanes are used;
 * - deferred normalisation: u_t is stored unscaled and c_{t-1} is applied while computing u_t, which
 *   saves a read-modify-write pass over the vector at every step;
 * - gather over predecessors: each u_t(j) is written once, no scatter and no zeroing pass;
 * - `| 0` on index arithmetic keeps it in 32-bit integers, sparing V8 an overflow check per access.
 * Every lane's arithmetic is exactly that of `forwardSegment` on the run alone (same order), so a run's
 * numbers do not depend on the group it is in, and that of `forwardLanesWasm` (the same numbers, bit for
 * bit). No allocation.
 */
export function forwardLanes(
  chain: SparseChain,
  group: LaneGroup,
  t0: number,
  t1: number,
  table: Float64Array,
  scale: Float64Array,
  logOut: Float64Array,
): void {
  const { nCells: n, start, dwell, inPtr, inIdx, inProb, emitT } = chain;
  const rows = group.rows;
  const lens = group.laneSteps;
  const stride = 8 * n;
  for (let t = t0; t < t1; t++) {
    const cur = (t - t0 + 1) * stride;
    const rb = t * 8;
    const e0 = rows[rb + 0];
    const e1 = rows[rb + 1];
    const e2 = rows[rb + 2];
    const e3 = rows[rb + 3];
    const e4 = rows[rb + 4];
    const e5 = rows[rb + 5];
    const e6 = rows[rb + 6];
    const e7 = rows[rb + 7];
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    let s4 = 0;
    let s5 = 0;
    let s6 = 0;
    let s7 = 0;
    if (t === 0) {
      for (let j = 0; j < n; j++) {
        const p = start[j];
        const z = cur + 8 * j;
        const v0 = p * emitT[e0 + j];
        const v1 = p * emitT[e1 + j];
        const v2 = p * emitT[e2 + j];
        const v3 = p * emitT[e3 + j];
        const v4 = p * emitT[e4 + j];
        const v5 = p * emitT[e5 + j];
        const v6 = p * emitT[e6 + j];
        const v7 = p * emitT[e7 + j];
        table[z + 0] = v0;
        table[z + 1] = v1;
        table[z + 2] = v2;
        table[z + 3] = v3;
        table[z + 4] = v4;
        table[z + 5] = v5;
        table[z + 6] = v6;
        table[z + 7] = v7;
        s0 += v0;
        s1 += v1;
        s2 += v2;
        s3 += v3;
        s4 += v4;
        s5 += v5;
        s6 += v6;
        s7 += v7;
      }
    } else {
      const prev = cur - stride;
      const c0 = scale[rb - 8];
      const c1 = scale[rb - 7];
      const c2 = scale[rb - 6];
      const c3 = scale[rb - 5];
      const c4 = scale[rb - 4];
      const c5 = scale[rb - 3];
      const c6 = scale[rb - 2];
      const c7 = scale[rb - 1];
      for (let j = 0; j < n; j++) {
        const x = prev + 8 * j;
        const d = dwell[j];
        let a0 = table[x + 0] * d;
        let a1 = table[x + 1] * d;
        let a2 = table[x + 2] * d;
        let a3 = table[x + 3] * d;
        let a4 = table[x + 4] * d;
        let a5 = table[x + 5] * d;
        let a6 = table[x + 6] * d;
        let a7 = table[x + 7] * d;
        const end = inPtr[j + 1];
        for (let p = inPtr[j]; p < end; p++) {
          const y = (prev + (inIdx[p] << 3)) | 0;
          const pr = inProb[p];
          a0 += table[(y + 0) | 0] * pr;
          a1 += table[(y + 1) | 0] * pr;
          a2 += table[(y + 2) | 0] * pr;
          a3 += table[(y + 3) | 0] * pr;
          a4 += table[(y + 4) | 0] * pr;
          a5 += table[(y + 5) | 0] * pr;
          a6 += table[(y + 6) | 0] * pr;
          a7 += table[(y + 7) | 0] * pr;
        }
        const z = cur + 8 * j;
        const v0 = a0 * c0 * emitT[e0 + j];
        const v1 = a1 * c1 * emitT[e1 + j];
        const v2 = a2 * c2 * emitT[e2 + j];
        const v3 = a3 * c3 * emitT[e3 + j];
        const v4 = a4 * c4 * emitT[e4 + j];
        const v5 = a5 * c5 * emitT[e5 + j];
        const v6 = a6 * c6 * emitT[e6 + j];
        const v7 = a7 * c7 * emitT[e7 + j];
        table[z + 0] = v0;
        table[z + 1] = v1;
        table[z + 2] = v2;
        table[z + 3] = v3;
        table[z + 4] = v4;
        table[z + 5] = v5;
        table[z + 6] = v6;
        table[z + 7] = v7;
        s0 += v0;
        s1 += v1;
        s2 += v2;
        s3 += v3;
        s4 += v4;
        s5 += v5;
        s6 += v6;
        s7 += v7;
      }
    }
    // c_t, and log Σ u_t for the lanes still inside their run. An impossible step gets c = 1 so that the
    // lane stays finite (zeros) and cannot spoil the sums that the lanes share in the backward pass.
    scale[rb + 0] = s0 > 0 ? 1 / s0 : 1;
    scale[rb + 1] = s1 > 0 ? 1 / s1 : 1;
    scale[rb + 2] = s2 > 0 ? 1 / s2 : 1;
    scale[rb + 3] = s3 > 0 ? 1 / s3 : 1;
    scale[rb + 4] = s4 > 0 ? 1 / s4 : 1;
    scale[rb + 5] = s5 > 0 ? 1 / s5 : 1;
    scale[rb + 6] = s6 > 0 ? 1 / s6 : 1;
    scale[rb + 7] = s7 > 0 ? 1 / s7 : 1;
    if (t < lens[0]) logOut[0] += s0 > 0 ? Math.log(s0) : -Infinity;
    if (t < lens[1]) logOut[1] += s1 > 0 ? Math.log(s1) : -Infinity;
    if (t < lens[2]) logOut[2] += s2 > 0 ? Math.log(s2) : -Infinity;
    if (t < lens[3]) logOut[3] += s3 > 0 ? Math.log(s3) : -Infinity;
    if (t < lens[4]) logOut[4] += s4 > 0 ? Math.log(s4) : -Infinity;
    if (t < lens[5]) logOut[5] += s5 > 0 ? Math.log(s5) : -Infinity;
    if (t < lens[6]) logOut[6] += s6 > 0 ? Math.log(s6) : -Infinity;
    if (t < lens[7]) logOut[7] += s7 > 0 ? Math.log(s7) : -Infinity;
  }
}
