import type { SparseChain } from './sparse-chain.js';
import type { MoveChain, MoveSteps } from './move-chain.js';

/**
 * `backwardScaled` with per-step transitions from odometry (`MoveChain`, `MoveSteps`; see
 * `move-chain.ts`): the scaled backward recursion (Rabiner 1989, eqs. 24–25, section V.A scaling) with
 * A_{t+1} for the transition t → t+1,
 *
 *   β̂_{T-1}(i) = 1,
 *   β̂_t(i) = c_{t+1} [s_i b_i(o_{t+1}) β̂_{t+1}(i) + (1 − s_i) Σ_{i → j} split(i → j) b_j(o_{t+1}) β̂_{t+1}(j)],
 *
 * with c_t the forward pass's scaling factors (`forwardMoveSegment` over the whole run: α̂_t = c_t u_t),
 * so that α̂_t(i) β̂_t(i) is the posterior P(cell i at t | all readings and odometry). Writes β̂ into
 * `betaOut` (steps × cells, `t * nCells + i`). `scale` must be positive (a possible run). Cost
 * O(nSteps · nnz); no allocation.
 */
export function backwardMoveScaled(
  chain: SparseChain,
  move: MoveChain,
  obs: Int32Array,
  steps: MoveSteps,
  nSteps: number,
  scale: Float64Array,
  betaOut: Float64Array,
): void {
  const { nCells: n, nReadings: m, dwell, outPtr, outIdx, emitT } = chain;
  const { stayByDistance, eligible, splitOut, nHeadingBins } = move;
  if (nSteps === 0) return;
  const nLinks = outPtr[n];
  const last = (nSteps - 1) * n;
  for (let i = 0; i < n; i++) betaOut[last + i] = 1;
  for (let t = nSteps - 2; t >= 0; t--) {
    const o = obs[t + 1];
    const e = (o < 0 ? m : o) * n;
    const c = scale[t + 1];
    const next = (t + 1) * n;
    const cur = t * n;
    const db = steps.dBin[t + 1];
    const hb = steps.hBin[t + 1];
    const off = (hb < 0 ? nHeadingBins : hb) * nLinks;
    const sd = db >= 0 ? stayByDistance[db] : 0;
    for (let i = 0; i < n; i++) {
      const s = db >= 0 && eligible[i] === 1 ? sd : dwell[i];
      let l = 0;
      const end = outPtr[i + 1];
      for (let q = outPtr[i]; q < end; q++) {
        const j = outIdx[q];
        l += splitOut[off + q] * emitT[e + j] * betaOut[next + j];
      }
      betaOut[cur + i] = c * (s * emitT[e + i] * betaOut[next + i] + (1 - s) * l);
    }
  }
}
