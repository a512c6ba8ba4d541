import type { LaneGroup, SparseChain } from './sparse-chain.js';

/**
 * `backwardTotalsLanes` for a chain whose links out of each cell share one probability f_i
 * (`chain.uniformLinks`: the equal split of the `tied` family). Same recursion, arguments and results
 * (up to rounding: f_i Σ_j ŵ(j) instead of Σ_j f_i ŵ(j)), with the probability taken out of the link
 * sum: β'_t(i) = a_ii ŵ_{t+1}(i) + f_i Σ_{i → j} ŵ_{t+1}(j) + c_t [t = T-1], so the link loop is one load
 * and one add per lane-link and the multiply is paid once per cell. No allocation.
 */
export function backwardTotalsLanesUniform(
  chain: SparseChain,
  group: LaneGroup,
  t0: number,
  t1: number,
  table: Float64Array,
  scale: Float64Array,
  w: Float64Array,
  wSpare: Float64Array,
  emitCount: Float64Array,
  dwellCount: Float64Array,
  lastGamma: Float64Array,
  startCount: Float64Array,
): void {
  const { nCells: n, dwell, linkProb, outPtr, outIdx, emitT } = chain;
  const rows = group.rows;
  const lens = group.laneSteps;
  const stride = 4 * n;
  let next = w; // ŵ_{t+1}
  let out = wSpare; // ŵ_t
  for (let t = t1 - 1; t >= t0; t--) {
    const row = (t - t0 + 1) * stride;
    const rb = t * 4;
    const e0 = rows[rb];
    const e1 = rows[rb + 1];
    const e2 = rows[rb + 2];
    const e3 = rows[rb + 3];
    const z0 = t === lens[0] - 1 ? scale[rb] : 0;
    const z1 = t === lens[1] - 1 ? scale[rb + 1] : 0;
    const z2 = t === lens[2] - 1 ? scale[rb + 2] : 0;
    const z3 = t === lens[3] - 1 ? scale[rb + 3] : 0;
    const p0 = t > 0 ? scale[rb - 4] : 1;
    const p1 = t > 0 ? scale[rb - 3] : 1;
    const p2 = t > 0 ? scale[rb - 2] : 1;
    const p3 = t > 0 ? scale[rb - 1] : 1;
    for (let i = 0; i < n; i++) {
      const x = row + 4 * i;
      const u0 = table[x];
      const u1 = table[x + 1];
      const u2 = table[x + 2];
      const u3 = table[x + 3];
      const y = 4 * i;
      const dw = dwell[i];
      const d0 = dw * next[y];
      const d1 = dw * next[y + 1];
      const d2 = dw * next[y + 2];
      const d3 = dw * next[y + 3];
      dwellCount[i] += u0 * d0 + u1 * d1 + u2 * d2 + u3 * d3;
      let l0 = 0;
      let l1 = 0;
      let l2 = 0;
      let l3 = 0;
      const end = outPtr[i + 1];
      for (let q = outPtr[i]; q < end; q++) {
        const v = 4 * outIdx[q];
        l0 += next[v];
        l1 += next[v + 1];
        l2 += next[v + 2];
        l3 += next[v + 3];
      }
      const f = linkProb[i];
      const b0 = d0 + f * l0 + z0;
      const b1 = d1 + f * l1 + z1;
      const b2 = d2 + f * l2 + z2;
      const b3 = d3 + f * l3 + z3;
      const g0 = u0 * b0;
      const g1 = u1 * b1;
      const g2 = u2 * b2;
      const g3 = u3 * b3;
      emitCount[e0 + i] += g0;
      emitCount[e1 + i] += g1;
      emitCount[e2 + i] += g2;
      emitCount[e3 + i] += g3;
      if (t === 0) startCount[i] += g0 + g1 + g2 + g3;
      out[y] = p0 * emitT[e0 + i] * b0;
      out[y + 1] = p1 * emitT[e1 + i] * b1;
      out[y + 2] = p2 * emitT[e2 + i] * b2;
      out[y + 3] = p3 * emitT[e3 + i] * b3;
    }
    // γ at a lane's last step is u_t c_t (β̂ = 1): kept to take it out of the transition totals.
    if (z0 !== 0 || z1 !== 0 || z2 !== 0 || z3 !== 0) {
      for (let i = 0; i < n; i++) {
        const x = row + 4 * i;
        lastGamma[i] += table[x] * z0 + table[x + 1] * z1 + table[x + 2] * z2 + table[x + 3] * z3;
      }
    }
    const swap = next;
    next = out;
    out = swap;
  }
  if (next !== w) w.set(next.subarray(0, stride));
}
