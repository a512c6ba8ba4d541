import { WasmFunction } from './wasm-function.js';

/**
 * `forwardLanes` as a WebAssembly function: the same recursion, the same arithmetic in the same order in
 * every lane (so the same numbers, bit for bit), over the steps `t0 … t1-1` of a segment:
 *
 *   u_0(j) = π_j b_j(o_0),   u_t(j) = b_j(o_t) c_{t-1} [a_jj u_{t-1}(j) + Σ_{i → j} a_ij u_{t-1}(i)].
 *
 * Parameters (all i32; `p…` are byte offsets into the linear memory laid out by `LaneMachine`):
 * `n` cells, `t0`, `t1`, `pStart` (n f64), `pDwell` (n f64), `pInPtr` (n+1 i32), `pInIdx` (i32 per link),
 * `pInProb` (f64 per link), `pRows` (i32 per step and lane: the byte address of the lane's emission row
 * for that step), `pTable` (rows of n × 8 f64; row t-t0+1 receives u_t, row 0 holds u_{t0-1}), `pScale`
 * (f64 per step and lane: receives c_t = 1 / Σ_j u_t(j), or 1 where that sum is not positive; c_{t0-1}
 * must be there), `pSums` (f64 per step and lane: receives Σ_j u_t(j), from which the caller adds the
 * log-likelihood, as `forwardLanes` does).
 *
 * Loop tricks, and why: the eight lanes of a cell are four 128-bit vectors of two float64, so each
 * link's index and probability are loaded once and serve eight runs in four multiply-adds; addresses
 * are plain byte offsets (no bounds or overflow checks, no map checks: the JIT's overhead on typed
 * arrays was most of the cost of the JavaScript kernel); the dwell is a contiguous term outside the
 * link loop; normalisation is deferred to the next step as in `forwardLanes`.
 */
export function forwardLanesWasm(): WasmFunction {
  const f = new WasmFunction(Array<'i32'>(12).fill('i32'));
  const [n, t0, t1, pStart, pDwell, pInPtr, pInIdx, pInProb, pRows, pTable, pScale, pSums] = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11];
  const t = f.local('i32');
  const stride = f.local('i32'); // bytes per table row: n × 8 lanes × 8 bytes
  const cur = f.local('i32');
  const prev = f.local('i32');
  const rowStep = f.local('i32'); // byte offset of step t's entries in the per-step, per-lane arrays
  const j = f.local('i32');
  const p = f.local('i32');
  const end = f.local('i32');
  const x = f.local('i32');
  const y = f.local('i32');
  const cell = f.local('i32'); // j × 8: byte offset of cell j in an f64 vector of n
  const e = Array.from({ length: 8 }, () => f.local('i32'));
  const c = Array.from({ length: 4 }, () => f.local('v128'));
  const a = Array.from({ length: 4 }, () => f.local('v128'));
  const s = Array.from({ length: 4 }, () => f.local('v128'));
  const splat = f.local('v128');
  const v = f.local('v128');
  const sum = f.local('f64');

  /** Pushes the emission probabilities of cell `cell` for lanes 2q and 2q+1 as one vector. */
  const emissionPair = (q: number): void => {
    f.get(e[2 * q]).get(cell).i32Add().f64Load().f64x2Splat();
    f.get(e[2 * q + 1]).get(cell).i32Add().f64Load().f64x2ReplaceLane(1);
  };

  f.get(n).i32(6).i32Shl().set(stride);
  f.forRange(t, () => f.get(t0), () => f.get(t1), () => {
    f.get(pTable).get(t).get(t0).i32Sub().i32(1).i32Add().get(stride).i32Mul().i32Add().tee(cur).get(stride).i32Sub().set(prev);
    f.get(t).i32(6).i32Shl().set(rowStep);
    for (let k = 0; k < 8; k++) f.get(pRows).get(t).i32(5).i32Shl().i32Add().i32Load(4 * k).set(e[k]);
    for (let q = 0; q < 4; q++) f.f64(0).f64x2Splat().set(s[q]);

    // t = 0: u_0(j) = π_j b_j(o_0).
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

    // t > 0: gather over the dwell and the links into each cell, then scale by c_{t-1} and emit.
    f.get(t).i32(0).i32Ne().when(() => {
      for (let q = 0; q < 4; q++) f.get(pScale).get(rowStep).i32Add().i32(64).i32Sub().v128Load(16 * q).set(c[q]);
      f.forRange(j, () => f.i32(0), () => f.get(n), () => {
        f.get(j).i32(3).i32Shl().set(cell);
        f.get(prev).get(j).i32(6).i32Shl().i32Add().set(x);
        f.get(pDwell).get(cell).i32Add().f64Load().f64x2Splat().set(splat);
        for (let q = 0; q < 4; q++) f.get(x).v128Load(16 * q).get(splat).f64x2Mul().set(a[q]);
        f.get(pInPtr).get(j).i32(2).i32Shl().i32Add().tee(y).i32Load(4).set(end);
        f.forRange(p, () => f.get(y).i32Load(0), () => f.get(end), () => {
          f.get(prev).get(pInIdx).get(p).i32(2).i32Shl().i32Add().i32Load().i32(6).i32Shl().i32Add().set(y);
          f.get(pInProb).get(p).i32(3).i32Shl().i32Add().f64Load().f64x2Splat().set(splat);
          for (let q = 0; q < 4; q++) f.get(a[q]).get(y).v128Load(16 * q).get(splat).f64x2Mul().f64x2Add().set(a[q]);
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

    // Σ_j u_t(j) and c_t for every lane (c = 1 where the sum is not positive, as in `forwardLanes`).
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
