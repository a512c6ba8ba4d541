import type { SparseChain } from './sparse-chain.js';

/**
 * E-step of Baum-Welch for one run (Rabiner 1989, eqs. 37–40 for ξ and γ, with the section V.A
 * scaling), fused with the scaled backward recursion so the backward table is never stored:
 *
 *   w_j        = c_{t+1} b_j(o_{t+1}) β̂_{t+1}(j)
 *   β̂_t(i)     = Σ_{j ∈ succ(i)} a_ij w_j
 *   ξ_t(i, j)  = α̂_t(i) a_ij w_j                      (expected i → j transition at t → t+1)
 *   γ_t(i)     = α̂_t(i) β̂_t(i)                        (posterior of cell i at t)
 *
 * and adds Σ_t ξ_t into `transCount` (CSR order, length nnz), γ_0 into `startCount` (length nCells)
 * and Σ_{t: o_t = r} γ_t(i) into `emitCountT[r * nCells + i]` (readings × cells; dropout steps add no
 * emission count). Counts are ADDED, so one set of accumulators serves many runs.
 *
 * Inputs: `alpha` and `scale` from `forwardScaled` on the same run (which must have been possible);
 * `work` holds at least 3 · nCells numbers. Loop trick: one pass over the CSR nonzeros per step does the
 * backward product and the ξ accumulation together (2 multiply-adds per step-link).
 */
export function expectedCounts(
  chain: SparseChain,
  obs: Int32Array,
  nSteps: number,
  alpha: Float64Array,
  scale: Float64Array,
  work: Float64Array,
  startCount: Float64Array,
  transCount: Float64Array,
  emitCountT: Float64Array,
): void {
  const { nCells: n, nReadings: m, succPtr, succIdx, succProb, emitT } = chain;
  if (nSteps === 0) return;
  // work = [β̂_{t+1} | β̂_t | w]
  let betaNext = 0;
  let betaCur = n;
  const w = 2 * n;
  const last = (nSteps - 1) * n;
  {
    const o = obs[nSteps - 1];
    for (let i = 0; i < n; i++) work[betaNext + i] = 1;
    if (o >= 0) {
      const ec = o * n;
      for (let i = 0; i < n; i++) emitCountT[ec + i] += alpha[last + i];
    }
    if (nSteps === 1) {
      for (let i = 0; i < n; i++) startCount[i] += alpha[i];
      return;
    }
  }
  for (let t = nSteps - 2; t >= 0; t--) {
    const o1 = obs[t + 1];
    const e1 = (o1 < 0 ? m : o1) * n;
    const c1 = scale[t + 1];
    for (let j = 0; j < n; j++) work[w + j] = c1 * emitT[e1 + j] * work[betaNext + j];
    const cur = t * n;
    const o = obs[t];
    const ec = o < 0 ? -1 : o * n;
    for (let i = 0; i < n; i++) {
      const a = alpha[cur + i];
      let acc = 0;
      const end = succPtr[i + 1];
      for (let k = succPtr[i]; k < end; k++) {
        const v = succProb[k] * work[w + succIdx[k]];
        acc += v;
        transCount[k] += a * v;
      }
      work[betaCur + i] = acc;
      if (ec >= 0) emitCountT[ec + i] += a * acc;
    }
    const swap = betaNext;
    betaNext = betaCur;
    betaCur = swap;
  }
  // β̂_0 is now in betaNext.
  for (let i = 0; i < n; i++) startCount[i] += alpha[i] * work[betaNext + i];
}
