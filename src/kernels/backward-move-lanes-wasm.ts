import { WasmFunction } from './wasm-function.js';

/**
 * `backwardMoveLanes` as a WebAssembly function: the fused backward recursion with per-step transitions
 * from odometry and the totals-form counts of the `tied`/`fixed` M-step with the movement counts, the
 * same arithmetic in the same order in every lane as the JavaScript lanes, and the same order wherever
 * lanes are summed into one number (lane 0 first; the start count in the kernels' pairwise order), so
 * the same numbers, bit for bit:
 *
 *   β'_t(i) = s_i ŵ_{t+1}(i) + (1 − s_i) Σ_{i → j} split_{h_{t+1}}(i → j) ŵ_{t+1}(j) + c_t [t = T-1],
 *   ŵ_t(i) = c_{t-1} b_i(o_t) β'_t(i),   γ_t(i) = u_t(i) β'_t(i),
 *
 * with s_i and the split those of the transition into step t+1 (`move-chain.ts`).
 *
 * Parameters (all i32, byte offsets into the memory laid out by `WasmMoveLaneKernels`): `n`, `t0`, `t1`,
 * `pDwell`, `pOutPtr`, `pOutIdx`, `pEmit`, `pRows`, `pLens`, `pTable`, `pScale`, `pW`, `pWSpare`,
 * `pEmitCount`, `pStartCount` as in `backwardLanesWasm`; `pDwellCount`, `pMoveCount` (n f64: plain dwell
 * and move totals at steps of unknown distance); `pElig`, `pStay`, `pKnown`, `pSplitAt` as in
 * `forwardMoveLanesWasm` but `pSplitAt` addresses rows of `splitOut` (entry t + 1 is read at step t;
 * entry T, past the group's end, is "unknown" in every lane); `pHeadAt` (i32 per step and lane: byte
 * address of the lane's row of `moveByHeading`); `pDBin`, `pHBin` (i32 per step and lane, −1 =
 * unknown); `pStayByDistance`, `pMoveByDistance`, `pHeadingCos`, `pHeadingSin` (the movement counts);
 * `pLinkCos`, `pLinkSin` (f64 per link, out order); `pAnyUnknown` (i32 per step: 1 where some lane's distance
 * is unknown). Every count is ADDED, except that row `nHeadingBins` of `moveByHeading` (steps of unknown
 * heading, discarded by the M-step) is not written: a lane's `pHeadAt` entry is 0 there.
 *
 * Masked lanes add an exact +0 instead of being skipped, which leaves every (non-negative) sum
 * unchanged, so the sums equal the JavaScript kernel's branches; the plain dwell and move totals are
 * skipped at steps where every lane's distance is known (they would add +0).
 */
export function backwardMoveLanesWasm(): WasmFunction {
  const nParams = 31;
  const f = new WasmFunction(Array<'i32'>(nParams).fill('i32'));
  const [n, t0, t1, pDwell, pOutPtr, pOutIdx, pEmit, pRows, pLens, pTable, pScale, pW, pWSpare, pEmitCount, pStartCount, pDwellCount, pMoveCount,
    pElig, pStay, pKnown, pSplitAt, pHeadAt, pDBin, pHBin, pStayByDistance, pMoveByDistance, pHeadingCos, pHeadingSin, pLinkCos, pLinkSin, pAnyUnknown] =
    Array.from({ length: nParams }, (_, i) => i);
  const t = f.local('i32');
  const stride = f.local('i32');
  const row = f.local('i32');
  const rowStep = f.local('i32');
  const nextStep = f.local('i32'); // byte offset of entry t + 1 in the f64 per-step, per-lane arrays
  const nextStep4 = f.local('i32'); // the same in the i32 ones
  const next = f.local('i32');
  const out = f.local('i32');
  const swap = f.local('i32');
  const i = f.local('i32');
  const q = f.local('i32');
  const end = f.local('i32');
  const x = f.local('i32');
  const y = f.local('i32');
  const v = f.local('i32');
  const q8 = f.local('i32');
  const cell = f.local('i32');
  const bin = f.local('i32');
  const first = f.local('i32');
  const anyUnknown = f.local('i32');
  const e = Array.from({ length: 8 }, () => f.local('i32'));
  const ec = Array.from({ length: 8 }, () => f.local('i32'));
  const so = Array.from({ length: 8 }, () => f.local('i32'));
  const hd = Array.from({ length: 8 }, () => f.local('i32'));
  const z = Array.from({ length: 4 }, () => f.local('v128'));
  const pv = Array.from({ length: 4 }, () => f.local('v128'));
  const sd = Array.from({ length: 4 }, () => f.local('v128'));
  const kn = Array.from({ length: 4 }, () => f.local('v128'));
  const u = Array.from({ length: 4 }, () => f.local('v128'));
  const m = Array.from({ length: 4 }, () => f.local('v128'));
  const um = Array.from({ length: 4 }, () => f.local('v128'));
  const d = Array.from({ length: 4 }, () => f.local('v128'));
  const l = Array.from({ length: 4 }, () => f.local('v128'));
  const lc = Array.from({ length: 4 }, () => f.local('v128'));
  const ls = Array.from({ length: 4 }, () => f.local('v128'));
  const xc = Array.from({ length: 4 }, () => f.local('v128'));
  const xs = Array.from({ length: 4 }, () => f.local('v128'));
  const stays = Array.from({ length: 4 }, () => f.local('v128'));
  const goes = Array.from({ length: 4 }, () => f.local('v128'));
  const ml = Array.from({ length: 4 }, () => f.local('v128'));
  const ud = Array.from({ length: 4 }, () => f.local('v128'));
  const g = Array.from({ length: 4 }, () => f.local('v128'));
  const w = f.local('v128');
  const cq = f.local('v128');
  const sq = f.local('v128');
  const splat = f.local('v128');
  const mask = f.local('v128');
  const one = f.local('v128');
  const zero = f.local('v128');
  const acc = f.local('f64');
  const zk = f.local('f64');

  const laneSum = (vs: number[]): void => {
    f.get(vs[0]).get(vs[1]).f64x2Add().get(vs[2]).get(vs[3]).f64x2Add().f64x2Add().tee(splat);
    f.f64x2ExtractLane(0).get(splat).f64x2ExtractLane(1).f64Add();
  };
  /** Adds lanes 0 … 7 of the four vectors `vs`, one after the other from 0, into the f64 at address `v`. */
  const addLanesInOrder = (vs: number[]): void => {
    f.f64(0).set(acc);
    for (let k = 0; k < 8; k++) f.get(acc).get(vs[k >> 1]).f64x2ExtractLane((k & 1) as 0 | 1).f64Add().set(acc);
    f.get(v).get(v).f64Load().get(acc).f64Add().f64Store();
  };
  const emissionPair = (k: number): void => {
    f.get(e[2 * k]).get(cell).i32Add().f64Load().f64x2Splat();
    f.get(e[2 * k + 1]).get(cell).i32Add().f64Load().f64x2ReplaceLane(1);
  };

  f.get(n).i32(6).i32Shl().set(stride);
  f.get(pW).set(next);
  f.get(pWSpare).set(out);
  f.f64(1).f64x2Splat().set(one);
  f.f64(0).f64x2Splat().set(zero);
  f.forDown(t, () => f.get(t1).i32(1).i32Sub(), () => f.get(t0), () => {
    f.get(pTable).get(t).get(t0).i32Sub().i32(1).i32Add().get(stride).i32Mul().i32Add().set(row);
    f.get(t).i32(6).i32Shl().set(rowStep);
    f.get(rowStep).i32(64).i32Add().set(nextStep);
    f.get(t).i32(1).i32Add().i32(5).i32Shl().set(nextStep4);
    f.get(pAnyUnknown).get(t).i32(2).i32Shl().i32Add().i32Load(4).set(anyUnknown);
    for (let k = 0; k < 8; k++) {
      f.get(pRows).get(t).i32(5).i32Shl().i32Add().i32Load(4 * k).tee(e[k]).get(pEmit).i32Sub().get(pEmitCount).i32Add().set(ec[k]);
      f.get(pSplitAt).get(t).i32(5).i32Shl().i32Add().i32Load(32 + 4 * k).set(so[k]);
      f.get(pHeadAt).get(t).i32(5).i32Shl().i32Add().i32Load(32 + 4 * k).set(hd[k]);
    }
    for (let k = 0; k < 8; k++) {
      f.get(pScale).get(rowStep).i32Add().f64Load(8 * k).f64(0);
      f.get(t).get(pLens).i32Load(4 * k).i32(1).i32Sub().i32Eq().select().set(zk);
      if (k % 2 === 0) f.get(zk).f64x2Splat().set(z[k >> 1]);
      else f.get(z[k >> 1]).get(zk).f64x2ReplaceLane(1).set(z[k >> 1]);
    }
    for (let k = 0; k < 4; k++) {
      f.get(one).set(pv[k]);
      f.get(pStay).get(nextStep).i32Add().v128Load(16 * k).set(sd[k]);
      f.get(pKnown).get(nextStep).i32Add().v128Load(16 * k).set(kn[k]);
      for (const acc4 of [xc, xs, stays, goes]) f.get(zero).set(acc4[k]);
    }
    f.get(t).i32(0).i32Ne().when(() => {
      for (let k = 0; k < 4; k++) f.get(pScale).get(rowStep).i32Add().i32(64).i32Sub().v128Load(16 * k).set(pv[k]);
    });

    f.forRange(i, () => f.i32(0), () => f.get(n), () => {
      f.get(i).i32(3).i32Shl().set(cell);
      f.get(i).i32(6).i32Shl().set(y);
      f.get(row).get(y).i32Add().set(x);
      f.get(pDwell).get(cell).i32Add().f64Load().f64x2Splat().set(splat);
      f.get(pElig).get(i).i32(4).i32Shl().i32Add().v128Load().set(mask);
      for (let k = 0; k < 4; k++) {
        f.get(x).v128Load(16 * k).set(u[k]);
        // s_i per lane (in d[k] for now), 1 − s_i, u (1 − s_i), s_i ŵ_{t+1}(i).
        f.get(sd[k]).get(splat).get(kn[k]).get(mask).v128And().v128Bitselect().set(d[k]);
        f.get(one).get(d[k]).f64x2Sub().set(m[k]);
        f.get(u[k]).get(m[k]).f64x2Mul().set(um[k]);
        f.get(d[k]).get(next).get(y).i32Add().v128Load(16 * k).f64x2Mul().set(d[k]);
        f.get(zero).set(l[k]);
        f.get(zero).set(lc[k]);
        f.get(zero).set(ls[k]);
      }
      f.get(pOutPtr).get(i).i32(2).i32Shl().i32Add().tee(v).i32Load(4).set(end);
      f.get(v).i32Load(0).set(first);
      // Two passes over the links, lanes 0–3 then 4–7: twelve running sums at once would not fit the
      // machine's vector registers.
      for (const half of [0, 1]) {
        f.forRange(q, () => f.get(first), () => f.get(end), () => {
          f.get(next).get(pOutIdx).get(q).i32(2).i32Shl().i32Add().i32Load().i32(6).i32Shl().i32Add().set(v);
          f.get(q).i32(3).i32Shl().set(q8);
          f.get(pLinkCos).get(q8).i32Add().f64Load().f64x2Splat().set(cq);
          f.get(pLinkSin).get(q8).i32Add().f64Load().f64x2Splat().set(sq);
          for (let k = 2 * half; k < 2 * half + 2; k++) {
            f.get(so[2 * k]).get(q8).i32Add().f64Load().f64x2Splat();
            f.get(so[2 * k + 1]).get(q8).i32Add().f64Load().f64x2ReplaceLane(1);
            f.get(v).v128Load(16 * k).f64x2Mul().set(w);
            f.get(l[k]).get(w).f64x2Add().set(l[k]);
            f.get(lc[k]).get(w).get(cq).f64x2Mul().f64x2Add().set(lc[k]);
            f.get(ls[k]).get(w).get(sq).f64x2Mul().f64x2Add().set(ls[k]);
          }
        });
      }
      for (let k = 0; k < 4; k++) {
        f.get(um[k]).get(l[k]).f64x2Mul().set(ml[k]);
        f.get(u[k]).get(d[k]).f64x2Mul().set(ud[k]);
        f.get(xc[k]).get(um[k]).get(lc[k]).f64x2Mul().f64x2Add().set(xc[k]);
        f.get(xs[k]).get(um[k]).get(ls[k]).f64x2Mul().f64x2Add().set(xs[k]);
      }
      for (let k = 0; k < 8; k++) {
        f.get(hd[k]).when(() => {
          f.get(hd[k]).get(cell).i32Add().tee(v).get(v).f64Load().get(ml[k >> 1]).f64x2ExtractLane((k & 1) as 0 | 1).f64Add().f64Store();
        });
      }
      // Known distance (and eligible cell): stays and moves per lane, for the distance bins.
      for (let k = 0; k < 4; k++) {
        f.get(stays[k]).get(ud[k]).get(kn[k]).get(mask).v128And().v128And().f64x2Add().set(stays[k]);
        f.get(goes[k]).get(ml[k]).get(kn[k]).get(mask).v128And().v128And().f64x2Add().set(goes[k]);
      }
      // Unknown distance: the plain dwell and move totals, lanes added in order.
      f.get(anyUnknown).when(() => {
        for (let k = 0; k < 4; k++) {
          f.get(ud[k]).get(kn[k]).v128AndNot().set(g[k]);
          f.get(ml[k]).get(kn[k]).v128AndNot().set(ud[k]); // ud is not needed any more: the masked moves
        }
        f.get(pDwellCount).get(cell).i32Add().set(v);
        addLanesInOrder(g);
        f.get(pMoveCount).get(cell).i32Add().set(v);
        addLanesInOrder(ud);
      });
      for (let k = 0; k < 4; k++) {
        f.get(d[k]).get(m[k]).get(l[k]).f64x2Mul().f64x2Add().get(z[k]).f64x2Add().set(l[k]); // β'
        f.get(u[k]).get(l[k]).f64x2Mul().set(g[k]);
      }
      for (let k = 0; k < 8; k++) {
        f.get(ec[k]).get(cell).i32Add().tee(v).get(v).f64Load().get(g[k >> 1]).f64x2ExtractLane((k & 1) as 0 | 1).f64Add().f64Store();
      }
      f.get(t).i32(0).i32Eq().when(() => {
        f.get(pStartCount).get(cell).i32Add().tee(v).get(v).f64Load();
        laneSum(g);
        f.f64Add().f64Store();
      });
      for (let k = 0; k < 4; k++) {
        f.get(out).get(y).i32Add();
        f.get(pv[k]);
        emissionPair(k);
        f.f64x2Mul().get(l[k]).f64x2Mul().v128Store(16 * k);
      }
    });
    // Per-lane movement counts of this step, lane by lane.
    for (let k = 0; k < 8; k++) {
      const lane = (vs: number[]): void => void f.get(vs[k >> 1]).f64x2ExtractLane((k & 1) as 0 | 1);
      f.get(pDBin).get(nextStep4).i32Add().i32Load(4 * k).tee(bin).i32(0).i32GeS().when(() => {
        f.get(pStayByDistance).get(bin).i32(3).i32Shl().i32Add().tee(v).get(v).f64Load();
        lane(stays);
        f.f64Add().f64Store();
        f.get(pMoveByDistance).get(bin).i32(3).i32Shl().i32Add().tee(v).get(v).f64Load();
        lane(goes);
        f.f64Add().f64Store();
      });
      f.get(pHBin).get(nextStep4).i32Add().i32Load(4 * k).tee(bin).i32(0).i32GeS().when(() => {
        f.get(pHeadingCos).get(bin).i32(3).i32Shl().i32Add().tee(v).get(v).f64Load();
        lane(xc);
        f.f64Add().f64Store();
        f.get(pHeadingSin).get(bin).i32(3).i32Shl().i32Add().tee(v).get(v).f64Load();
        lane(xs);
        f.f64Add().f64Store();
      });
    }
    f.get(next).set(swap);
    f.get(out).set(next);
    f.get(swap).set(out);
  });
  f.get(next).get(pW).i32Ne().when(() => {
    f.forRange(i, () => f.i32(0), () => f.get(n), () => {
      f.get(i).i32(6).i32Shl().set(y);
      for (let k = 0; k < 4; k++) f.get(pW).get(y).i32Add().get(next).get(y).i32Add().v128Load(16 * k).v128Store(16 * k);
    });
  });
  return f;
}
