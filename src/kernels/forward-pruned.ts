import type { SparseChain } from './sparse-chain.js';

/**
 * Pruned scaled forward recursion (a beam with a stated bound) for one whole run. Each step scatters
 * the kept cells of the previous step along their dwell and links (so only kept cells and their
 * successors cost anything), multiplies by the emissions, and then drops every candidate cell whose
 * mass is below
 *
 *   τ_t = eps · S_t / n_t      (S_t the step's total, n_t its number of cells with mass > 0),
 *
 * so the share discarded at step t is δ_t ≤ n_t · τ_t / S_t = eps. The largest cell is always kept
 * (it is at least the mean S_t / n_t ≥ τ_t when eps ≤ 1). The kept vector is stored unscaled, as in
 * `forwardSegment`, with c_t = 1 / K_t (K_t = S_t − D_t the kept mass). This is exactly the forward
 * pass of the model whose emissions at step t are masked to the kept cells, so `backwardPruned` then
 * yields that masked model's exact expected counts (each step's posterior sums to 1).
 *
 * Returns L̂ = Σ_t log S_t (the log-likelihood the pruned filter predicts; the masked model's own is
 * log P̃ = Σ_t log K_t = L̂ − B) and writes B = Σ_t log(S_t / K_t) = Σ_t −log(1 − δ_t) ≤ T·(−log(1 − eps))
 * into `out[0]`. Bounds (DEVELOPERS.md, "Pruned E-step"): always L̂ − log P ≤ B; and
 * log P − L̂ ≤ −log(1 − Γ) − B with Γ = Σ_t (exact posterior of the cells dropped at t).
 * Returns −Infinity when a step has no mass (the caller then runs the exact kernels).
 *
 * Layout (compact: memory follows the kept cells, not steps × cells): `kept[keptPtr[t] … keptPtr[t+1]−1]`
 * lists the kept cells of step t and `keptVal` their unscaled u_t, in the same places. Returns NaN when
 * they would overflow `kept.length` (scratch left clean: the caller grows them and calls again);
 * T·nCells always suffices.
 * `acc` (nCells, all zero on entry and on return), `mark` (nCells, all zero on entry and on return) and
 * `cand` (nCells + 1) are scratch. `eps` in [0, 1). No allocation.
 */
export function forwardPruned(
  chain: SparseChain,
  obs: Int32Array,
  eps: number,
  scale: Float64Array,
  kept: Int32Array,
  keptVal: Float64Array,
  keptPtr: Int32Array,
  acc: Float64Array,
  mark: Uint8Array,
  cand: Int32Array,
  out: Float64Array,
): number {
  const { nCells: n, nReadings: m, start, dwell, outPtr, outIdx, outProb, emitT } = chain;
  const T = obs.length;
  let logP = 0;
  let bound = 0;
  let nk = 0;
  keptPtr[0] = 0;
  out[0] = 0;
  for (let t = 0; t < T; t++) {
    const o = obs[t];
    const e = (o < 0 ? m : o) * n;
    let nc = 0;
    if (t === 0) {
      for (let j = 0; j < n; j++) {
        if (start[j] > 0) {
          cand[nc++] = j;
          acc[j] = start[j];
        }
      }
    } else {
      const c = scale[t - 1];
      for (let k = keptPtr[t - 1]; k < keptPtr[t]; k++) {
        const i = kept[k];
        const u = keptVal[k] * c;
        // Branch-free: `acc` is zero outside this step's candidates, and a cell joins the candidate
        // list only the first time it is reached (`mark` 0 → 1).
        acc[i] += u * dwell[i];
        cand[nc] = i;
        nc += 1 - mark[i];
        mark[i] = 1;
        const end = outPtr[i + 1];
        for (let q = outPtr[i]; q < end; q++) {
          const j = outIdx[q];
          acc[j] += u * outProb[q];
          cand[nc] = j;
          nc += 1 - mark[j];
          mark[j] = 1;
        }
      }
    }
    let sum = 0;
    let nPos = 0;
    for (let k = 0; k < nc; k++) {
      const j = cand[k];
      const v = acc[j] * emitT[e + j];
      acc[j] = v;
      sum += v;
      if (v > 0) nPos++;
    }
    if (!(sum > 0)) {
      for (let k = 0; k < nc; k++) {
        acc[cand[k]] = 0;
        mark[cand[k]] = 0;
      }
      scale[t] = 1;
      keptPtr[t + 1] = nk;
      return -Infinity;
    }
    if (nk + nc > kept.length) {
      for (let k = 0; k < nc; k++) {
        acc[cand[k]] = 0;
        mark[cand[k]] = 0;
      }
      return NaN;
    }
    const tau = (eps * sum) / nPos;
    let keptSum = 0;
    for (let k = 0; k < nc; k++) {
      const j = cand[k];
      const v = acc[j];
      if (v > 0 && v >= tau) {
        kept[nk] = j;
        keptVal[nk++] = v;
        keptSum += v;
      }
      acc[j] = 0;
      mark[j] = 0;
    }
    keptPtr[t + 1] = nk;
    scale[t] = 1 / keptSum;
    logP += Math.log(sum);
    if (keptSum !== sum) bound += Math.log(sum / keptSum);
  }
  out[0] = bound;
  return logP;
}
