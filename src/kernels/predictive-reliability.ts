import type { SparseChain } from './sparse-chain.js';
import type { MoveSteps } from './move-chain.js';

/**
 * One-step-ahead reading forecasts of one run, binned for a reliability table. From the forward
 * recursion (Rabiner 1989, eqs. 19–20, normalised each step): the predicted state distribution before
 * step t is p_t(j) = P(s_t = j | o_<t) (the start distribution at t = 0, then Σ_i α̂_{t-1}(i) a_ij), and
 * the forecast of reading r is q_t(r) = Σ_j p_t(j) b_j(r). At every step with a reading, the top
 * forecast r* = argmax_r q_t(r) (ties to the lower reading) is one forecast "r* comes, with probability
 * q_t(r*)": bin b = ⌊q·nBins⌋ (the last bin closed) gets count += 1, predicted += q, hits += [o_t = r*].
 *
 * `bins` is nBins × 3 (count, Σ predicted, Σ hits), added to (not cleared). `work` needs 2·nCells +
 * nReadings entries. Returns log P(readings) of the run, or −Infinity when a reading is impossible
 * (the steps before it are binned, the rest not). Cost O(nSteps · (nnz + nCells · nReadings)); no
 * allocation.
 *
 * With `steps` (the run's odometry) and a chain with movement tables (`chain.move`), the prediction
 * uses the per-step transitions A_t of `move-chain.ts` (the transition into step t + 1 from
 * `dBin[t + 1]`, `hBin[t + 1]`), as the movement forward kernel does; otherwise the plain transitions.
 */
export function predictiveReliability(
  chain: SparseChain,
  obs: Int32Array,
  nSteps: number,
  nBins: number,
  work: Float64Array,
  bins: Float64Array,
  steps?: MoveSteps,
): number {
  const { nCells: n, nReadings: m, start, predPtr, predIdx, predProb, emitT } = chain;
  const move = steps ? chain.move : undefined;
  const pred = work.subarray(0, n);
  const filt = work.subarray(n, 2 * n);
  const q = work.subarray(2 * n, 2 * n + m);
  for (let j = 0; j < n; j++) pred[j] = start[j];
  let logP = 0;
  for (let t = 0; t < nSteps; t++) {
    const o = obs[t];
    if (o >= 0) {
      let best = 0;
      for (let r = 0; r < m; r++) {
        let acc = 0;
        const e = r * n;
        for (let j = 0; j < n; j++) acc += pred[j] * emitT[e + j];
        q[r] = acc;
        if (acc > q[best]) best = r;
      }
      const p = q[best];
      const b = Math.min(nBins - 1, Math.max(0, Math.floor(p * nBins)));
      bins[3 * b] += 1;
      bins[3 * b + 1] += p;
      if (o === best) bins[3 * b + 2] += 1;
    }
    // Filter on the reading (a dropout reads the row of ones), then predict the next step.
    const e = (o < 0 ? m : o) * n;
    let sum = 0;
    for (let j = 0; j < n; j++) {
      const v = pred[j] * emitT[e + j];
      filt[j] = v;
      sum += v;
    }
    if (!(sum > 0)) return -Infinity;
    logP += Math.log(sum);
    const c = 1 / sum;
    for (let j = 0; j < n; j++) filt[j] *= c;
    if (t + 1 < nSteps && move) {
      // Per-step transitions: pred(j) = s_j filt(j) + Σ_{i → j} (1 − s_i) split_h(i → j) filt(i);
      // filt is overwritten with the moving mass (1 − s_i) filt(i), as `forwardMoveSegment` does.
      const { dwell, inPtr, inIdx } = chain;
      const { stayByDistance, eligible, splitIn, nHeadingBins } = move;
      const db = steps!.dBin[t + 1];
      const hb = steps!.hBin[t + 1];
      const off = (hb < 0 ? nHeadingBins : hb) * inPtr[n];
      const sd = db >= 0 ? stayByDistance[db] : 0;
      for (let i = 0; i < n; i++) {
        const st = db >= 0 && eligible[i] === 1 ? sd : dwell[i];
        pred[i] = st * filt[i];
        filt[i] = (1 - st) * filt[i];
      }
      for (let j = 0; j < n; j++) {
        let acc = pred[j];
        for (let p = inPtr[j]; p < inPtr[j + 1]; p++) acc += filt[inIdx[p]] * splitIn[off + p];
        pred[j] = acc;
      }
    } else if (t + 1 < nSteps) {
      for (let j = 0; j < n; j++) {
        let acc = 0;
        for (let k = predPtr[j]; k < predPtr[j + 1]; k++) acc += filt[predIdx[k]] * predProb[k];
        pred[j] = acc;
      }
    }
  }
  return logP;
}
