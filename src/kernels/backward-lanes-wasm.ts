import { WasmFunction } from './wasm-function.js';

/**
 * `backwardCountsLanes` (`perLink`) or `backwardTotalsLanes` as a WebAssembly function: the same fused
 * backward recursion and expected counts, the same arithmetic in the same order in every lane, and the
 * same order for the sums across lanes — ((k0 + k2) + (k4 + k6)) + ((k1 + k3) + (k5 + k7)), the order of
 * four two-lane vectors added pairwise — so the same numbers, bit for bit:
 *
 *   ŵ_t(j) = c_{t-1} b_j(o_t) β'_t(j),   β'_t(i) = a_ii ŵ_{t+1}(i) + Σ_{i → j} a_ij ŵ_{t+1}(j) + c_t [t = T-1],
 *   ξ_t(i, j) = u_t(i) a_ij ŵ_{t+1}(j),   γ_t(i) = u_t(i) β'_t(i).
 *
 * Parameters (all i32; `p…` are byte offsets into the linear memory laid out by `LaneMachine`): `n`,
 * `t0`, `t1`, `pDwell`, `pOutPtr`, `pOutIdx`, `pOutProb`, `pEmit` (the emission table), `pRows` (byte
 * address of each step's and lane's emission row), `pLens` (8 i32: each lane's length), `pTable`,
 * `pScale` (as left by the forward kernel), `pW` (ŵ_{t1} on entry, ŵ_{t0} on return; 8n f64),
 * `pWSpare` (scratch, 8n f64), `pEmitCount` ((nReadings + 1) × n f64, laid out like the emission table),
 * `pDwellCount` (n f64), `pExtra` (per-link counts when `perLink`, else `lastGamma`: γ at each run's
 * last step) and `pStart` (n f64). Every count is ADDED.
 *
 * Loop tricks, and why: eight lanes as four 128-bit vectors, so each link's index and probability serve
 * eight runs in four multiply-adds; byte-offset addressing with no bounds, overflow or map checks; the
 * dwell is a contiguous term outside the link loop; ŵ_t is produced in the same pass as β'_t.
 */
export function backwardLanesWasm(perLink: boolean): WasmFunction {
  const f = new WasmFunction(Array<'i32'>(18).fill('i32'));
  const [n, t0, t1, pDwell, pOutPtr, pOutIdx, pOutProb, pEmit, pRows, pLens, pTable, pScale, pW, pWSpare, pEmitCount, pDwellCount, pExtra, pStart] =
    Array.from({ length: 18 }, (_, i) => i);
  const t = f.local('i32');
  const stride = f.local('i32');
  const row = f.local('i32');
  const rowStep = f.local('i32');
  const next = f.local('i32'); // ŵ_{t+1}
  const out = f.local('i32'); // ŵ_t
  const swap = f.local('i32');
  const i = f.local('i32');
  const q = f.local('i32');
  const end = f.local('i32');
  const x = f.local('i32');
  const y = f.local('i32');
  const v = f.local('i32');
  const cell = f.local('i32');
  const anyEnd = f.local('i32');
  const e = Array.from({ length: 8 }, () => f.local('i32'));
  const ec = Array.from({ length: 8 }, () => f.local('i32'));
  const z = Array.from({ length: 4 }, () => f.local('v128'));
  const pv = Array.from({ length: 4 }, () => f.local('v128'));
  const u = Array.from({ length: 4 }, () => f.local('v128'));
  const d = Array.from({ length: 4 }, () => f.local('v128'));
  const l = Array.from({ length: 4 }, () => f.local('v128'));
  const b = Array.from({ length: 4 }, () => f.local('v128'));
  const g = Array.from({ length: 4 }, () => f.local('v128'));
  const prod = Array.from({ length: 4 }, () => f.local('v128'));
  const splat = f.local('v128');
  const zk = f.local('f64');

  /** Pushes the sum over the eight lanes of the four vectors `vs`, in the kernels' cross-lane order. */
  const laneSum = (vs: number[]): void => {
    f.get(vs[0]).get(vs[1]).f64x2Add().get(vs[2]).get(vs[3]).f64x2Add().f64x2Add().tee(splat);
    f.f64x2ExtractLane(0).get(splat).f64x2ExtractLane(1).f64Add();
  };
  /** Pushes the emission probabilities of cell `cell` for lanes 2k and 2k+1 as one vector. */
  const emissionPair = (k: number): void => {
    f.get(e[2 * k]).get(cell).i32Add().f64Load().f64x2Splat();
    f.get(e[2 * k + 1]).get(cell).i32Add().f64Load().f64x2ReplaceLane(1);
  };

  f.get(n).i32(6).i32Shl().set(stride);
  f.get(pW).set(next);
  f.get(pWSpare).set(out);
  f.forDown(t, () => f.get(t1).i32(1).i32Sub(), () => f.get(t0), () => {
    f.get(pTable).get(t).get(t0).i32Sub().i32(1).i32Add().get(stride).i32Mul().i32Add().set(row);
    f.get(t).i32(6).i32Shl().set(rowStep);
    for (let k = 0; k < 8; k++) {
      f.get(pRows).get(t).i32(5).i32Shl().i32Add().i32Load(4 * k).tee(e[k]).get(pEmit).i32Sub().get(pEmitCount).i32Add().set(ec[k]);
    }
    // The end-of-run term c_t [t = T_k - 1] for each lane, and whether any lane ends here.
    f.i32(0).set(anyEnd);
    for (let k = 0; k < 8; k++) {
      f.get(pScale).get(rowStep).i32Add().f64Load(8 * k).f64(0);
      f.get(t).get(pLens).i32Load(4 * k).i32(1).i32Sub().i32Eq().tee(v).select().set(zk);
      f.get(anyEnd).get(v).i32Or().set(anyEnd);
      if (k % 2 === 0) f.get(zk).f64x2Splat().set(z[k >> 1]);
      else f.get(z[k >> 1]).get(zk).f64x2ReplaceLane(1).set(z[k >> 1]);
    }
    // c_{t-1} for ŵ_t (1 at t = 0, where ŵ_0 is not used).
    for (let k = 0; k < 4; k++) f.f64(1).f64x2Splat().set(pv[k]);
    f.get(t).i32(0).i32Ne().when(() => {
      for (let k = 0; k < 4; k++) f.get(pScale).get(rowStep).i32Add().i32(64).i32Sub().v128Load(16 * k).set(pv[k]);
    });

    f.forRange(i, () => f.i32(0), () => f.get(n), () => {
      f.get(i).i32(3).i32Shl().set(cell);
      f.get(row).get(i).i32(6).i32Shl().i32Add().set(x);
      f.get(i).i32(6).i32Shl().set(y);
      for (let k = 0; k < 4; k++) f.get(x).v128Load(16 * k).set(u[k]);
      f.get(pDwell).get(cell).i32Add().f64Load().f64x2Splat().set(splat);
      for (let k = 0; k < 4; k++) f.get(splat).get(next).get(y).i32Add().v128Load(16 * k).f64x2Mul().set(d[k]);
      for (let k = 0; k < 4; k++) f.get(u[k]).get(d[k]).f64x2Mul().set(prod[k]);
      f.get(pDwellCount).get(cell).i32Add().tee(v).get(v).f64Load();
      laneSum(prod);
      f.f64Add().f64Store();
      for (let k = 0; k < 4; k++) f.f64(0).f64x2Splat().set(l[k]);
      f.get(pOutPtr).get(i).i32(2).i32Shl().i32Add().tee(v).i32Load(4).set(end);
      f.forRange(q, () => f.get(v).i32Load(0), () => f.get(end), () => {
        f.get(next).get(pOutIdx).get(q).i32(2).i32Shl().i32Add().i32Load().i32(6).i32Shl().i32Add().set(v);
        f.get(pOutProb).get(q).i32(3).i32Shl().i32Add().f64Load().f64x2Splat().set(splat);
        if (perLink) {
          for (let k = 0; k < 4; k++) f.get(splat).get(v).v128Load(16 * k).f64x2Mul().set(b[k]);
          for (let k = 0; k < 4; k++) f.get(l[k]).get(b[k]).f64x2Add().set(l[k]);
          for (let k = 0; k < 4; k++) f.get(u[k]).get(b[k]).f64x2Mul().set(prod[k]);
          f.get(pExtra).get(q).i32(3).i32Shl().i32Add().tee(v).get(v).f64Load();
          laneSum(prod);
          f.f64Add().f64Store();
        } else {
          for (let k = 0; k < 4; k++) f.get(l[k]).get(splat).get(v).v128Load(16 * k).f64x2Mul().f64x2Add().set(l[k]);
        }
      });
      for (let k = 0; k < 4; k++) f.get(d[k]).get(l[k]).f64x2Add().get(z[k]).f64x2Add().set(b[k]);
      for (let k = 0; k < 4; k++) f.get(u[k]).get(b[k]).f64x2Mul().set(g[k]);
      for (let k = 0; k < 8; k++) {
        f.get(ec[k]).get(cell).i32Add().tee(v).get(v).f64Load().get(g[k >> 1]).f64x2ExtractLane((k & 1) as 0 | 1).f64Add().f64Store();
      }
      f.get(t).i32(0).i32Eq().when(() => {
        f.get(pStart).get(cell).i32Add().tee(v).get(v).f64Load();
        laneSum(g);
        f.f64Add().f64Store();
      });
      for (let k = 0; k < 4; k++) {
        f.get(out).get(y).i32Add();
        f.get(pv[k]);
        emissionPair(k);
        f.f64x2Mul().get(b[k]).f64x2Mul().v128Store(16 * k);
      }
    });
    if (!perLink) {
      // γ at a lane's last step is u_t c_t (β̂ = 1): kept to take it out of the transition totals.
      f.get(anyEnd).when(() => {
        f.forRange(i, () => f.i32(0), () => f.get(n), () => {
          f.get(row).get(i).i32(6).i32Shl().i32Add().set(x);
          for (let k = 0; k < 4; k++) f.get(x).v128Load(16 * k).get(z[k]).f64x2Mul().set(prod[k]);
          f.get(pExtra).get(i).i32(3).i32Shl().i32Add().tee(v).get(v).f64Load();
          laneSum(prod);
          f.f64Add().f64Store();
        });
      });
    }
    f.get(next).set(swap);
    f.get(out).set(next);
    f.get(swap).set(out);
  });
  // Leave ŵ_{t0} in pW.
  f.get(next).get(pW).i32Ne().when(() => {
    f.forRange(i, () => f.i32(0), () => f.get(n), () => {
      f.get(i).i32(6).i32Shl().set(y);
      for (let k = 0; k < 4; k++) f.get(pW).get(y).i32Add().get(next).get(y).i32Add().v128Load(16 * k).v128Store(16 * k);
    });
  });
  return f;
}
