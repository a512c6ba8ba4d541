import type { SparseChain } from './sparse-chain.js';

/**
 * Scaled forward recursion (Rabiner 1989, eqs. 19–20 with the scaling of section V.A) for one run, over
 * the steps `t0 … t1-1` of a segment (the whole run, or one block of a checkpointed run):
 *
 *   u_0(j) = π_j b_j(o_0),   u_t(j) = b_j(o_t) c_{t-1} [a_jj u_{t-1}(j) + Σ_{i → j} a_ij u_{t-1}(i)],
 *   c_t = 1 / Σ_j u_t(j),
 *
 * so that α̂_t = c_t u_t is the normalised forward vector and log P = Σ_t log Σ_j u_t(j).
 *
 * Table: rows of nCells numbers; row `t - t0 + 1` receives u_t, and row 0 must hold u_{t0-1} when t0 > 0
 * (a checkpoint, or the previous segment's last row). `scale[t]` receives c_t; c_{t0-1} must be there when
 * t0 > 0. Returns `logIn` plus log Σ_j u_t(j) for each step of the segment, added in step order (pass
 * the previous segment's result to continue a run), or −Infinity as soon as a step is impossible (then
 * the rest of the segment is not computed).
 *
 * Loop tricks: the dwell is a separate, contiguous term (every cell has one), so the gather loop runs
 * over links only; deferred normalisation (u_t stored unscaled, c_{t-1} applied while computing u_t)
 * saves a read-modify-write pass per step; gather over predecessors, so each entry is written once.
 * The arithmetic, in this order, is that of each lane of `forwardLanes`. No allocation.
 */
export function forwardSegment(
  chain: SparseChain,
  obs: Int32Array,
  t0: number,
  t1: number,
  table: Float64Array,
  scale: Float64Array,
  logIn: number,
): number {
  const { nCells: n, nReadings: m, start, dwell, inPtr, inIdx, inProb, emitT } = chain;
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
      for (let j = 0; j < n; j++) {
        let acc = table[prev + j] * dwell[j];
        const end = inPtr[j + 1];
        for (let p = inPtr[j]; p < end; p++) acc += table[prev + inIdx[p]] * inProb[p];
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
