import type { SparseChain } from './sparse-chain.js';
import type { MoveChain, MoveSteps } from './move-chain.js';

/** Counts of the movement parameters (ADDED to; see `backwardMoveSegment`). */
export interface MoveAccumulators {
  /** Per distance bin: expected stays Σ ξ_t(i, i) over eligible cells at steps with that distance. */
  stayByDistance: Float64Array;
  /** Per distance bin: expected moves Σ_{j ≠ i} ξ_t(i, j) over eligible cells at steps with that distance. */
  moveByDistance: Float64Array;
  /** Per heading bin and cell, nHeadingBins × nCells: expected moves out of the cell (Σ_{j ≠ i} ξ) at steps with that heading. */
  moveByHeading: Float64Array;
  /**
   * Per heading bin: Σ ξ_t(i, j) cos θ_ij and Σ ξ_t(i, j) sin θ_ij over links with a bearing at steps
   * with that heading. With `moveByHeading` these are all that the κ M-step needs (Q_κ is linear in
   * them), and they cost registers rather than one count per link.
   */
  headingCos: Float64Array;
  headingSin: Float64Array;
}

/**
 * `backwardCountsSegment` with per-step transitions from odometry: the fused scaled backward pass and
 * E-step (Rabiner 1989, eqs. 37–40, section V.A scaling) over steps t1-1 … t0, with A_{t+1} for the
 * transition t → t+1 (see `MoveChain`):
 *
 *   β'_t(i)   = s_i ŵ_{t+1}(i) + (1 − s_i) Σ_{i → j} split(i → j) ŵ_{t+1}(j) + c_t [t = T-1],
 *   ξ_t(i, i) = u_t(i) s_i ŵ_{t+1}(i),   ξ_t(i, j) = u_t(i) (1 − s_i) split(i → j) ŵ_{t+1}(j).
 *
 * Adds γ into `emitCount`, γ_0 into `startCount` (t0 = 0), and the transition counts by what the step
 * knows: distance unknown → `dwellCount[i]` and `linkCount[q]` (the plain dwell's counts); distance
 * known → `acc.stayByDistance` / `acc.moveByDistance` at its bin (eligible cells only); heading known →
 * also `acc.moveByHeading`, `acc.headingCos`, `acc.headingSin` at its bin. Same ŵ conventions as `backwardCountsSegment`. No allocation.
 */
export function backwardMoveSegment(
  chain: SparseChain,
  move: MoveChain,
  obs: Int32Array,
  steps: MoveSteps,
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
  acc: MoveAccumulators,
): void {
  const { nCells: n, nReadings: m, dwell, outPtr, outIdx, emitT } = chain;
  const { stayByDistance, eligible, splitOut, nHeadingBins, linkCos, linkSin } = move;
  const nLinks = outPtr[n];
  const { dBin, hBin } = steps;
  const last = obs.length - 1;
  let next = w;
  let out = wSpare;
  for (let t = t1 - 1; t >= t0; t--) {
    let xc = 0;
    let xs = 0;
    const row = (t - t0 + 1) * n;
    const o = obs[t];
    const e = (o < 0 ? m : o) * n;
    const z = t === last ? scale[t] : 0;
    const p = t > 0 ? scale[t - 1] : 1;
    const inside = t < last;
    const db = inside ? dBin[t + 1] : -1;
    const hb = inside ? hBin[t + 1] : -1;
    const off = (hb < 0 ? nHeadingBins : hb) * nLinks;
    const hOff = hb * n;
    const sd = db >= 0 ? stayByDistance[db] : 0;
    let stays = 0;
    let moves = 0;
    for (let i = 0; i < n; i++) {
      const u = table[row + i];
      const known = db >= 0 && eligible[i] === 1;
      const s = known ? sd : dwell[i];
      const mv = 1 - s;
      const d = s * next[i];
      let l = 0;
      const end = outPtr[i + 1];
      const um = u * mv;
      let lc = 0;
      let ls = 0;
      for (let q = outPtr[i]; q < end; q++) {
        const v = splitOut[off + q] * next[outIdx[q]];
        l += v;
        lc += v * linkCos[q];
        ls += v * linkSin[q];
        if (inside && db < 0) linkCount[q] += um * v;
      }
      if (inside && hb >= 0) {
        acc.moveByHeading[hOff + i] += um * l;
        xc += um * lc;
        xs += um * ls;
      }
      if (inside) {
        if (db < 0) dwellCount[i] += u * d;
        else if (known) {
          stays += u * d;
          moves += um * l;
        }
      }
      const b = d + mv * l + z;
      const g = u * b;
      emitCount[e + i] += g;
      if (t === 0) startCount[i] += g;
      out[i] = p * emitT[e + i] * b;
    }
    if (db >= 0) {
      acc.stayByDistance[db] += stays;
      acc.moveByDistance[db] += moves;
    }
    if (hb >= 0) {
      acc.headingCos[hb] += xc;
      acc.headingSin[hb] += xs;
    }
    const swap = next;
    next = out;
    out = swap;
  }
  if (next !== w) w.set(next.subarray(0, n));
}
