import type { LaneGroup, SparseChain } from './sparse-chain.js';
import { summarisePosition, type PositionGroups } from './position-summary.js';

/**
 * Per-step outputs of the lane decoders for one segment, steps × 8 (`(t - t0) * 8 + k` for lane k); the entries of a lane's
 * padded steps are left as they fall and are not to be read.
 */
export interface LaneSummaries {
  likelyCell: Int32Array;
  likelyP: Float64Array;
  pathP: Float64Array;
  entropyBits: Float64Array;
  /** Position outputs (`positionSummary`'s), when positions are asked for; else length 0. */
  likelyZone: Int32Array;
  zoneP: Float64Array;
  meanLevel: Int32Array;
  meanX: Float64Array;
  meanY: Float64Array;
  spreadM: Float64Array;
}

/** Summaries for `steps` steps of 8 lanes, with or without the position outputs. */
export function newLaneSummaries(steps: number, positions: boolean): LaneSummaries {
  const size = steps * 8;
  const p = positions ? size : 0;
  return {
    likelyCell: new Int32Array(size),
    likelyP: new Float64Array(size),
    pathP: new Float64Array(size),
    entropyBits: new Float64Array(size),
    likelyZone: new Int32Array(p),
    zoneP: new Float64Array(p),
    meanLevel: new Int32Array(p),
    meanX: new Float64Array(p),
    meanY: new Float64Array(p),
    spreadM: new Float64Array(p),
  };
}

/**
 * `posteriorSummarySegment` (with `positionSummary` when `groups` is given) for the eight runs of a lane
 * group at once, over the steps t1-1 … t0 of a segment, during the scaled backward recursion (Rabiner
 * 1989, eqs. 24–27, section V.A scaling), with u_t and c_t from `forwardLanes` (same table layout):
 *
 *   ŵ_t(j) = c_{t-1} b_j(o_t) β'_t(j),   β'_t(i) = a_ii ŵ_{t+1}(i) + Σ_{i → j} a_ij ŵ_{t+1}(j) + c_t [t = T_k-1],
 *   γ_t(i) = u_t(i) β'_t(i),
 *
 * and per step and lane the argmax of γ and its value, γ at the lane's path cell (`path`, indexed `(t - t0) * 8 + k`, −1 for none: NaN),
 * the entropy −Σ γ log2 γ over cells with γ > 0, and with `groups` the area masses and the level
 * moments of γ and from them the most likely area, the level of most mass, the mean and the spread.
 * Every lane's arithmetic is that of the single-run kernels, in the same order, so each lane's numbers
 * are those of its run decoded alone, bit for bit. A lane's padded steps (t ≥ T_k) carry ŵ = 0, so
 * its last real step starts from zeros as a run alone does.
 *
 * `w` (nCells × 8) holds ŵ_{t1} on entry (zeros when t1 is the group's length) and ŵ_{t0} on return;
 * `wSpare` is scratch of the same size; `gamma` (nCells × 8) receives γ of the step; `work`
 * ((nZones + 4 · nLevels) × 8) is scratch for the position sums. No allocation.
 */
export function posteriorSummaryLanes(
  chain: SparseChain,
  group: LaneGroup,
  t0: number,
  t1: number,
  table: Float64Array,
  scale: Float64Array,
  path: Int32Array,
  w: Float64Array,
  wSpare: Float64Array,
  gamma: Float64Array,
  out: LaneSummaries,
  groups: PositionGroups | null,
  work: Float64Array,
): void {
  const { nCells: n, dwell, outPtr, outIdx, outProb, emitT } = chain;
  const rows = group.rows;
  const lens = group.laneSteps;
  const stride = 8 * n;
  let next = w;
  let spare = wSpare;
  for (let t = t1 - 1; t >= t0; t--) {
    const row = (t - t0 + 1) * stride;
    const rb = t * 8;
    const ob = (t - t0) * 8;
    for (let k = 0; k < 8; k++) {
      const z = t === lens[k] - 1 ? scale[rb + k] : 0;
      const p = t > 0 ? scale[rb - 8 + k] : 1;
      const e = rows[rb + k];
      const onPath = path[ob + k];
      let best = -1;
      let bestI = 0;
      let h = 0;
      let pathP = NaN;
      for (let i = 0; i < n; i++) {
        let l = 0;
        const end = outPtr[i + 1];
        for (let q = outPtr[i]; q < end; q++) l += outProb[q] * next[8 * outIdx[q] + k];
        const b = dwell[i] * next[8 * i + k] + l + z;
        const g = table[row + 8 * i + k] * b;
        if (g > best) {
          best = g;
          bestI = i;
        }
        if (g > 0) h -= g * Math.log2(g);
        if (i === onPath) pathP = g;
        gamma[8 * i + k] = g;
        spare[8 * i + k] = p * emitT[e + i] * b;
      }
      out.likelyCell[ob + k] = bestI;
      out.likelyP[ob + k] = best;
      out.pathP[ob + k] = pathP;
      out.entropyBits[ob + k] = h;
      if (groups) summarisePosition(n, groups, gamma, 8, k, work, out, ob + k);
    }
    const swap = next;
    next = spare;
    spare = swap;
  }
  if (next !== w) w.set(next.subarray(0, stride));
}
