import type { LaneGroup, SparseChain } from './sparse-chain.js';

/**
 * Scaled forward recursion (Rabiner 1989, eqs. 19–20 with the scaling of section V.A) for the four runs
 * of a lane group at once, over the steps `t0 … t1-1` of a segment (the whole run, or one checkpointed
 * block of it):
 *
 *   u_0(j) = π_j b_j(o_0),   u_t(j) = b_j(o_t) c_{t-1} [a_jj u_{t-1}(j) + Σ_{i → j} a_ij u_{t-1}(i)],
 *   c_t = 1 / Σ_j u_t(j),
 *
 * so that α̂_t = c_t u_t is the normalised forward vector and log P = −Σ_t log c_t = Σ_t log Σ_j u_t(j).
 *
 * Table: rows of nCells × 4 numbers (`(row * nCells + j) * 4 + k`); row `t - t0 + 1` receives u_t, and
 * row 0 must hold u_{t0-1} when t0 > 0 (a checkpoint, or the previous segment's last row). `scale` is
 * steps × 4 (`t * 4 + k`) and receives c_t; c_{t0-1} must be there when t0 > 0. For each lane with
 * t < its length, log Σ_j u_t(j) is added to `logOut[k]`; a lane whose readings become impossible gets
 * −Infinity there (its later numbers are meaningless but finite). Padded steps add nothing.
 *
 * Loop tricks, and why:
 * - four lanes per pass: each link's source index and probability are loaded once and used four times,
 *   and the four independent sums keep the floating-point units busy (1 load + 1 multiply-add per
 *   lane-link, against 3 loads for one run alone); the lanes are unrolled by hand, since a loop over
 *   a runtime lane count is several times slower in V8;
 * - the dwell is a separate, contiguous term (every cell has one), so the gather loop runs over links only;
 * - deferred normalisation: u_t is stored unscaled and c_{t-1} is applied while computing u_t, which
 *   saves a read-modify-write pass over the vector at every step;
 * - gather over predecessors: each u_t(j) is written once, no scatter and no zeroing pass.
 * Every lane's arithmetic is exactly that of `forwardSegment` on the run alone (same order), so a run's
 * numbers do not depend on the group it is in. No allocation.
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
  const len0 = group.laneSteps[0];
  const len1 = group.laneSteps[1];
  const len2 = group.laneSteps[2];
  const len3 = group.laneSteps[3];
  const stride = 4 * n;
  for (let t = t0; t < t1; t++) {
    const cur = (t - t0 + 1) * stride;
    const rb = t * 4;
    const e0 = rows[rb];
    const e1 = rows[rb + 1];
    const e2 = rows[rb + 2];
    const e3 = rows[rb + 3];
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    if (t === 0) {
      for (let j = 0; j < n; j++) {
        const p = start[j];
        const z = cur + 4 * j;
        const v0 = p * emitT[e0 + j];
        const v1 = p * emitT[e1 + j];
        const v2 = p * emitT[e2 + j];
        const v3 = p * emitT[e3 + j];
        table[z] = v0;
        table[z + 1] = v1;
        table[z + 2] = v2;
        table[z + 3] = v3;
        s0 += v0;
        s1 += v1;
        s2 += v2;
        s3 += v3;
      }
    } else {
      const prev = cur - stride;
      const c0 = scale[rb - 4];
      const c1 = scale[rb - 3];
      const c2 = scale[rb - 2];
      const c3 = scale[rb - 1];
      for (let j = 0; j < n; j++) {
        const x = prev + 4 * j;
        const d = dwell[j];
        let a0 = table[x] * d;
        let a1 = table[x + 1] * d;
        let a2 = table[x + 2] * d;
        let a3 = table[x + 3] * d;
        const end = inPtr[j + 1];
        for (let p = inPtr[j]; p < end; p++) {
          const y = prev + 4 * inIdx[p];
          const pr = inProb[p];
          a0 += table[y] * pr;
          a1 += table[y + 1] * pr;
          a2 += table[y + 2] * pr;
          a3 += table[y + 3] * pr;
        }
        const z = cur + 4 * j;
        const v0 = a0 * c0 * emitT[e0 + j];
        const v1 = a1 * c1 * emitT[e1 + j];
        const v2 = a2 * c2 * emitT[e2 + j];
        const v3 = a3 * c3 * emitT[e3 + j];
        table[z] = v0;
        table[z + 1] = v1;
        table[z + 2] = v2;
        table[z + 3] = v3;
        s0 += v0;
        s1 += v1;
        s2 += v2;
        s3 += v3;
      }
    }
    // c_t, and log Σ u_t for the lanes still inside their run. An impossible step gets c = 1 so that the
    // lane stays finite (zeros) and cannot spoil the sums that the lanes share in the backward pass.
    scale[rb] = s0 > 0 ? 1 / s0 : 1;
    scale[rb + 1] = s1 > 0 ? 1 / s1 : 1;
    scale[rb + 2] = s2 > 0 ? 1 / s2 : 1;
    scale[rb + 3] = s3 > 0 ? 1 / s3 : 1;
    if (t < len0) logOut[0] += s0 > 0 ? Math.log(s0) : -Infinity;
    if (t < len1) logOut[1] += s1 > 0 ? Math.log(s1) : -Infinity;
    if (t < len2) logOut[2] += s2 > 0 ? Math.log(s2) : -Infinity;
    if (t < len3) logOut[3] += s3 > 0 ? Math.log(s3) : -Infinity;
  }
}
