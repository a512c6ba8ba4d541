import type { SparseChain } from './sparse-chain.js';

/**
 * Scaled forward recursion over predecessors (Rabiner 1989, "A tutorial on hidden Markov models and
 * selected applications in speech recognition", Proc. IEEE 77(2), eqs. 19–20 and the scaling of
 * section V.A):
 *
 *   α̂_0(j) ∝ π_j b_j(o_0),   α̂_t(j) ∝ b_j(o_t) Σ_{i ∈ pred(j)} α̂_{t-1}(i) a_ij,
 *
 * each step normalised to sum 1 by its scaling factor c_t = 1 / Σ_j (unnormalised α_t(j)), so that
 * log P(o_0 … o_{T-1}) = −Σ_t log c_t. Dropouts (code −1) use the row of ones in `emitT`.
 *
 * Writes α̂ into `alphaOut` (steps × cells, `t * nCells + j`) and c_t into `scaleOut` (length nSteps).
 * Returns log P, or −Infinity when the readings are impossible under the model; then `scaleOut[t]` is 0
 * from the first impossible step on and α̂ is undefined from there (see `firstImpossibleStep`).
 * Cost: O(nSteps · nnz); no allocation.
 */
export function forwardScaled(
  chain: SparseChain,
  obs: Int32Array,
  nSteps: number,
  alphaOut: Float64Array,
  scaleOut: Float64Array,
): number {
  const { nCells: n, nReadings: m, start, predPtr, predIdx, predProb, emitT } = chain;
  if (nSteps === 0) return 0;
  let logP = 0;
  // t = 0: start times emission.
  {
    const o = obs[0];
    const e = (o < 0 ? m : o) * n;
    let sum = 0;
    for (let j = 0; j < n; j++) {
      const v = start[j] * emitT[e + j];
      alphaOut[j] = v;
      sum += v;
    }
    if (!(sum > 0)) {
      scaleOut.fill(0, 0, nSteps);
      return -Infinity;
    }
    const c = 1 / sum;
    for (let j = 0; j < n; j++) alphaOut[j] *= c;
    scaleOut[0] = c;
    logP += Math.log(sum);
  }
  for (let t = 1; t < nSteps; t++) {
    const o = obs[t];
    const e = (o < 0 ? m : o) * n;
    const prev = (t - 1) * n;
    const cur = t * n;
    let sum = 0;
    // Gather over predecessors (CSC): each α̂_t(j) is written once, no scatter, no zeroing pass.
    for (let j = 0; j < n; j++) {
      let acc = 0;
      const end = predPtr[j + 1];
      for (let p = predPtr[j]; p < end; p++) acc += alphaOut[prev + predIdx[p]] * predProb[p];
      const v = acc * emitT[e + j];
      alphaOut[cur + j] = v;
      sum += v;
    }
    if (!(sum > 0)) {
      scaleOut.fill(0, t, nSteps);
      return -Infinity;
    }
    const c = 1 / sum;
    for (let j = 0; j < n; j++) alphaOut[cur + j] *= c;
    scaleOut[t] = c;
    logP += Math.log(sum);
  }
  return logP;
}
