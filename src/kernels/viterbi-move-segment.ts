import type { MoveChain, MoveSteps } from './move-chain.js';

/**
 * `viterbiSegment` with per-step transitions from odometry (Viterbi 1967; Rabiner 1989, eqs. 32–35, in
 * logs), A_t as in `MoveChain`:
 *
 *   δ_t(j) = log b_j(o_t) + max(δ_{t-1}(j) + log s_j,t,  max_{i → j} δ_{t-1}(i) + log(1 − s_i,t) + log split_{h_t}(i → j)).
 *
 * Same conventions as `viterbiSegment` (back-pointers, ties to the lowest cell index with the dwell
 * taken first, `delta` of 2 · nCells carrying δ between segments). Inputs in logs: start, the plain dwell
 * (`logDwell`, for steps whose distance is unknown or cells that are not eligible), the staying
 * probability per distance bin (`logStay`) and its complement (`logGo`), the plain dwell's complement
 * (`logDwellGo`), and the split tables in `in` order (`logSplitIn`, (nHeadingBins + 1) × nLinks).
 * `work` holds 2 · nCells numbers. No allocation.
 */
export function viterbiMoveSegment(
  nCells: number,
  nReadings: number,
  logStart: Float64Array,
  logDwell: Float64Array,
  logDwellGo: Float64Array,
  logStay: Float64Array,
  logGo: Float64Array,
  move: MoveChain,
  logSplitIn: Float64Array,
  inPtr: Int32Array,
  inIdx: Int32Array,
  logEmitT: Float64Array,
  obs: Int32Array,
  steps: MoveSteps,
  t0: number,
  t1: number,
  delta: Float64Array,
  back: Uint8Array | Uint16Array | Int32Array,
  work: Float64Array,
): void {
  const n = nCells;
  const m = nReadings;
  const nLinks = inPtr[n];
  const { eligible, nHeadingBins } = move;
  const { dBin, hBin } = steps;
  const stay = 0;
  const going = n;
  let prev = 0;
  let cur = n;
  for (let t = t0; t < t1; t++) {
    const o = obs[t];
    const e = (o < 0 ? m : o) * n;
    if (t === 0) {
      for (let j = 0; j < n; j++) delta[cur + j] = logStart[j] + logEmitT[e + j];
    } else {
      const bt = (t - t0) * n;
      const db = dBin[t];
      const hb = hBin[t];
      const off = (hb < 0 ? nHeadingBins : hb) * nLinks;
      const ls = db >= 0 ? logStay[db] : 0;
      const lg = db >= 0 ? logGo[db] : 0;
      for (let i = 0; i < n; i++) {
        const known = db >= 0 && eligible[i] === 1;
        work[stay + i] = delta[prev + i] + (known ? ls : logDwell[i]);
        work[going + i] = delta[prev + i] + (known ? lg : logDwellGo[i]);
      }
      for (let j = 0; j < n; j++) {
        let best = work[stay + j];
        let bestI = j;
        const end = inPtr[j + 1];
        for (let p = inPtr[j]; p < end; p++) {
          const i = inIdx[p];
          const v = work[going + i] + logSplitIn[off + p];
          if (v > best || (v === best && i < bestI)) {
            best = v;
            bestI = i;
          }
        }
        back[bt + j] = bestI;
        delta[cur + j] = best + logEmitT[e + j];
      }
    }
    const swap = prev;
    prev = cur;
    cur = swap;
  }
  if (prev !== 0) delta.copyWithin(0, prev, prev + n);
}
