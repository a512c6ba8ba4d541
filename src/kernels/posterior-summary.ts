import type { SparseChain } from './sparse-chain.js';

/**
 * Per-step summaries of the posterior over cells, computed during the scaled backward recursion
 * (Rabiner 1989, eqs. 24–27, section V.A scaling) so that no steps × cells posterior table is stored:
 * at each step t, γ_t(i) = α̂_t(i) β̂_t(i), and from it
 *
 * - `likelyCellOut[t]` = argmax_i γ_t(i) (lowest index on ties), `likelyPOut[t]` its probability;
 * - `pathPOut[t]` = γ_t(path[t]), the posterior of the given path's cell (e.g. the Viterbi path);
 * - `entropyOut[t]` = −Σ_i γ_t(i) log2 γ_t(i), in bits.
 *
 * `alpha`, `scale` come from `forwardScaled` on the same (possible) run; `work` holds 2 · nCells.
 */
export function posteriorSummary(
  chain: SparseChain,
  obs: Int32Array,
  nSteps: number,
  alpha: Float64Array,
  scale: Float64Array,
  path: Int32Array,
  work: Float64Array,
  likelyCellOut: Int32Array,
  likelyPOut: Float64Array,
  pathPOut: Float64Array,
  entropyOut: Float64Array,
): void {
  const { nCells: n, nReadings: m, succPtr, succIdx, succProb, emitT } = chain;
  if (nSteps === 0) return;
  let betaNext = 0;
  let betaCur = n;
  for (let i = 0; i < n; i++) work[betaNext + i] = 1;
  summarise(nSteps - 1);
  for (let t = nSteps - 2; t >= 0; t--) {
    const o = obs[t + 1];
    const e = (o < 0 ? m : o) * n;
    const c = scale[t + 1];
    for (let i = 0; i < n; i++) {
      let acc = 0;
      const end = succPtr[i + 1];
      for (let k = succPtr[i]; k < end; k++) {
        const j = succIdx[k];
        acc += succProb[k] * emitT[e + j] * work[betaNext + j];
      }
      work[betaCur + i] = acc * c;
    }
    const swap = betaNext;
    betaNext = betaCur;
    betaCur = swap;
    summarise(t);
  }

  function summarise(t: number): void {
    const row = t * n;
    let best = -1;
    let bestI = 0;
    let h = 0;
    for (let i = 0; i < n; i++) {
      const g = alpha[row + i] * work[betaNext + i];
      if (g > best) {
        best = g;
        bestI = i;
      }
      if (g > 0) h -= g * Math.log2(g);
    }
    likelyCellOut[t] = bestI;
    likelyPOut[t] = best;
    pathPOut[t] = path[t] >= 0 ? alpha[row + path[t]] * work[betaNext + path[t]] : NaN;
    entropyOut[t] = h;
  }
}
