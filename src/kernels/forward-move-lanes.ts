import type { LaneGroup, SparseChain } from './sparse-chain.js';
import type { MoveChain } from './move-chain.js';

/** Odometry bins of a lane group, steps × 8 (`t * 8 + k`); −1 = unknown (and for padded steps). */
export interface MoveLaneGroup {
  dBin: Int32Array;
  hBin: Int32Array;
}

/**
 * `forwardLanes` with per-step transitions from odometry (`MoveChain`): the scaled forward recursion of
 * `forwardMoveSegment` for the eight runs of a lane group at once, over steps `t0 … t1-1`. Same table,
 * scale and log conventions as `forwardLanes`; each lane's arithmetic is that of `forwardMoveSegment`
 * on the run alone (same order, the same numbers). Per step and cell the staying probability and the
 * moving mass of every lane are made first (`work`, 2 · 8 · nCells numbers); the link loop then loads
 * each lane's split from the row of its heading bin (eight loads per link where the plain kernel needs
 * one: the price of per-lane transitions). No allocation.
 */
export function forwardMoveLanes(
  chain: SparseChain,
  move: MoveChain,
  group: LaneGroup,
  moves: MoveLaneGroup,
  t0: number,
  t1: number,
  table: Float64Array,
  scale: Float64Array,
  logOut: Float64Array,
  work: Float64Array,
): void {
  const { nCells: n, start, dwell, inPtr, inIdx, emitT } = chain;
  const { stayByDistance, eligible, splitIn, nHeadingBins } = move;
  const nLinks = inPtr[n];
  const rows = group.rows;
  const lens = group.laneSteps;
  const stride = 8 * n;
  const mov = stride;
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
      const c0 = scale[rb - 8 + 0];
      const c1 = scale[rb - 8 + 1];
      const c2 = scale[rb - 8 + 2];
      const c3 = scale[rb - 8 + 3];
      const c4 = scale[rb - 8 + 4];
      const c5 = scale[rb - 8 + 5];
      const c6 = scale[rb - 8 + 6];
      const c7 = scale[rb - 8 + 7];
      const db0 = moves.dBin[rb + 0];
      const db1 = moves.dBin[rb + 1];
      const db2 = moves.dBin[rb + 2];
      const db3 = moves.dBin[rb + 3];
      const db4 = moves.dBin[rb + 4];
      const db5 = moves.dBin[rb + 5];
      const db6 = moves.dBin[rb + 6];
      const db7 = moves.dBin[rb + 7];
      const hb0 = moves.hBin[rb + 0];
      const hb1 = moves.hBin[rb + 1];
      const hb2 = moves.hBin[rb + 2];
      const hb3 = moves.hBin[rb + 3];
      const hb4 = moves.hBin[rb + 4];
      const hb5 = moves.hBin[rb + 5];
      const hb6 = moves.hBin[rb + 6];
      const hb7 = moves.hBin[rb + 7];
      const o0 = (hb0 < 0 ? nHeadingBins : hb0) * nLinks;
      const o1 = (hb1 < 0 ? nHeadingBins : hb1) * nLinks;
      const o2 = (hb2 < 0 ? nHeadingBins : hb2) * nLinks;
      const o3 = (hb3 < 0 ? nHeadingBins : hb3) * nLinks;
      const o4 = (hb4 < 0 ? nHeadingBins : hb4) * nLinks;
      const o5 = (hb5 < 0 ? nHeadingBins : hb5) * nLinks;
      const o6 = (hb6 < 0 ? nHeadingBins : hb6) * nLinks;
      const o7 = (hb7 < 0 ? nHeadingBins : hb7) * nLinks;
      const sd0 = db0 >= 0 ? stayByDistance[db0] : -1;
      const sd1 = db1 >= 0 ? stayByDistance[db1] : -1;
      const sd2 = db2 >= 0 ? stayByDistance[db2] : -1;
      const sd3 = db3 >= 0 ? stayByDistance[db3] : -1;
      const sd4 = db4 >= 0 ? stayByDistance[db4] : -1;
      const sd5 = db5 >= 0 ? stayByDistance[db5] : -1;
      const sd6 = db6 >= 0 ? stayByDistance[db6] : -1;
      const sd7 = db7 >= 0 ? stayByDistance[db7] : -1;
      for (let i = 0; i < n; i++) {
        const x = prev + 8 * i;
        const y = 8 * i;
        const dw = dwell[i];
        const el = eligible[i] === 1;
        const st0 = el && sd0 >= 0 ? sd0 : dw;
        const st1 = el && sd1 >= 0 ? sd1 : dw;
        const st2 = el && sd2 >= 0 ? sd2 : dw;
        const st3 = el && sd3 >= 0 ? sd3 : dw;
        const st4 = el && sd4 >= 0 ? sd4 : dw;
        const st5 = el && sd5 >= 0 ? sd5 : dw;
        const st6 = el && sd6 >= 0 ? sd6 : dw;
        const st7 = el && sd7 >= 0 ? sd7 : dw;
        work[y + 0] = st0;
        work[y + 1] = st1;
        work[y + 2] = st2;
        work[y + 3] = st3;
        work[y + 4] = st4;
        work[y + 5] = st5;
        work[y + 6] = st6;
        work[y + 7] = st7;
        work[mov + y + 0] = (1 - st0) * table[x + 0];
        work[mov + y + 1] = (1 - st1) * table[x + 1];
        work[mov + y + 2] = (1 - st2) * table[x + 2];
        work[mov + y + 3] = (1 - st3) * table[x + 3];
        work[mov + y + 4] = (1 - st4) * table[x + 4];
        work[mov + y + 5] = (1 - st5) * table[x + 5];
        work[mov + y + 6] = (1 - st6) * table[x + 6];
        work[mov + y + 7] = (1 - st7) * table[x + 7];
      }
      for (let j = 0; j < n; j++) {
        const x = prev + 8 * j;
        const y = 8 * j;
        let a0 = table[x + 0] * work[y + 0];
        let a1 = table[x + 1] * work[y + 1];
        let a2 = table[x + 2] * work[y + 2];
        let a3 = table[x + 3] * work[y + 3];
        let a4 = table[x + 4] * work[y + 4];
        let a5 = table[x + 5] * work[y + 5];
        let a6 = table[x + 6] * work[y + 6];
        let a7 = table[x + 7] * work[y + 7];
        const end = inPtr[j + 1];
        for (let p = inPtr[j]; p < end; p++) {
          const v = (mov + (inIdx[p] << 3)) | 0;
          a0 += work[(v + 0) | 0] * splitIn[o0 + p];
          a1 += work[(v + 1) | 0] * splitIn[o1 + p];
          a2 += work[(v + 2) | 0] * splitIn[o2 + p];
          a3 += work[(v + 3) | 0] * splitIn[o3 + p];
          a4 += work[(v + 4) | 0] * splitIn[o4 + p];
          a5 += work[(v + 5) | 0] * splitIn[o5 + p];
          a6 += work[(v + 6) | 0] * splitIn[o6 + p];
          a7 += work[(v + 7) | 0] * splitIn[o7 + p];
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
