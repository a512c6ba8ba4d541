import type { LaneGroup, SparseChain } from './sparse-chain.js';

/**
 * `forwardLanes` for a chain whose links out of each cell share one probability f_i
 * (`chain.uniformLinks`: the equal split of the `tied` family). Same recursion, arguments and results —
 * bit for bit, since f_i u(i) is the very product u(i) a_ij — with the link probabilities taken out of
 * the gather:
 *
 *   u_t(j) = b_j(o_t) c_{t-1} [a_jj u_{t-1}(j) + Σ_{i → j} s_{t-1}(i)],   s_t(i) = f_i u_t(i),
 *
 * where s_t is written beside u_t as it is computed (one multiply per cell and lane), so the link loop
 * is one load and one add per lane-link, with no probability loaded at all. `spread` is scratch of
 * 2 · 4 · nCells numbers for s_{t-1} and s_t. Loop tricks otherwise as in `forwardLanes`. No allocation.
 */
export function forwardLanesUniform(
  chain: SparseChain,
  group: LaneGroup,
  t0: number,
  t1: number,
  table: Float64Array,
  scale: Float64Array,
  spread: Float64Array,
  logOut: Float64Array,
): void {
  const { nCells: n, start, dwell, linkProb, inPtr, inIdx, emitT } = chain;
  const rows = group.rows;
  const len0 = group.laneSteps[0];
  const len1 = group.laneSteps[1];
  const len2 = group.laneSteps[2];
  const len3 = group.laneSteps[3];
  const stride = 4 * n;
  let sPrev = 0; // s_{t-1} in spread
  let sCur = stride; // s_t in spread
  if (t0 > 0) {
    // s_{t0-1} from the segment's entry row (row 0 of the table).
    for (let i = 0; i < n; i++) {
      const f = linkProb[i];
      const x = 4 * i;
      spread[x] = f * table[x];
      spread[x + 1] = f * table[x + 1];
      spread[x + 2] = f * table[x + 2];
      spread[x + 3] = f * table[x + 3];
    }
  }
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
        const f = linkProb[j];
        const z = cur + 4 * j;
        const h = sCur + 4 * j;
        const v0 = p * emitT[e0 + j];
        const v1 = p * emitT[e1 + j];
        const v2 = p * emitT[e2 + j];
        const v3 = p * emitT[e3 + j];
        table[z] = v0;
        table[z + 1] = v1;
        table[z + 2] = v2;
        table[z + 3] = v3;
        spread[h] = f * v0;
        spread[h + 1] = f * v1;
        spread[h + 2] = f * v2;
        spread[h + 3] = f * v3;
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
          const y = sPrev + 4 * inIdx[p];
          a0 += spread[y];
          a1 += spread[y + 1];
          a2 += spread[y + 2];
          a3 += spread[y + 3];
        }
        const f = linkProb[j];
        const z = cur + 4 * j;
        const h = sCur + 4 * j;
        const v0 = a0 * c0 * emitT[e0 + j];
        const v1 = a1 * c1 * emitT[e1 + j];
        const v2 = a2 * c2 * emitT[e2 + j];
        const v3 = a3 * c3 * emitT[e3 + j];
        table[z] = v0;
        table[z + 1] = v1;
        table[z + 2] = v2;
        table[z + 3] = v3;
        spread[h] = f * v0;
        spread[h + 1] = f * v1;
        spread[h + 2] = f * v2;
        spread[h + 3] = f * v3;
        s0 += v0;
        s1 += v1;
        s2 += v2;
        s3 += v3;
      }
    }
    scale[rb] = s0 > 0 ? 1 / s0 : 1;
    scale[rb + 1] = s1 > 0 ? 1 / s1 : 1;
    scale[rb + 2] = s2 > 0 ? 1 / s2 : 1;
    scale[rb + 3] = s3 > 0 ? 1 / s3 : 1;
    if (t < len0) logOut[0] += s0 > 0 ? Math.log(s0) : -Infinity;
    if (t < len1) logOut[1] += s1 > 0 ? Math.log(s1) : -Infinity;
    if (t < len2) logOut[2] += s2 > 0 ? Math.log(s2) : -Infinity;
    if (t < len3) logOut[3] += s3 > 0 ? Math.log(s3) : -Infinity;
    const swap = sPrev;
    sPrev = sCur;
    sCur = swap;
  }
}
