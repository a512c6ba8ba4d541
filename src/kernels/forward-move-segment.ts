import type { SparseChain } from './sparse-chain.js';
import type { MoveChain, MoveSteps } from './move-chain.js';

/**
 * `forwardSegment` with per-step transitions from odometry (`MoveChain`, `MoveSteps`): the scaled
 * forward recursion (Rabiner 1989, eqs. 19–20, section V.A scaling) with A_t in place of A,
 *
 *   u_t(j) = b_j(o_t) c_{t-1} [s_j,t u_{t-1}(j) + Σ_{i → j} (1 − s_i,t) split_{h_t}(i → j) u_{t-1}(i)],
 *
 * same table, scale and return conventions as `forwardSegment`. `work` holds 2 · nCells numbers: per
 * step the staying probabilities s_i,t and the moving mass (1 − s_i,t) u_{t-1}(i), so the link loop
 * costs one load of the bin's split and one multiply-add per link, as in the plain kernel. No allocation.
 */
export function forwardMoveSegment(
  chain: SparseChain,
  move: MoveChain,
  obs: Int32Array,
  steps: MoveSteps,
  t0: number,
  t1: number,
  table: Float64Array,
  scale: Float64Array,
  logIn: number,
  work: Float64Array,
): number {
  const { nCells: n, nReadings: m, start, dwell, inPtr, inIdx, emitT } = chain;
  const { stayByDistance, eligible, splitIn, nHeadingBins } = move;
  const nLinks = inPtr[n];
  const { dBin, hBin } = steps;
  const stay = 0;
  const moving = n;
  let logP = logIn;
  for (let t = t0; t < t1; t++) {
    const cur = (t - t0 + 1) * n;
    const o = obs[t];
    const e = (o < 0 ? m : o) * n;
    let sum = 0;
    if (t === 0) {
      for (let j = 0; j < n; j++) {
        const v = start[j] * emitT[e + j];
        table[cur + j] = v;
        sum += v;
      }
    } else {
      const prev = cur - n;
      const c = scale[t - 1];
      const db = dBin[t];
      const hb = hBin[t];
      const off = (hb < 0 ? nHeadingBins : hb) * nLinks;
      const sd = db >= 0 ? stayByDistance[db] : 0;
      for (let i = 0; i < n; i++) {
        const s = db >= 0 && eligible[i] === 1 ? sd : dwell[i];
        work[stay + i] = s;
        work[moving + i] = (1 - s) * table[prev + i];
      }
      for (let j = 0; j < n; j++) {
        let acc = table[prev + j] * work[stay + j];
        const end = inPtr[j + 1];
        for (let p = inPtr[j]; p < end; p++) acc += work[moving + inIdx[p]] * splitIn[off + p];
        const v = acc * c * emitT[e + j];
        table[cur + j] = v;
        sum += v;
      }
    }
    if (!(sum > 0)) {
      scale[t] = 1;
      return -Infinity;
    }
    scale[t] = 1 / sum;
    logP += Math.log(sum);
  }
  return logP;
}
