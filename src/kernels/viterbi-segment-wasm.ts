import { WasmFunction } from './wasm-function.js';

/**
 * `viterbiSegment` as a WebAssembly function, with back-pointers stored in `pointerBytes` bytes each
 * (1, 2 or 4: the narrowest integer that holds the cell count). The same recursion and the same
 * arithmetic, so the same scores and back-pointers:
 *
 *   δ_t(j) = log b_j(o_t) + max(δ_{t-1}(j) + log a_jj,  max_{i → j} δ_{t-1}(i) + log a_ij),
 *
 * ties to the lowest cell index (the dwell first; an equal score replaces the best only from a lower
 * index). Parameters (all i32; `p…` are byte offsets into the linear memory laid out by
 * `WasmViterbi`): `n`, `m` (readings), `t0`, `t1`, `pLogStart`, `pLogDwell`, `pInPtr`, `pInIdx`,
 * `pLogInProb`, `pLogEmit` ((m + 1) × n, the last row zeros for dropouts), `pObs` (i32 per step of the
 * whole run, −1 = dropout), `pDelta` (2n f64: δ_{t0-1} in the first half on entry, δ_{t1-1} there on
 * return) and `pBack` (rows of n back-pointers, row t - t0 for step t ≥ 1).
 *
 * Loop trick, and why: the maximum and its index are taken with `select` instead of a branch, so an
 * unpredictable comparison costs no mispredicted jump — the branch was most of the JavaScript kernel's
 * time — and addresses are plain byte offsets.
 */
export function viterbiSegmentWasm(pointerBytes: 1 | 2 | 4): WasmFunction {
  const f = new WasmFunction(Array<'i32'>(13).fill('i32'));
  const [n, m, t0, t1, pLogStart, pLogDwell, pInPtr, pInIdx, pLogInProb, pLogEmit, pObs, pDelta, pBack] = Array.from({ length: 13 }, (_, i) => i);
  const t = f.local('i32');
  const prev = f.local('i32');
  const cur = f.local('i32');
  const swap = f.local('i32');
  const e = f.local('i32');
  const j = f.local('i32');
  const p = f.local('i32');
  const end = f.local('i32');
  const i = f.local('i32');
  const bestI = f.local('i32');
  const take = f.local('i32');
  const backRow = f.local('i32');
  const cell = f.local('i32');
  const best = f.local('f64');
  const v = f.local('f64');

  f.get(pDelta).set(prev);
  f.get(pDelta).get(n).i32(3).i32Shl().i32Add().set(cur);
  f.forRange(t, () => f.get(t0), () => f.get(t1), () => {
    // Emission row of the reading at t (the row of zeros, m, for a dropout).
    f.get(m).get(pObs).get(t).i32(2).i32Shl().i32Add().i32Load().tee(e).get(e).i32(0).i32LtS().select();
    f.get(n).i32Mul().i32(3).i32Shl().get(pLogEmit).i32Add().set(e);
    f.get(t).i32(0).i32Eq().when(() => {
      f.forRange(j, () => f.i32(0), () => f.get(n), () => {
        f.get(j).i32(3).i32Shl().set(cell);
        f.get(cur).get(cell).i32Add();
        f.get(pLogStart).get(cell).i32Add().f64Load().get(e).get(cell).i32Add().f64Load().f64Add();
        f.f64Store();
      });
    });
    f.get(t).i32(0).i32Ne().when(() => {
      f.get(t).get(t0).i32Sub().get(n).i32Mul().i32(pointerBytes === 1 ? 0 : pointerBytes === 2 ? 1 : 2).i32Shl().get(pBack).i32Add().set(backRow);
      f.forRange(j, () => f.i32(0), () => f.get(n), () => {
        f.get(j).i32(3).i32Shl().set(cell);
        f.get(prev).get(cell).i32Add().f64Load().get(pLogDwell).get(cell).i32Add().f64Load().f64Add().set(best);
        f.get(j).set(bestI);
        f.get(pInPtr).get(j).i32(2).i32Shl().i32Add().tee(p).i32Load(4).set(end);
        f.forRange(p, () => f.get(p).i32Load(0), () => f.get(end), () => {
          f.get(pInIdx).get(p).i32(2).i32Shl().i32Add().i32Load().set(i);
          f.get(prev).get(i).i32(3).i32Shl().i32Add().f64Load().get(pLogInProb).get(p).i32(3).i32Shl().i32Add().f64Load().f64Add().set(v);
          // take = v > best || (v == best && i < bestI)
          f.get(v).get(best).f64Gt().get(v).get(best).f64Eq().get(i).get(bestI).i32LtS().i32And().i32Or().set(take);
          f.get(v).get(best).get(take).select().set(best);
          f.get(i).get(bestI).get(take).select().set(bestI);
        });
        f.get(backRow).get(j).i32(pointerBytes === 1 ? 0 : pointerBytes === 2 ? 1 : 2).i32Shl().i32Add().get(bestI).i32Store(pointerBytes);
        f.get(cur).get(cell).i32Add().get(best).get(e).get(cell).i32Add().f64Load().f64Add().f64Store();
      });
    });
    f.get(prev).set(swap);
    f.get(cur).set(prev);
    f.get(swap).set(cur);
  });
  // Leave δ_{t1-1} in the first half.
  f.get(prev).get(pDelta).i32Ne().when(() => {
    f.forRange(j, () => f.i32(0), () => f.get(n), () => {
      f.get(j).i32(3).i32Shl().set(cell);
      f.get(pDelta).get(cell).i32Add().get(prev).get(cell).i32Add().f64Load().f64Store();
    });
  });
  return f;
}
