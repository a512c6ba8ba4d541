import type { SparseChain } from './sparse-chain.js';

/**
 * Scaled backward recursion over successors (Rabiner 1989, eqs. 24–25 with the section V.A scaling),
 * using the forward pass's scaling factors c_t:
 *
 *   β̂_{T-1}(i) = 1,   β̂_t(i) = c_{t+1} Σ_{j ∈ succ(i)} a_ij b_j(o_{t+1}) β̂_{t+1}(j),
 *
 * so that α̂_t(i) β̂_t(i) is the posterior P(cell i at t | all readings).
 * Writes β̂ into `betaOut` (steps × cells, `t * nCells + i`). `scale` comes from `forwardScaled` on the
 * same run and must be positive (a possible run). Cost O(nSteps · nnz); no allocation.
 */
export function backwardScaled(
  chain: SparseChain,
  obs: Int32Array,
  nSteps: number,
  scale: Float64Array,
  betaOut: Float64Array,
): void {
  const { nCells: n, nReadings: m, succPtr, succIdx, succProb, emitT } = chain;
  if (nSteps === 0) return;
  const last = (nSteps - 1) * n;
  for (let i = 0; i < n; i++) betaOut[last + i] = 1;
  for (let t = nSteps - 2; t >= 0; t--) {
    const o = obs[t + 1];
    const e = (o < 0 ? m : o) * n;
    const c = scale[t + 1];
    const next = (t + 1) * n;
    const cur = t * n;
    for (let i = 0; i < n; i++) {
      let acc = 0;
      const end = succPtr[i + 1];
      for (let k = succPtr[i]; k < end; k++) {
        const j = succIdx[k];
        acc += succProb[k] * emitT[e + j] * betaOut[next + j];
      }
      betaOut[cur + i] = acc * c;
    }
  }
}
