import type { SparseChain } from './sparse-chain.js';

/**
 * Log-likelihood of one run by the scaled forward recursion (same recursion as `forwardScaled`,
 * Rabiner 1989, eqs. 19–20 with section V.A scaling), keeping only two forward vectors: O(nCells)
 * memory whatever the run length, so a run of millions of steps can be scored.
 *
 * `work` must hold at least 2 · nCells numbers. Returns log P(readings), or −Infinity when the readings
 * are impossible; then, if `impossibleOut` is given, `impossibleOut[0]` is set to the first step at which
 * the probability became zero (else it is set to −1).
 */
export function forwardScore(
  chain: SparseChain,
  obs: Int32Array,
  nSteps: number,
  work: Float64Array,
  impossibleOut?: Int32Array,
): number {
  const { nCells: n, nReadings: m, start, predPtr, predIdx, predProb, emitT } = chain;
  if (impossibleOut) impossibleOut[0] = -1;
  if (nSteps === 0) return 0;
  let prev = 0;
  let cur = n;
  let logP = 0;
  {
    const o = obs[0];
    const e = (o < 0 ? m : o) * n;
    let sum = 0;
    for (let j = 0; j < n; j++) {
      const v = start[j] * emitT[e + j];
      work[j] = v;
      sum += v;
    }
    if (!(sum > 0)) {
      if (impossibleOut) impossibleOut[0] = 0;
      return -Infinity;
    }
    const c = 1 / sum;
    for (let j = 0; j < n; j++) work[j] *= c;
    logP += Math.log(sum);
  }
  for (let t = 1; t < nSteps; t++) {
    const o = obs[t];
    const e = (o < 0 ? m : o) * n;
    let sum = 0;
    for (let j = 0; j < n; j++) {
      let acc = 0;
      const end = predPtr[j + 1];
      for (let p = predPtr[j]; p < end; p++) acc += work[prev + predIdx[p]] * predProb[p];
      const v = acc * emitT[e + j];
      work[cur + j] = v;
      sum += v;
    }
    if (!(sum > 0)) {
      if (impossibleOut) impossibleOut[0] = t;
      return -Infinity;
    }
    const c = 1 / sum;
    for (let j = 0; j < n; j++) work[cur + j] *= c;
    logP += Math.log(sum);
    const swap = prev;
    prev = cur;
    cur = swap;
  }
  return logP;
}
