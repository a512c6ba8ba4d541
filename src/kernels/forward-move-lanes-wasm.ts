import { WasmFunction } from './wasm-function.js';

/**
 * `forwardMoveLanes` as a WebAssembly function: the scaled forward recursion with per-step transitions
 * from odometry (Rabiner 1989, with A_t of `move-chain.ts`), the same arithmetic in the same order in
 * every lane as the JavaScript lanes (so the same numbers, bit for bit), over the steps `t0 … t1-1`:
 *
 *   u_0(j) = π_j b_j(o_0),
 *   u_t(j) = b_j(o_t) c_{t-1} [s_j u_{t-1}(j) + Σ_{i → j} (1 − s_i) u_{t-1}(i) split_{h_t}(i → j)].
 *
 * Parameters (all i32; `p…` are byte offsets into the linear memory laid out by `WasmMoveLaneKernels`):
 * `n`, `t0`, `t1`, `pStart`, `pDwell`, `pInPtr`, `pInIdx`, `pRows`, `pTable`, `pScale`, `pSums` as in
 * `forwardLanesWasm`; then, per cell, `pElig` (16 bytes: all ones where the cell is eligible, else
 * zeros); per step and lane (entry t for the transition into step t) `pStay` (f64: the staying
 * probability of the lane's distance bin, 0 when unknown), `pKnown` (8 bytes: all ones where the
 * distance is known), `pSplitAt` (i32: byte address of the lane's row of `splitIn` — its heading bin's,
 * or the plain row); `pWork` (2 × 8n f64 scratch: each lane's s_i, then (1 − s_i) u_{t-1}(i)).
 *
 * Loop tricks: as `forwardLanesWasm` (eight lanes as four 128-bit vectors, byte addressing); the
 * staying probability is chosen per cell with a lane mask (`v128.bitselect`), not a branch; the link
 * loop gathers each lane's split from its own heading row (two scalar loads per vector) — the price
 * of per-lane transitions — and multiplies it with the moving mass made once per cell.
 */
export function forwardMoveLanesWasm(): WasmFunction {
  const f = new WasmFunction(Array<'i32'>(16).fill('i32'));
  const [n, t0, t1, pStart, pDwell, pInPtr, pInIdx, pRows, pTable, pScale, pSums, pElig, pStay, pKnown, pSplitAt, pWork] = Array.from({ length: 16 }, (_, i) => i);
  const t = f.local('i32');
  const stride = f.local('i32');
  const cur = f.local('i32');
  const prev = f.local('i32');
  const rowStep = f.local('i32');
  const j = f.local('i32');
  const p = f.local('i32');
  const end = f.local('i32');
  const x = f.local('i32');
  const y = f.local('i32');
  const cell = f.local('i32');
  const mov = f.local('i32'); // byte address of the moving masses in the work area
  const p8 = f.local('i32');
  const e = Array.from({ length: 8 }, () => f.local('i32'));
  const si = Array.from({ length: 8 }, () => f.local('i32'));
  const c = Array.from({ length: 4 }, () => f.local('v128'));
  const a = Array.from({ length: 4 }, () => f.local('v128'));
  const s = Array.from({ length: 4 }, () => f.local('v128'));
  const sd = Array.from({ length: 4 }, () => f.local('v128'));
  const kn = Array.from({ length: 4 }, () => f.local('v128'));
  const splat = f.local('v128');
  const mask = f.local('v128');
  const st = f.local('v128');
  const one = f.local('v128');
  const v = f.local('v128');
  const sum = f.local('f64');

  const emissionPair = (q: number): void => {
    f.get(e[2 * q]).get(cell).i32Add().f64Load().f64x2Splat();
    f.get(e[2 * q + 1]).get(cell).i32Add().f64Load().f64x2ReplaceLane(1);
  };

  f.get(n).i32(6).i32Shl().set(stride);
  f.get(pWork).get(stride).i32Add().set(mov);
  f.f64(1).f64x2Splat().set(one);
  f.forRange(t, () => f.get(t0), () => f.get(t1), () => {
    f.get(pTable).get(t).get(t0).i32Sub().i32(1).i32Add().get(stride).i32Mul().i32Add().tee(cur).get(stride).i32Sub().set(prev);
    f.get(t).i32(6).i32Shl().set(rowStep);
    for (let k = 0; k < 8; k++) f.get(pRows).get(t).i32(5).i32Shl().i32Add().i32Load(4 * k).set(e[k]);
    for (let q = 0; q < 4; q++) f.f64(0).f64x2Splat().set(s[q]);

    f.get(t).i32(0).i32Eq().when(() => {
      f.forRange(j, () => f.i32(0), () => f.get(n), () => {
        f.get(j).i32(3).i32Shl().set(cell);
        f.get(pStart).get(cell).i32Add().f64Load().f64x2Splat().set(splat);
        for (let q = 0; q < 4; q++) {
          f.get(splat);
          emissionPair(q);
          f.f64x2Mul().set(v);
          f.get(cur).get(j).i32(6).i32Shl().i32Add().get(v).v128Store(16 * q);
          f.get(s[q]).get(v).f64x2Add().set(s[q]);
        }
      });
    });

    f.get(t).i32(0).i32Ne().when(() => {
      for (let q = 0; q < 4; q++) {
        f.get(pScale).get(rowStep).i32Add().i32(64).i32Sub().v128Load(16 * q).set(c[q]);
        f.get(pStay).get(rowStep).i32Add().v128Load(16 * q).set(sd[q]);
        f.get(pKnown).get(rowStep).i32Add().v128Load(16 * q).set(kn[q]);
      }
      for (let k = 0; k < 8; k++) f.get(pSplitAt).get(t).i32(5).i32Shl().i32Add().i32Load(4 * k).set(si[k]);
      // Each lane's staying probability s_i and moving mass (1 − s_i) u_{t-1}(i).
      f.forRange(j, () => f.i32(0), () => f.get(n), () => {
        f.get(j).i32(6).i32Shl().set(y);
        f.get(prev).get(y).i32Add().set(x);
        f.get(pDwell).get(j).i32(3).i32Shl().i32Add().f64Load().f64x2Splat().set(splat);
        f.get(pElig).get(j).i32(4).i32Shl().i32Add().v128Load().set(mask);
        for (let q = 0; q < 4; q++) {
          f.get(sd[q]).get(splat).get(kn[q]).get(mask).v128And().v128Bitselect().set(st);
          f.get(pWork).get(y).i32Add().get(st).v128Store(16 * q);
          f.get(mov).get(y).i32Add();
          f.get(one).get(st).f64x2Sub().get(x).v128Load(16 * q).f64x2Mul();
          f.v128Store(16 * q);
        }
      });
      f.forRange(j, () => f.i32(0), () => f.get(n), () => {
        f.get(j).i32(3).i32Shl().set(cell);
        f.get(j).i32(6).i32Shl().set(y);
        f.get(prev).get(y).i32Add().set(x);
        for (let q = 0; q < 4; q++) f.get(x).v128Load(16 * q).get(pWork).get(y).i32Add().v128Load(16 * q).f64x2Mul().set(a[q]);
        f.get(pInPtr).get(j).i32(2).i32Shl().i32Add().tee(y).i32Load(4).set(end);
        f.forRange(p, () => f.get(y).i32Load(0), () => f.get(end), () => {
          f.get(mov).get(pInIdx).get(p).i32(2).i32Shl().i32Add().i32Load().i32(6).i32Shl().i32Add().set(y);
          f.get(p).i32(3).i32Shl().set(p8);
          for (let q = 0; q < 4; q++) {
            f.get(a[q]).get(y).v128Load(16 * q);
            f.get(si[2 * q]).get(p8).i32Add().f64Load().f64x2Splat();
            f.get(si[2 * q + 1]).get(p8).i32Add().f64Load().f64x2ReplaceLane(1);
            f.f64x2Mul().f64x2Add().set(a[q]);
          }
        });
        for (let q = 0; q < 4; q++) {
          f.get(a[q]).get(c[q]).f64x2Mul();
          emissionPair(q);
          f.f64x2Mul().set(v);
          f.get(cur).get(j).i32(6).i32Shl().i32Add().get(v).v128Store(16 * q);
          f.get(s[q]).get(v).f64x2Add().set(s[q]);
        }
      });
    });

    for (let k = 0; k < 8; k++) {
      f.get(s[k >> 1]).f64x2ExtractLane((k & 1) as 0 | 1).set(sum);
      f.get(pSums).get(rowStep).i32Add().get(sum).f64Store(8 * k);
      f.get(pScale).get(rowStep).i32Add();
      f.f64(1).get(sum).f64Div().f64(1).get(sum).f64(0).f64Gt().select();
      f.f64Store(8 * k);
    }
  });
  return f;
}
