import { WasmFunction } from './wasm-function.js';

/**
 * `viterbiLanes` as a WebAssembly function, back-pointers stored in `pointerBytes` bytes (1, 2 or 4):
 * the same candidates visited in the same ascending cell order (links from cells below j, the dwell,
 * links from cells above j), a candidate replacing the best only when strictly greater, so the same
 * scores and back-pointers, bit for bit:
 *
 *   δ_t(j) = log b_j(o_t) + max(δ_{t-1}(j) + log a_jj,  max_{i → j} δ_{t-1}(i) + log a_ij).
 *
 * Parameters (all i32; `p…` are byte offsets into the memory laid out by `WasmDecodeLanes`): `n`, `t0`,
 * `t1`, `pLogStart`, `pLogDwell`, `pInPtr`, `pInIdx`, `pInSplit`, `pLogInProb`, `pRows` (byte address of
 * each step's and lane's emission row in the probability table), `logShift` (bytes from that table to
 * the log table), `pLens` (8 i32), `pDelta` (2 × n × 8 f64), `pBack` (rows of n × 8 back-pointers, row
 * t - t0 for step t ≥ 1), `pLast` (n × 8 f64: δ at each lane's last step).
 *
 * Loop tricks, and why: the eight lanes are four vectors of two float64, so each link's index and log
 * probability serve eight runs; the maximum is `f64x2.pmax` (best < v ? v : best, the scalar rule
 * exactly) and its index a `v128.bitselect` on the same comparison, with no branch to mispredict; the
 * index is kept as a 32-bit integer in both halves of each 64-bit lane, so that the 64-bit mask of the
 * float comparison selects it whole.
 */
export function viterbiLanesWasm(pointerBytes: 1 | 2 | 4): WasmFunction {
  const f = new WasmFunction(Array<'i32'>(15).fill('i32'));
  const [n, t0, t1, pLogStart, pLogDwell, pInPtr, pInIdx, pInSplit, pLogInProb, pRows, logShift, pLens, pDelta, pBack, pLast] = Array.from({ length: 15 }, (_, i) => i);
  const t = f.local('i32');
  const half = f.local('i32');
  const prev = f.local('i32');
  const cur = f.local('i32');
  const swap = f.local('i32');
  const j = f.local('i32');
  const p = f.local('i32');
  const split = f.local('i32');
  const end = f.local('i32');
  const y = f.local('i32');
  const cell = f.local('i32');
  const backRow = f.local('i32');
  const kk = f.local('i32');
  const e = Array.from({ length: 8 }, () => f.local('i32'));
  const best = Array.from({ length: 4 }, () => f.local('v128'));
  const bestI = Array.from({ length: 4 }, () => f.local('v128'));
  const v = f.local('v128');
  const mask = f.local('v128');
  const splat = f.local('v128');
  const idx = f.local('v128');
  const shift = pointerBytes === 1 ? 0 : pointerBytes === 2 ? 1 : 2;

  /** Pushes log b(o_t) of cell `cell` for lanes 2q and 2q+1 as one vector. */
  const emissionPair = (q: number): void => {
    f.get(e[2 * q]).get(cell).i32Add().f64Load().f64x2Splat();
    f.get(e[2 * q + 1]).get(cell).i32Add().f64Load().f64x2ReplaceLane(1);
  };
  /** One candidate: δ_{t-1} at byte address `y` (8 lanes) plus `splat`, index `idx`. */
  const candidate = (): void => {
    for (let q = 0; q < 4; q++) {
      f.get(y).v128Load(16 * q).get(splat).f64x2Add().set(v);
      f.get(best[q]).get(v).f64x2Lt().set(mask);
      f.get(best[q]).get(v).f64x2Pmax().set(best[q]);
      f.get(idx).get(bestI[q]).get(mask).v128Bitselect().set(bestI[q]);
    }
  };
  /** Links p … limit-1 into cell j. */
  const links = (limit: number): void => {
    f.forRange(p, () => f.get(p), () => f.get(limit), () => {
      f.get(pInIdx).get(p).i32(2).i32Shl().i32Add().i32Load().tee(y).i32x4Splat().set(idx);
      f.get(prev).get(y).i32(6).i32Shl().i32Add().set(y);
      f.get(pLogInProb).get(p).i32(3).i32Shl().i32Add().f64Load().f64x2Splat().set(splat);
      candidate();
    });
  };

  f.get(n).i32(6).i32Shl().set(half);
  f.get(pDelta).set(prev);
  f.get(pDelta).get(half).i32Add().set(cur);
  f.forRange(t, () => f.get(t0), () => f.get(t1), () => {
    for (let k = 0; k < 8; k++) f.get(pRows).get(t).i32(5).i32Shl().i32Add().i32Load(4 * k).get(logShift).i32Add().set(e[k]);
    f.get(t).i32(0).i32Eq().when(() => {
      f.forRange(j, () => f.i32(0), () => f.get(n), () => {
        f.get(j).i32(3).i32Shl().set(cell);
        f.get(pLogStart).get(cell).i32Add().f64Load().f64x2Splat().set(splat);
        for (let q = 0; q < 4; q++) {
          f.get(cur).get(j).i32(6).i32Shl().i32Add();
          f.get(splat);
          emissionPair(q);
          f.f64x2Add().v128Store(16 * q);
        }
      });
    });
    f.get(t).i32(0).i32Ne().when(() => {
      f.get(t).get(t0).i32Sub().get(n).i32Mul().i32(3 + shift).i32Shl().get(pBack).i32Add().set(backRow);
      f.forRange(j, () => f.i32(0), () => f.get(n), () => {
        f.get(j).i32(3).i32Shl().set(cell);
        f.get(pInPtr).get(j).i32(2).i32Shl().i32Add().tee(y).i32Load(4).set(end);
        f.get(y).i32Load(0).set(p);
        f.get(pInSplit).get(j).i32(2).i32Shl().i32Add().i32Load().set(split);
        // best = −∞ with the index of the first candidate (the lowest link source, or j).
        f.get(pInIdx).get(p).i32(2).i32Shl().i32Add().i32Load().get(j).get(p).get(split).i32LtS().select().i32x4Splat().set(idx);
        for (let q = 0; q < 4; q++) {
          f.v128ConstF64(-Infinity).set(best[q]);
          f.get(idx).set(bestI[q]);
        }
        links(split);
        f.get(j).i32x4Splat().set(idx);
        f.get(prev).get(j).i32(6).i32Shl().i32Add().set(y);
        f.get(pLogDwell).get(cell).i32Add().f64Load().f64x2Splat().set(splat);
        candidate();
        f.get(split).set(p);
        links(end);
        for (let k = 0; k < 8; k++) {
          f.get(backRow).get(j).i32(3).i32Shl().i32(k).i32Add().i32(shift).i32Shl().i32Add();
          f.get(bestI[k >> 1]).i32x4ExtractLane(((k & 1) * 2) as 0 | 2).i32Store(pointerBytes);
        }
        for (let q = 0; q < 4; q++) {
          f.get(cur).get(j).i32(6).i32Shl().i32Add();
          f.get(best[q]);
          emissionPair(q);
          f.f64x2Add().v128Store(16 * q);
        }
      });
    });
    // δ at the last step of each lane that ends here.
    for (let k = 0; k < 8; k++) {
      f.get(t).get(pLens).i32Load(4 * k).i32(1).i32Sub().i32Eq().when(() => {
        f.forRange(j, () => f.i32(0), () => f.get(n), () => {
          f.get(j).i32(6).i32Shl().set(kk);
          f.get(pLast).get(kk).i32Add().get(cur).get(kk).i32Add().f64Load(8 * k).f64Store(8 * k);
        });
      });
    }
    f.get(prev).set(swap);
    f.get(cur).set(prev);
    f.get(swap).set(cur);
  });
  // Leave δ_{t1-1} in the first half.
  f.get(prev).get(pDelta).i32Ne().when(() => {
    f.forRange(j, () => f.i32(0), () => f.get(n), () => {
      f.get(j).i32(6).i32Shl().set(kk);
      for (let q = 0; q < 4; q++) f.get(pDelta).get(kk).i32Add().get(prev).get(kk).i32Add().v128Load(16 * q).v128Store(16 * q);
    });
  });
  return f;
}
