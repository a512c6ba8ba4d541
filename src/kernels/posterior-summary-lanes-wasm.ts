import { WasmFunction } from './wasm-function.js';
import { log2LanesWasm } from './log2-lanes-wasm.js';

/** Parameter names of `posteriorSummaryLanesWasm`, in order (all i32). */
export const SUMMARY_PARAMS = [
  'n', 't0', 't1', 'dwell', 'outPtr', 'outIdx', 'outProb', 'rows', 'lens', 'table', 'scale', 'w', 'wSpare', 'gamma', 'path',
  'likelyCell', 'likelyP', 'pathP', 'entropy',
  'nZones', 'cellAreas', 'nLevels', 'zoneOf', 'levelOf', 'dx', 'dy', 'r2', 'originX', 'originY', 'work',
  'likelyZone', 'zoneP', 'meanLevel', 'meanX', 'meanY', 'spread',
] as const;

/**
 * `posteriorSummaryLanes` as a WebAssembly function (with the position summaries when `positions`): the
 * same recursion and the same arithmetic in the same order in every lane, so the same numbers, bit for
 * bit:
 *
 *   ŵ_t(j) = c_{t-1} b_j(o_t) β'_t(j),   β'_t(i) = a_ii ŵ_{t+1}(i) + Σ_{i → j} a_ij ŵ_{t+1}(j) + c_t [t = T_k-1],
 *   γ_t(i) = u_t(i) β'_t(i),   H_t = −Σ_{γ > 0} γ log2 γ.
 *
 * The log2 is `log2LanesWasm` (vectorised, the same numbers as `Math.log2`), taken on every lane and
 * masked where γ = 0, so the cell loop has no branch. The argmax of γ (first maximum), the most likely
 * area and the level of most mass are `pmax`/`bitselect` scans (the area scan skipped when `cellAreas`:
 * every area is one cell, area i = cell i, so the cell scan is the area scan); γ at each lane's path cell, the mean and
 * the spread are scalar per lane. Parameters: `SUMMARY_PARAMS` (byte offsets into the memory laid out
 * by `WasmDecodeLanes`; per-step outputs at `(t - t0) × 8 + k`).
 */
export function posteriorSummaryLanesWasm(positions: boolean): WasmFunction {
  const f = new WasmFunction(SUMMARY_PARAMS.map(() => 'i32' as const));
  const P = Object.fromEntries(SUMMARY_PARAMS.map((name, i) => [name, i])) as Record<(typeof SUMMARY_PARAMS)[number], number>;
  const t = f.local('i32');
  const stride = f.local('i32');
  const row = f.local('i32');
  const rowStep = f.local('i32');
  const ob = f.local('i32');
  const next = f.local('i32');
  const out = f.local('i32');
  const swap = f.local('i32');
  const i = f.local('i32');
  const q = f.local('i32');
  const end = f.local('i32');
  const x = f.local('i32');
  const y = f.local('i32');
  const v = f.local('i32');
  const cell = f.local('i32');
  const wz = f.local('i32');
  const nWork = f.local('i32');
  const e = Array.from({ length: 8 }, () => f.local('i32'));
  const z = Array.from({ length: 4 }, () => f.local('v128'));
  const pv = Array.from({ length: 4 }, () => f.local('v128'));
  const d = Array.from({ length: 4 }, () => f.local('v128'));
  const l = Array.from({ length: 4 }, () => f.local('v128'));
  const g = Array.from({ length: 4 }, () => f.local('v128'));
  const best = Array.from({ length: 4 }, () => f.local('v128'));
  const bestI = Array.from({ length: 4 }, () => f.local('v128'));
  const h = Array.from({ length: 4 }, () => f.local('v128'));
  const b = f.local('v128');
  const splat = f.local('v128');
  const idx = f.local('v128');
  const mask = f.local('v128');
  const lg = f.local('v128');
  const zk = f.local('f64');
  const mass = f.local('f64');
  const mx = f.local('f64');
  const my = f.local('f64');
  const variance = f.local('f64');
  const lev = f.local('i32');
  const log2 = log2LanesWasm(f);

  const emissionPair = (k: number): void => {
    f.get(e[2 * k]).get(cell).i32Add().f64Load().f64x2Splat();
    f.get(e[2 * k + 1]).get(cell).i32Add().f64Load().f64x2ReplaceLane(1);
  };
  /** Argmax scan step: value vectors `vals` at index `idx` against `best`/`bestI` (first maximum kept). */
  const scan = (vals: number[]): void => {
    for (let k = 0; k < 4; k++) {
      f.get(best[k]).get(vals[k]).f64x2Lt().set(mask);
      f.get(best[k]).get(vals[k]).f64x2Pmax().set(best[k]);
      f.get(idx).get(bestI[k]).get(mask).v128Bitselect().set(bestI[k]);
    }
  };
  const resetScan = (): void => {
    for (let k = 0; k < 4; k++) {
      f.v128ConstF64(-1).set(best[k]);
      f.i32(0).i32x4Splat().set(bestI[k]);
    }
  };
  /** Adds vector `val(k)` into the 8 lanes at byte address `addr` (a local). */
  const addInto = (addr: number, val: (k: number) => void): void => {
    for (let k = 0; k < 4; k++) {
      f.get(addr).get(addr).v128Load(16 * k);
      val(k);
      f.f64x2Add().v128Store(16 * k);
    }
  };

  f.get(P.n).i32(6).i32Shl().set(stride);
  f.get(P.w).set(next);
  f.get(P.wSpare).set(out);
  if (positions) f.get(P.nZones).get(P.nLevels).i32(2).i32Shl().i32Add().set(nWork);
  f.forDown(t, () => f.get(P.t1).i32(1).i32Sub(), () => f.get(P.t0), () => {
    f.get(P.table).get(t).get(P.t0).i32Sub().i32(1).i32Add().get(stride).i32Mul().i32Add().set(row);
    f.get(t).i32(6).i32Shl().set(rowStep);
    f.get(t).get(P.t0).i32Sub().i32(6).i32Shl().set(ob);
    for (let k = 0; k < 8; k++) f.get(P.rows).get(t).i32(5).i32Shl().i32Add().i32Load(4 * k).set(e[k]);
    for (let k = 0; k < 8; k++) {
      f.get(P.scale).get(rowStep).i32Add().f64Load(8 * k).f64(0);
      f.get(t).get(P.lens).i32Load(4 * k).i32(1).i32Sub().i32Eq().select().set(zk);
      if (k % 2 === 0) f.get(zk).f64x2Splat().set(z[k >> 1]);
      else f.get(z[k >> 1]).get(zk).f64x2ReplaceLane(1).set(z[k >> 1]);
    }
    for (let k = 0; k < 4; k++) f.f64(1).f64x2Splat().set(pv[k]);
    f.get(t).i32(0).i32Ne().when(() => {
      for (let k = 0; k < 4; k++) f.get(P.scale).get(rowStep).i32Add().i32(64).i32Sub().v128Load(16 * k).set(pv[k]);
    });
    resetScan();
    for (let k = 0; k < 4; k++) f.f64(0).f64x2Splat().set(h[k]);
    if (positions) {
      f.forRange(i, () => f.get(P.nZones).i32(0).get(P.cellAreas).select(), () => f.get(nWork), () => {
        f.get(P.work).get(i).i32(6).i32Shl().i32Add().set(x);
        for (let k = 0; k < 4; k++) f.get(x).f64(0).f64x2Splat().v128Store(16 * k);
      });
    }

    f.forRange(i, () => f.i32(0), () => f.get(P.n), () => {
      f.get(i).i32(3).i32Shl().set(cell);
      f.get(row).get(i).i32(6).i32Shl().i32Add().set(x);
      f.get(i).i32(6).i32Shl().set(y);
      f.get(P.dwell).get(cell).i32Add().f64Load().f64x2Splat().set(splat);
      for (let k = 0; k < 4; k++) f.get(splat).get(next).get(y).i32Add().v128Load(16 * k).f64x2Mul().set(d[k]);
      for (let k = 0; k < 4; k++) f.f64(0).f64x2Splat().set(l[k]);
      f.get(P.outPtr).get(i).i32(2).i32Shl().i32Add().tee(v).i32Load(4).set(end);
      f.forRange(q, () => f.get(v).i32Load(0), () => f.get(end), () => {
        f.get(next).get(P.outIdx).get(q).i32(2).i32Shl().i32Add().i32Load().i32(6).i32Shl().i32Add().set(v);
        f.get(P.outProb).get(q).i32(3).i32Shl().i32Add().f64Load().f64x2Splat().set(splat);
        for (let k = 0; k < 4; k++) f.get(l[k]).get(splat).get(v).v128Load(16 * k).f64x2Mul().f64x2Add().set(l[k]);
      });
      f.get(i).i32x4Splat().set(idx);
      for (let k = 0; k < 4; k++) {
        f.get(d[k]).get(l[k]).f64x2Add().get(z[k]).f64x2Add().set(b);
        f.get(x).v128Load(16 * k).get(b).f64x2Mul().set(g[k]);
        // ŵ_t = (c_{t-1} b(o_t)) β'_t
        f.get(out).get(y).i32Add();
        f.get(pv[k]);
        emissionPair(k);
        f.f64x2Mul().get(b).f64x2Mul().v128Store(16 * k);
        f.get(P.gamma).get(y).i32Add().get(g[k]).v128Store(16 * k);
        // h −= γ log2 γ where γ > 0.
        log2(g[k], lg);
        f.get(h[k]).get(g[k]).get(lg).f64x2Mul().f64(0).f64x2Splat().get(g[k]).f64(0).f64x2Splat().f64x2Gt().v128Bitselect().f64x2Sub().set(h[k]);
      }
      scan(g);
      if (positions) {
        f.get(P.cellAreas).i32(0).i32Eq().when(() => {
          f.get(P.work).get(P.zoneOf).get(i).i32(2).i32Shl().i32Add().i32Load().i32(6).i32Shl().i32Add().set(wz);
          addInto(wz, (k) => f.get(g[k]));
        });
        f.get(P.work).get(P.nZones).get(P.levelOf).get(i).i32(2).i32Shl().i32Add().i32Load().i32(2).i32Shl().i32Add().i32(6).i32Shl().i32Add().set(wz);
        addInto(wz, (k) => f.get(g[k]));
        f.get(P.dx).get(cell).i32Add().f64Load().f64x2Splat().set(splat);
        for (let k = 0; k < 4; k++) f.get(wz).get(wz).v128Load(64 + 16 * k).get(g[k]).get(splat).f64x2Mul().f64x2Add().v128Store(64 + 16 * k);
        f.get(P.dy).get(cell).i32Add().f64Load().f64x2Splat().set(splat);
        for (let k = 0; k < 4; k++) f.get(wz).get(wz).v128Load(128 + 16 * k).get(g[k]).get(splat).f64x2Mul().f64x2Add().v128Store(128 + 16 * k);
        f.get(P.r2).get(cell).i32Add().f64Load().f64x2Splat().set(splat);
        for (let k = 0; k < 4; k++) f.get(wz).get(wz).v128Load(192 + 16 * k).get(g[k]).get(splat).f64x2Mul().f64x2Add().v128Store(192 + 16 * k);
      }
    });

    // Per lane: argmax and its value, entropy, γ at the path cell (NaN for none).
    for (let k = 0; k < 8; k++) {
      f.get(P.likelyCell).get(ob).i32(1).i32ShrU().i32Add().get(bestI[k >> 1]).i32x4ExtractLane(((k & 1) * 2) as 0 | 2).i32Store(4, 4 * k);
    }
    for (let k = 0; k < 4; k++) {
      f.get(P.likelyP).get(ob).i32Add().get(best[k]).v128Store(16 * k);
      f.get(P.entropy).get(ob).i32Add().get(h[k]).v128Store(16 * k);
    }
    for (let k = 0; k < 8; k++) {
      f.get(P.path).get(ob).i32(1).i32ShrU().i32Add().i32Load(4 * k).set(v);
      f.get(P.pathP).get(ob).i32Add();
      f.get(P.gamma).get(v).i32(6).i32Shl().i32Add().f64Load(8 * k).f64(NaN).get(v).i32(0).i32GeS().select();
      f.f64Store(8 * k);
    }
    if (positions) {
      // Most likely area (first maximum) and the level of most mass, as scans over the work rows. When
      // every area is one cell, numbered as the cells (a floor without zones), an area's mass is 0 + γ = γ
      // and the area scan is the cell scan: its result is taken as it stands.
      f.get(P.cellAreas).i32(0).i32Eq().when(() => {
        resetScan();
        f.forRange(i, () => f.i32(0), () => f.get(P.nZones), () => {
          f.get(i).i32x4Splat().set(idx);
          f.get(P.work).get(i).i32(6).i32Shl().i32Add().set(x);
          for (let k = 0; k < 4; k++) f.get(x).v128Load(16 * k).set(g[k]);
          scan(g);
        });
      });
      for (let k = 0; k < 8; k++) {
        f.get(P.likelyZone).get(ob).i32(1).i32ShrU().i32Add().get(bestI[k >> 1]).i32x4ExtractLane(((k & 1) * 2) as 0 | 2).i32Store(4, 4 * k);
      }
      for (let k = 0; k < 4; k++) f.get(P.zoneP).get(ob).i32Add().get(best[k]).v128Store(16 * k);
      resetScan();
      f.forRange(i, () => f.i32(0), () => f.get(P.nLevels), () => {
        f.get(i).i32x4Splat().set(idx);
        f.get(P.work).get(P.nZones).get(i).i32(2).i32Shl().i32Add().i32(6).i32Shl().i32Add().set(x);
        for (let k = 0; k < 4; k++) f.get(x).v128Load(16 * k).set(g[k]);
        scan(g);
      });
      for (let k = 0; k < 8; k++) {
        f.get(bestI[k >> 1]).i32x4ExtractLane(((k & 1) * 2) as 0 | 2).set(lev);
        f.get(P.meanLevel).get(ob).i32(1).i32ShrU().i32Add().get(lev).i32Store(4, 4 * k);
        f.get(best[k >> 1]).f64x2ExtractLane((k & 1) as 0 | 1).set(mass);
        f.get(P.work).get(P.nZones).get(lev).i32(2).i32Shl().i32Add().i32(6).i32Shl().i32Add().set(x);
        f.get(x).f64Load(64 + 8 * k).get(mass).f64Div().set(mx);
        f.get(x).f64Load(128 + 8 * k).get(mass).f64Div().set(my);
        f.get(x).f64Load(192 + 8 * k).get(mass).f64Div().get(mx).get(mx).f64Mul().f64Sub().get(my).get(my).f64Mul().f64Sub().set(variance);
        f.get(P.meanX).get(ob).i32Add().get(P.originX).get(lev).i32(3).i32Shl().i32Add().f64Load().get(mx).f64Add().f64Store(8 * k);
        f.get(P.meanY).get(ob).i32Add().get(P.originY).get(lev).i32(3).i32Shl().i32Add().f64Load().get(my).f64Add().f64Store(8 * k);
        f.get(P.spread).get(ob).i32Add().get(variance).f64(0).get(variance).f64(0).f64Gt().select().f64Sqrt().f64Store(8 * k);
      }
    }
    f.get(next).set(swap);
    f.get(out).set(next);
    f.get(swap).set(out);
  });
  // Leave ŵ_{t0} in pW.
  f.get(next).get(P.w).i32Ne().when(() => {
    f.forRange(i, () => f.i32(0), () => f.get(P.n), () => {
      f.get(i).i32(6).i32Shl().set(y);
      for (let k = 0; k < 4; k++) f.get(P.w).get(y).i32Add().get(next).get(y).i32Add().v128Load(16 * k).v128Store(16 * k);
    });
  });
  return f;
}
