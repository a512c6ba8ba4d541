/**
 * Log-space Viterbi over predecessors with back-pointers (Viterbi 1967; recursion as in Rabiner 1989,
 * eqs. 32–35, taken in logs):
 *
 *   δ_0(j) = log π_j + log b_j(o_0),   δ_t(j) = log b_j(o_t) + max_{i ∈ pred(j)} (δ_{t-1}(i) + log a_ij),
 *
 * back-pointer ψ_t(j) = the maximising i; the path is read back from argmax_j δ_{T-1}(j).
 * Ties go to the lowest cell index (predecessors are visited in ascending order and only a strictly
 * greater score replaces the best), so the result is deterministic.
 *
 * Inputs are log-probabilities: `logStart` (nCells), `logPredProb` (CSC order, nnz), `logEmitT`
 * ((nReadings + 1) × nCells, last row zeros for dropouts). `delta` holds 2 · nCells numbers of work
 * space; `back` holds nSteps · nCells back-pointers in any integer array wide enough for the cell count
 * (Uint8Array up to 256 cells, Uint16Array up to 65 536). Writes the path into `pathOut` and returns its
 * joint log-probability log P(path, readings), or −Infinity when every path is impossible (then
 * `pathOut` is filled with −1).
 */
export function viterbiLog(
  nCells: number,
  nReadings: number,
  logStart: Float64Array,
  predPtr: Int32Array,
  predIdx: Int32Array,
  logPredProb: Float64Array,
  logEmitT: Float64Array,
  obs: Int32Array,
  nSteps: number,
  delta: Float64Array,
  back: Uint8Array | Uint16Array | Int32Array,
  pathOut: Int32Array,
): number {
  const n = nCells;
  const m = nReadings;
  if (nSteps === 0) return 0;
  let prev = 0;
  let cur = n;
  {
    const o = obs[0];
    const e = (o < 0 ? m : o) * n;
    for (let j = 0; j < n; j++) delta[j] = logStart[j] + logEmitT[e + j];
  }
  for (let t = 1; t < nSteps; t++) {
    const o = obs[t];
    const e = (o < 0 ? m : o) * n;
    const bt = t * n;
    for (let j = 0; j < n; j++) {
      const startP = predPtr[j];
      const end = predPtr[j + 1];
      let bestI = predIdx[startP];
      let best = delta[prev + bestI] + logPredProb[startP];
      for (let p = startP + 1; p < end; p++) {
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
    const swap = prev;
    prev = cur;
    cur = swap;
  }
  let bestJ = 0;
  let best = delta[prev];
  for (let j = 1; j < n; j++) {
    if (delta[prev + j] > best) {
      best = delta[prev + j];
      bestJ = j;
    }
  }
  if (best === -Infinity || Number.isNaN(best)) {
    pathOut.fill(-1, 0, nSteps);
    return -Infinity;
  }
  pathOut[nSteps - 1] = bestJ;
  for (let t = nSteps - 1; t > 0; t--) {
    bestJ = back[t * n + bestJ];
    pathOut[t - 1] = bestJ;
  }
  return best;
}
