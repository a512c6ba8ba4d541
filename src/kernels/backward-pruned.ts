import type { SparseChain } from './sparse-chain.js';

/**
 * The fused backward + expected-counts pass of `backwardCountsSegment`, over the kept cells of
 * `forwardPruned` only (one whole run): with the masked model of `forwardPruned`, ŵ_t(j) is 0 for every
 * cell not kept at t, so each step visits its kept cells and their links and nothing else. It ADDS
 * the same tables as `backwardCountsSegment` (`linkCount` per link in `out` order, `dwellCount`,
 * `emitCount` with the dropout row, `startCount` for step 0) — the masked model's exact counts, each
 * step's posterior summing to 1.
 *
 * `scale`, `kept`, `keptVal`, `keptPtr` as left by `forwardPruned`. `w` and `wSpare` (nCells each) must be all zero on entry; they are all zero on return. No
 * allocation.
 */
export function backwardPruned(
  chain: SparseChain,
  obs: Int32Array,
  scale: Float64Array,
  kept: Int32Array,
  keptVal: Float64Array,
  keptPtr: Int32Array,
  w: Float64Array,
  wSpare: Float64Array,
  emitCount: Float64Array,
  linkCount: Float64Array,
  dwellCount: Float64Array,
  startCount: Float64Array,
): void {
  const { nCells: n, nReadings: m, dwell, outPtr, outIdx, outProb, emitT } = chain;
  const T = obs.length;
  let next = w; // ŵ_{t+1}, zero outside the cells kept at t+1
  let out = wSpare; // ŵ_t
  for (let t = T - 1; t >= 0; t--) {
    const o = obs[t];
    const e = (o < 0 ? m : o) * n;
    const z = t === T - 1 ? scale[t] : 0;
    const p = t > 0 ? scale[t - 1] : 1;
    const k1 = keptPtr[t + 1];
    for (let k = keptPtr[t]; k < k1; k++) {
      const i = kept[k];
      const u = keptVal[k];
      const d = dwell[i] * next[i];
      dwellCount[i] += u * d;
      let l = 0;
      const end = outPtr[i + 1];
      for (let q = outPtr[i]; q < end; q++) {
        const v = outProb[q] * next[outIdx[q]];
        l += v;
        linkCount[q] += u * v;
      }
      const b = d + l + z;
      const g = u * b;
      emitCount[e + i] += g;
      if (t === 0) startCount[i] += g;
      out[i] = p * emitT[e + i] * b;
    }
    if (t + 1 < T) for (let k = keptPtr[t + 1]; k < keptPtr[t + 2]; k++) next[kept[k]] = 0;
    const swap = next;
    next = out;
    out = swap;
  }
  if (T > 0) for (let k = keptPtr[0]; k < keptPtr[1]; k++) next[kept[k]] = 0;
}
