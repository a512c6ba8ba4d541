import type { LaneGroup } from './sparse-chain.js';

/**
 * `viterbiSegment` for the eight runs of a lane group at once (Viterbi 1967; Rabiner 1989, eqs. 32–35,
 * in logs), over the steps `t0 … t1-1` of a segment:
 *
 *   δ_0(j) = log π_j + log b_j(o_0),
 *   δ_t(j) = log b_j(o_t) + max(δ_{t-1}(j) + log a_jj,  max_{i → j} δ_{t-1}(i) + log a_ij).
 *
 * Every lane gets exactly the scores and back-pointers of `viterbiSegment` on its run alone: the
 * candidates are the same sums, and the maximum of a set does not depend on the order it is taken in.
 * Ties go to the lowest cell index, as there; here that rule costs no equality test, because the
 * candidates are visited in ascending cell order — the links from cells below j (`inPtr[j] …
 * inSplit[j]-1`, ascending as the chain stores them), then the dwell, then the links from cells above j
 * — and a candidate replaces the best only when strictly greater (the best starts at −∞ with the index of
 * the first candidate, so a cell that no path reaches also points to the lowest candidate, as in
 * `viterbiSegment`). The WebAssembly kernel (`viterbiLanesWasm`) does the same with vector selects.
 *
 * Layout (`LANES` = 8 lanes side by side, lane k at offset k): `delta` holds 2 × nCells × 8 numbers,
 * δ_{t0-1} in its first half on entry (when t0 > 0) and δ_{t1-1} there on return; `back` receives
 * ψ_t(j) of lane k at `((t - t0) * nCells + j) * 8 + k` for t ≥ 1; `last` receives, for each lane whose
 * final step T_k − 1 lies in the segment, δ_{T_k-1} (at `j * 8 + k`) — the later, padded steps go on
 * with dropouts and would change δ. Emission rows come from the group (`rows`, offsets into `logEmitT`,
 * whose dropout row is zeros). No allocation.
 */
export function viterbiLanes(
  nCells: number,
  logStart: Float64Array,
  logDwell: Float64Array,
  inPtr: Int32Array,
  inIdx: Int32Array,
  inSplit: Int32Array,
  logInProb: Float64Array,
  logEmitT: Float64Array,
  group: LaneGroup,
  t0: number,
  t1: number,
  delta: Float64Array,
  back: Uint8Array | Uint16Array | Int32Array,
  last: Float64Array,
): void {
  const n = nCells;
  const rows = group.rows;
  const lens = group.laneSteps;
  const half = 8 * n;
  let prev = 0;
  let cur = half;
  for (let t = t0; t < t1; t++) {
    const rb = t * 8;
    if (t === 0) {
      for (let j = 0; j < n; j++) {
        for (let k = 0; k < 8; k++) delta[cur + 8 * j + k] = logStart[j] + logEmitT[rows[rb + k] + j];
      }
    } else {
      const bt = (t - t0) * half;
      for (let j = 0; j < n; j++) {
        const from = inPtr[j];
        const split = inSplit[j];
        const end = inPtr[j + 1];
        const lowest = from < split ? inIdx[from] : j;
        for (let k = 0; k < 8; k++) {
          let best = -Infinity;
          let bestI = lowest;
          for (let p = from; p < split; p++) {
            const v = delta[prev + 8 * inIdx[p] + k] + logInProb[p];
            if (best < v) {
              best = v;
              bestI = inIdx[p];
            }
          }
          const stay = delta[prev + 8 * j + k] + logDwell[j];
          if (best < stay) {
            best = stay;
            bestI = j;
          }
          for (let p = split; p < end; p++) {
            const v = delta[prev + 8 * inIdx[p] + k] + logInProb[p];
            if (best < v) {
              best = v;
              bestI = inIdx[p];
            }
          }
          back[bt + 8 * j + k] = bestI;
          delta[cur + 8 * j + k] = best + logEmitT[rows[rb + k] + j];
        }
      }
    }
    for (let k = 0; k < 8; k++) {
      if (t === lens[k] - 1) for (let j = 0; j < n; j++) last[8 * j + k] = delta[cur + 8 * j + k];
    }
    const swap = prev;
    prev = cur;
    cur = swap;
  }
  if (prev !== 0) delta.copyWithin(0, prev, prev + half);
}

/** For each cell j, the first position in `inIdx[inPtr[j] … inPtr[j+1]-1]` whose source cell is above j. */
export function linkSplit(nCells: number, inPtr: Int32Array, inIdx: Int32Array): Int32Array {
  const split = new Int32Array(nCells);
  for (let j = 0; j < nCells; j++) {
    let p = inPtr[j];
    while (p < inPtr[j + 1] && inIdx[p] < j) p++;
    split[j] = p;
  }
  return split;
}
