/**
 * Log-space Viterbi recursion (Viterbi 1967; as in Rabiner 1989, eqs. 32–35, taken in logs) over the
 * steps `t0 … t1-1` of a segment, keeping two score vectors and writing the segment's back-pointers:
 *
 *   δ_0(j) = log π_j + log b_j(o_0),   δ_t(j) = log b_j(o_t) + max_{i ∈ pred(j)} (δ_{t-1}(i) + log a_ij),
 *
 * ψ_t(j) = the maximising i, written to `back[(t - t0) * nCells + j]` for t ≥ 1 (the row of step 0 is
 * left untouched). Ties go to the lowest cell index: predecessors are visited in ascending order (CSC,
 * dwell included in its place) and only a strictly greater score replaces the best — the same rule as
 * `viterbiLog`, so the two give identical paths.
 *
 * `delta` holds 2 · nCells numbers; on entry δ_{t0-1} is in `delta[0 … nCells-1]` (when t0 > 0), on
 * return δ_{t1-1} is there. Running the segments of a run one after another gives the same numbers as
 * one pass; a checkpointed decoder keeps δ at each segment's entry and re-runs a segment to get its
 * back-pointers again. Inputs are log-probabilities as for `viterbiLog`. No allocation.
 */
export function viterbiSegment(
  nCells: number,
  nReadings: number,
  logStart: Float64Array,
  predPtr: Int32Array,
  predIdx: Int32Array,
  logPredProb: Float64Array,
  logEmitT: Float64Array,
  obs: Int32Array,
  t0: number,
  t1: number,
  delta: Float64Array,
  back: Uint8Array | Uint16Array | Int32Array,
): void {
  const n = nCells;
  const m = nReadings;
  let prev = 0;
  let cur = n;
  for (let t = t0; t < t1; t++) {
    const o = obs[t];
    const e = (o < 0 ? m : o) * n;
    if (t === 0) {
      for (let j = 0; j < n; j++) delta[cur + j] = logStart[j] + logEmitT[e + j];
    } else {
      const bt = (t - t0) * n;
      for (let j = 0; j < n; j++) {
        const first = predPtr[j];
        const end = predPtr[j + 1];
        let bestI = predIdx[first];
        let best = delta[prev + bestI] + logPredProb[first];
        for (let p = first + 1; p < end; p++) {
          const i = predIdx[p];
          const v = delta[prev + i] + logPredProb[p];
          if (v > best) {
            best = v;
            bestI = i;
          }
        }
        back[bt + j] = bestI;
        delta[cur + j] = best + logEmitT[e + j];
      }
    }
    const swap = prev;
    prev = cur;
    cur = swap;
  }
  if (prev !== 0) delta.copyWithin(0, prev, prev + n);
}
