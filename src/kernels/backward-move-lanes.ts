import type { LaneGroup, SparseChain } from './sparse-chain.js';
import type { MoveChain } from './move-chain.js';
import type { MoveLaneGroup } from './forward-move-lanes.js';

/** Count accumulators of `backwardMoveLanes` (ADDED to). */
export interface MoveLaneAccumulators {
  /** (nReadings + 1) × nCells; the last row takes dropouts and padded steps. */
  emitCount: Float64Array;
  startCount: Float64Array;
  /** Plain dwell count and plain move total per cell, at steps whose distance is unknown. */
  dwellCount: Float64Array;
  moveCount: Float64Array;
  stayByDistance: Float64Array;
  moveByDistance: Float64Array;
  /** (nHeadingBins + 1) × nCells: moves out of each cell per heading bin; the last row takes steps of unknown heading (discarded). */
  moveByHeading: Float64Array;
  /** nHeadingBins + 1: Σ ξ cos θ and Σ ξ sin θ per heading bin (last entry discarded), see `MoveAccumulators`. */
  headingCos: Float64Array;
  headingSin: Float64Array;
}

/**
 * `backwardMoveSegment` for the eight runs of a lane group at once (steps t1-1 … t0), in the totals
 * form that `tied` and `fixed` need: γ into `emitCount` (and `startCount` at t = 0); at steps whose
 * distance is unknown each cell's dwell count and its move total (`dwellCount`, `moveCount`); at steps
 * whose distance is known the expected stays and moves of eligible cells per distance bin; per heading
 * bin each cell's expected moves and Σ ξ cos θ, Σ ξ sin θ (`MoveAccumulators`). Same ŵ conventions as `backwardTotalsLanes`; each lane's numbers
 * are those of `backwardMoveSegment` on the run alone. No allocation.
 */
export function backwardMoveLanes(
  chain: SparseChain,
  move: MoveChain,
  group: LaneGroup,
  moves: MoveLaneGroup,
  t0: number,
  t1: number,
  table: Float64Array,
  scale: Float64Array,
  w: Float64Array,
  wSpare: Float64Array,
  acc: MoveLaneAccumulators,
): void {
  const { nCells: n, dwell, outPtr, outIdx, emitT } = chain;
  const { stayByDistance, eligible, splitOut, nHeadingBins, linkCos, linkSin } = move;
  const nLinks = outPtr[n];
  const rows = group.rows;
  const lens = group.laneSteps;
  const T = group.nSteps;
  const stride = 8 * n;
  const { emitCount, startCount, dwellCount, moveCount, moveByHeading, headingCos, headingSin } = acc;
  let next = w;
  let out = wSpare;
  for (let t = t1 - 1; t >= t0; t--) {
    const row = (t - t0 + 1) * stride;
    const rb = t * 8;
    const nb = t + 1 < T ? rb + 8 : -1;
    const e0 = rows[rb + 0];
    const e1 = rows[rb + 1];
    const e2 = rows[rb + 2];
    const e3 = rows[rb + 3];
    const e4 = rows[rb + 4];
    const e5 = rows[rb + 5];
    const e6 = rows[rb + 6];
    const e7 = rows[rb + 7];
    const z0 = t === lens[0] - 1 ? scale[rb + 0] : 0;
    const z1 = t === lens[1] - 1 ? scale[rb + 1] : 0;
    const z2 = t === lens[2] - 1 ? scale[rb + 2] : 0;
    const z3 = t === lens[3] - 1 ? scale[rb + 3] : 0;
    const z4 = t === lens[4] - 1 ? scale[rb + 4] : 0;
    const z5 = t === lens[5] - 1 ? scale[rb + 5] : 0;
    const z6 = t === lens[6] - 1 ? scale[rb + 6] : 0;
    const z7 = t === lens[7] - 1 ? scale[rb + 7] : 0;
    const p0 = t > 0 ? scale[rb - 8 + 0] : 1;
    const p1 = t > 0 ? scale[rb - 8 + 1] : 1;
    const p2 = t > 0 ? scale[rb - 8 + 2] : 1;
    const p3 = t > 0 ? scale[rb - 8 + 3] : 1;
    const p4 = t > 0 ? scale[rb - 8 + 4] : 1;
    const p5 = t > 0 ? scale[rb - 8 + 5] : 1;
    const p6 = t > 0 ? scale[rb - 8 + 6] : 1;
    const p7 = t > 0 ? scale[rb - 8 + 7] : 1;
    const db0 = nb >= 0 ? moves.dBin[nb + 0] : -1;
    const db1 = nb >= 0 ? moves.dBin[nb + 1] : -1;
    const db2 = nb >= 0 ? moves.dBin[nb + 2] : -1;
    const db3 = nb >= 0 ? moves.dBin[nb + 3] : -1;
    const db4 = nb >= 0 ? moves.dBin[nb + 4] : -1;
    const db5 = nb >= 0 ? moves.dBin[nb + 5] : -1;
    const db6 = nb >= 0 ? moves.dBin[nb + 6] : -1;
    const db7 = nb >= 0 ? moves.dBin[nb + 7] : -1;
    const hb0 = nb >= 0 ? moves.hBin[nb + 0] : -1;
    const hb1 = nb >= 0 ? moves.hBin[nb + 1] : -1;
    const hb2 = nb >= 0 ? moves.hBin[nb + 2] : -1;
    const hb3 = nb >= 0 ? moves.hBin[nb + 3] : -1;
    const hb4 = nb >= 0 ? moves.hBin[nb + 4] : -1;
    const hb5 = nb >= 0 ? moves.hBin[nb + 5] : -1;
    const hb6 = nb >= 0 ? moves.hBin[nb + 6] : -1;
    const hb7 = nb >= 0 ? moves.hBin[nb + 7] : -1;
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
    const hc0 = (hb0 < 0 ? nHeadingBins : hb0) * n;
    const hc1 = (hb1 < 0 ? nHeadingBins : hb1) * n;
    const hc2 = (hb2 < 0 ? nHeadingBins : hb2) * n;
    const hc3 = (hb3 < 0 ? nHeadingBins : hb3) * n;
    const hc4 = (hb4 < 0 ? nHeadingBins : hb4) * n;
    const hc5 = (hb5 < 0 ? nHeadingBins : hb5) * n;
    const hc6 = (hb6 < 0 ? nHeadingBins : hb6) * n;
    const hc7 = (hb7 < 0 ? nHeadingBins : hb7) * n;
    let xc0 = 0;
    let xc1 = 0;
    let xc2 = 0;
    let xc3 = 0;
    let xc4 = 0;
    let xc5 = 0;
    let xc6 = 0;
    let xc7 = 0;
    let xs0 = 0;
    let xs1 = 0;
    let xs2 = 0;
    let xs3 = 0;
    let xs4 = 0;
    let xs5 = 0;
    let xs6 = 0;
    let xs7 = 0;
    let stays0 = 0;
    let stays1 = 0;
    let stays2 = 0;
    let stays3 = 0;
    let stays4 = 0;
    let stays5 = 0;
    let stays6 = 0;
    let stays7 = 0;
    let goes0 = 0;
    let goes1 = 0;
    let goes2 = 0;
    let goes3 = 0;
    let goes4 = 0;
    let goes5 = 0;
    let goes6 = 0;
    let goes7 = 0;
    for (let i = 0; i < n; i++) {
      const x = row + 8 * i;
      const y = 8 * i;
      const dw = dwell[i];
      const el = eligible[i] === 1;
      const u0 = table[x + 0];
      const u1 = table[x + 1];
      const u2 = table[x + 2];
      const u3 = table[x + 3];
      const u4 = table[x + 4];
      const u5 = table[x + 5];
      const u6 = table[x + 6];
      const u7 = table[x + 7];
      const st0 = el && sd0 >= 0 ? sd0 : dw;
      const st1 = el && sd1 >= 0 ? sd1 : dw;
      const st2 = el && sd2 >= 0 ? sd2 : dw;
      const st3 = el && sd3 >= 0 ? sd3 : dw;
      const st4 = el && sd4 >= 0 ? sd4 : dw;
      const st5 = el && sd5 >= 0 ? sd5 : dw;
      const st6 = el && sd6 >= 0 ? sd6 : dw;
      const st7 = el && sd7 >= 0 ? sd7 : dw;
      const m0 = 1 - st0;
      const m1 = 1 - st1;
      const m2 = 1 - st2;
      const m3 = 1 - st3;
      const m4 = 1 - st4;
      const m5 = 1 - st5;
      const m6 = 1 - st6;
      const m7 = 1 - st7;
      const um0 = u0 * m0;
      const um1 = u1 * m1;
      const um2 = u2 * m2;
      const um3 = u3 * m3;
      const um4 = u4 * m4;
      const um5 = u5 * m5;
      const um6 = u6 * m6;
      const um7 = u7 * m7;
      const d0 = st0 * next[y + 0];
      const d1 = st1 * next[y + 1];
      const d2 = st2 * next[y + 2];
      const d3 = st3 * next[y + 3];
      const d4 = st4 * next[y + 4];
      const d5 = st5 * next[y + 5];
      const d6 = st6 * next[y + 6];
      const d7 = st7 * next[y + 7];
      let l0 = 0;
      let l1 = 0;
      let l2 = 0;
      let l3 = 0;
      let l4 = 0;
      let l5 = 0;
      let l6 = 0;
      let l7 = 0;
      let lc0 = 0;
      let lc1 = 0;
      let lc2 = 0;
      let lc3 = 0;
      let lc4 = 0;
      let lc5 = 0;
      let lc6 = 0;
      let lc7 = 0;
      let ls0 = 0;
      let ls1 = 0;
      let ls2 = 0;
      let ls3 = 0;
      let ls4 = 0;
      let ls5 = 0;
      let ls6 = 0;
      let ls7 = 0;
      const end = outPtr[i + 1];
      for (let q = outPtr[i]; q < end; q++) {
        const v = (outIdx[q] << 3) | 0;
        const cq = linkCos[q];
        const sq = linkSin[q];
        const w0 = splitOut[o0 + q] * next[(v + 0) | 0];
        const w1 = splitOut[o1 + q] * next[(v + 1) | 0];
        const w2 = splitOut[o2 + q] * next[(v + 2) | 0];
        const w3 = splitOut[o3 + q] * next[(v + 3) | 0];
        const w4 = splitOut[o4 + q] * next[(v + 4) | 0];
        const w5 = splitOut[o5 + q] * next[(v + 5) | 0];
        const w6 = splitOut[o6 + q] * next[(v + 6) | 0];
        const w7 = splitOut[o7 + q] * next[(v + 7) | 0];
        l0 += w0;
        l1 += w1;
        l2 += w2;
        l3 += w3;
        l4 += w4;
        l5 += w5;
        l6 += w6;
        l7 += w7;
        lc0 += w0 * cq;
        lc1 += w1 * cq;
        lc2 += w2 * cq;
        lc3 += w3 * cq;
        lc4 += w4 * cq;
        lc5 += w5 * cq;
        lc6 += w6 * cq;
        lc7 += w7 * cq;
        ls0 += w0 * sq;
        ls1 += w1 * sq;
        ls2 += w2 * sq;
        ls3 += w3 * sq;
        ls4 += w4 * sq;
        ls5 += w5 * sq;
        ls6 += w6 * sq;
        ls7 += w7 * sq;
      }
      moveByHeading[hc0 + i] += um0 * l0;
      moveByHeading[hc1 + i] += um1 * l1;
      moveByHeading[hc2 + i] += um2 * l2;
      moveByHeading[hc3 + i] += um3 * l3;
      moveByHeading[hc4 + i] += um4 * l4;
      moveByHeading[hc5 + i] += um5 * l5;
      moveByHeading[hc6 + i] += um6 * l6;
      moveByHeading[hc7 + i] += um7 * l7;
      xc0 += um0 * lc0;
      xc1 += um1 * lc1;
      xc2 += um2 * lc2;
      xc3 += um3 * lc3;
      xc4 += um4 * lc4;
      xc5 += um5 * lc5;
      xc6 += um6 * lc6;
      xc7 += um7 * lc7;
      xs0 += um0 * ls0;
      xs1 += um1 * ls1;
      xs2 += um2 * ls2;
      xs3 += um3 * ls3;
      xs4 += um4 * ls4;
      xs5 += um5 * ls5;
      xs6 += um6 * ls6;
      xs7 += um7 * ls7;
      let plainDwell = 0;
      let plainMove = 0;
      if (db0 < 0) {plainDwell += u0 * d0; plainMove += um0 * l0; } else if (el) {stays0 += u0 * d0; goes0 += um0 * l0; }
      if (db1 < 0) {plainDwell += u1 * d1; plainMove += um1 * l1; } else if (el) {stays1 += u1 * d1; goes1 += um1 * l1; }
      if (db2 < 0) {plainDwell += u2 * d2; plainMove += um2 * l2; } else if (el) {stays2 += u2 * d2; goes2 += um2 * l2; }
      if (db3 < 0) {plainDwell += u3 * d3; plainMove += um3 * l3; } else if (el) {stays3 += u3 * d3; goes3 += um3 * l3; }
      if (db4 < 0) {plainDwell += u4 * d4; plainMove += um4 * l4; } else if (el) {stays4 += u4 * d4; goes4 += um4 * l4; }
      if (db5 < 0) {plainDwell += u5 * d5; plainMove += um5 * l5; } else if (el) {stays5 += u5 * d5; goes5 += um5 * l5; }
      if (db6 < 0) {plainDwell += u6 * d6; plainMove += um6 * l6; } else if (el) {stays6 += u6 * d6; goes6 += um6 * l6; }
      if (db7 < 0) {plainDwell += u7 * d7; plainMove += um7 * l7; } else if (el) {stays7 += u7 * d7; goes7 += um7 * l7; }
      dwellCount[i] += plainDwell;
      moveCount[i] += plainMove;
      const b0 = d0 + m0 * l0 + z0;
      const b1 = d1 + m1 * l1 + z1;
      const b2 = d2 + m2 * l2 + z2;
      const b3 = d3 + m3 * l3 + z3;
      const b4 = d4 + m4 * l4 + z4;
      const b5 = d5 + m5 * l5 + z5;
      const b6 = d6 + m6 * l6 + z6;
      const b7 = d7 + m7 * l7 + z7;
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
    if (db0 >= 0) {acc.stayByDistance[db0] += stays0; acc.moveByDistance[db0] += goes0; }
    if (db1 >= 0) {acc.stayByDistance[db1] += stays1; acc.moveByDistance[db1] += goes1; }
    if (db2 >= 0) {acc.stayByDistance[db2] += stays2; acc.moveByDistance[db2] += goes2; }
    if (db3 >= 0) {acc.stayByDistance[db3] += stays3; acc.moveByDistance[db3] += goes3; }
    if (db4 >= 0) {acc.stayByDistance[db4] += stays4; acc.moveByDistance[db4] += goes4; }
    if (db5 >= 0) {acc.stayByDistance[db5] += stays5; acc.moveByDistance[db5] += goes5; }
    if (db6 >= 0) {acc.stayByDistance[db6] += stays6; acc.moveByDistance[db6] += goes6; }
    if (db7 >= 0) {acc.stayByDistance[db7] += stays7; acc.moveByDistance[db7] += goes7; }
    if (hb0 >= 0) {headingCos[hb0] += xc0; headingSin[hb0] += xs0; }
    if (hb1 >= 0) {headingCos[hb1] += xc1; headingSin[hb1] += xs1; }
    if (hb2 >= 0) {headingCos[hb2] += xc2; headingSin[hb2] += xs2; }
    if (hb3 >= 0) {headingCos[hb3] += xc3; headingSin[hb3] += xs3; }
    if (hb4 >= 0) {headingCos[hb4] += xc4; headingSin[hb4] += xs4; }
    if (hb5 >= 0) {headingCos[hb5] += xc5; headingSin[hb5] += xs5; }
    if (hb6 >= 0) {headingCos[hb6] += xc6; headingSin[hb6] += xs6; }
    if (hb7 >= 0) {headingCos[hb7] += xc7; headingSin[hb7] += xs7; }
    const swap = next;
    next = out;
    out = swap;
  }
  if (next !== w) w.set(next.subarray(0, stride));
}
