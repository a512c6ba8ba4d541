/**
 * Log-space Viterbi recursion (Viterbi 1967; as in Rabiner 1989, eqs. 32–35, taken in logs) over the
 * steps `t0 … t1-1` of a segment, keeping two score vectors and writing the segment's back-pointers:
 *
 *   δ_0(j) = log π_j + log b_j(o_0),
 *   δ_t(j) = log b_j(o_t) + max(δ_{t-1}(j) + log a_jj,  max_{i → j} δ_{t-1}(i) + log a_ij),
 *
 * ψ_t(j) = the maximising i, written to `back[(t - t0) * nCells + j]` for t ≥ 1 (the row of step 0 is
 * left untouched). Ties go to the lowest cell index — the rule of `viterbiLog`, so the two give identical
 * paths — kept here with the dwell taken first (a contiguous load, outside the link loop) by letting an
 * equal score replace the best only from a lower index.
 *
 * `delta` holds 2 · nCells numbers; on entry δ_{t0-1} is in `delta[0 … nCells-1]` (when t0 > 0), on
 * return δ_{t1-1} is there. Running the segments of a run one after another gives the same numbers as
 * one pass; a checkpointed decoder keeps δ at each segment's entry and re-runs a segment to get its
 * back-pointers again. Inputs are log-probabilities: start (nCells), dwell (nCells), links into each cell
 * in the chain's `in` order (`inPtr`, `inIdx`, `logInProb`) and transposed emissions with the dropout
 * row of zeros ((nReadings + 1) × nCells). No allocation.
 */
export function viterbiSegment(
  nCells: number,
  nReadings: number,
  logStart: Float64Array,
  logDwell: Float64Array,
  inPtr: Int32Array,
  inIdx: Int32Array,
  logInProb: Float64Array,
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
        let best = delta[prev + j] + logDwell[j];
        let bestI = j;
        const end = inPtr[j + 1];
        for (let p = inPtr[j]; p < end; p++) {
          const i = inIdx[p];
          const v = delta[prev + i] + logInProb[p];
          if (v > best || (v === best && i < bestI)) {
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
