/**
 * Forward recursion in log space (Rabiner 1989, eqs. 19–21, each sum taken with log-sum-exp):
 *
 *   log α_0(j) = log π_j + log b_j(o_0),
 *   log α_t(j) = log b_j(o_t) + logsumexp_{i ∈ pred(j)} (log α_{t-1}(i) + log a_ij),
 *
 * returning log P(readings) = logsumexp_j log α_{T-1}(j). Slower than the scaled recursion and kept as
 * its independent check (the two must agree). Inputs as for `viterbiLog`; `work` holds 2 · nCells.
 */
export function forwardLog(
  nCells: number,
  nReadings: number,
  logStart: Float64Array,
  predPtr: Int32Array,
  predIdx: Int32Array,
  logPredProb: Float64Array,
  logEmitT: Float64Array,
  obs: Int32Array,
  nSteps: number,
  work: Float64Array,
): number {
  const n = nCells;
  const m = nReadings;
  if (nSteps === 0) return 0;
  let prev = 0;
  let cur = n;
  {
    const o = obs[0];
    const e = (o < 0 ? m : o) * n;
    for (let j = 0; j < n; j++) work[j] = logStart[j] + logEmitT[e + j];
  }
  for (let t = 1; t < nSteps; t++) {
    const o = obs[t];
    const e = (o < 0 ? m : o) * n;
    for (let j = 0; j < n; j++) {
      const end = predPtr[j + 1];
      let mx = -Infinity;
      for (let p = predPtr[j]; p < end; p++) {
        const v = work[prev + predIdx[p]] + logPredProb[p];
        if (v > mx) mx = v;
      }
      let s = 0;
      if (mx !== -Infinity) {
        for (let p = predPtr[j]; p < end; p++) s += Math.exp(work[prev + predIdx[p]] + logPredProb[p] - mx);
      }
      work[cur + j] = mx === -Infinity ? -Infinity : mx + Math.log(s) + logEmitT[e + j];
    }
    const swap = prev;
    prev = cur;
    cur = swap;
  }
  let mx = -Infinity;
  for (let j = 0; j < n; j++) if (work[prev + j] > mx) mx = work[prev + j];
  if (mx === -Infinity) return -Infinity;
  let s = 0;
  for (let j = 0; j < n; j++) s += Math.exp(work[prev + j] - mx);
  return mx + Math.log(s);
}
