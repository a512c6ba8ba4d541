import { WasmFunction } from './wasm-function.js';

/**
 * `viterbiMoveSegment` as a WebAssembly function, with back-pointers stored in `pointerBytes` bytes
 * each (1, 2 or 4). The same recursion (Viterbi 1967, in logs, per-step transitions of `move-chain.ts`)
 * and the same arithmetic, so the same scores and back-pointers:
 *
 *   δ_t(j) = log b_j(o_t) + max(δ_{t-1}(j) + log s_j,t,  max_{i → j} δ_{t-1}(i) + log(1 − s_i,t) + log split_{h_t}(i → j)),
 *
 * ties to the lowest cell index (the dwell first). Parameters (all i32; `p…` are byte offsets into the
 * memory laid out by `WasmMoveViterbi`): `n`, `m`, `t0`, `t1`, `nLinks`, `nHeadingBins`, `pLogStart`,
 * `pLogDwell`, `pLogDwellGo` (log(1 − a_ii)), `pLogStay`, `pLogGo` (per distance bin), `pElig` (i32 per
 * cell: 1 where the dwell follows the distance), `pLogSplitIn` ((nHeadingBins + 1) × nLinks, `in`
 * order), `pInPtr`, `pInIdx`, `pLogEmit` ((m + 1) × n, the last row zeros), `pObs`, `pDBin`, `pHBin`
 * (i32 per step of the whole run, −1 = unknown), `pDelta` (2n f64, as in `viterbiSegmentWasm`),
 * `pBack` (rows of n back-pointers, row t − t0 for step t ≥ 1) and `pWork` (2n f64 scratch).
 *
 * Loop tricks: the maximum and its index by `select` (no unpredictable branch), as in
 * `viterbiSegmentWasm`; each source cell's staying and moving scores are made once per step, so the
 * link loop costs one load of the split's log, one add and one comparison per link.
 */
export function viterbiMoveSegmentWasm(pointerBytes: 1 | 2 | 4): WasmFunction {
  const nParams = 22;
  const f = new WasmFunction(Array<'i32'>(nParams).fill('i32'));
  const [n, m, t0, t1, nLinks, nHeadingBins, pLogStart, pLogDwell, pLogDwellGo, pLogStay, pLogGo, pElig, pLogSplitIn, pInPtr, pInIdx, pLogEmit, pObs, pDBin, pHBin, pDelta, pBack, pWork] =
    Array.from({ length: nParams }, (_, i) => i);
  const shift = pointerBytes === 1 ? 0 : pointerBytes === 2 ? 1 : 2;
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
  const db = f.local('i32');
  const split = f.local('i32'); // byte address of the step's row of the split logs
  const going = f.local('i32'); // byte address of the moving scores in the work area
  const known = f.local('i32');
  const ls = f.local('f64');
  const lg = f.local('f64');
  const best = f.local('f64');
  const v = f.local('f64');
  const d = f.local('f64');

  f.get(pDelta).set(prev);
  f.get(pDelta).get(n).i32(3).i32Shl().i32Add().set(cur);
  f.get(pWork).get(n).i32(3).i32Shl().i32Add().set(going);
  f.forRange(t, () => f.get(t0), () => f.get(t1), () => {
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
      f.get(t).get(t0).i32Sub().get(n).i32Mul().i32(shift).i32Shl().get(pBack).i32Add().set(backRow);
      // The step's distance bin (staying and moving logs; 0 when unknown) and heading row.
      f.get(pDBin).get(t).i32(2).i32Shl().i32Add().i32Load().set(db);
      f.f64(0).set(ls);
      f.f64(0).set(lg);
      f.get(db).i32(0).i32GeS().when(() => {
        f.get(pLogStay).get(db).i32(3).i32Shl().i32Add().f64Load().set(ls);
        f.get(pLogGo).get(db).i32(3).i32Shl().i32Add().f64Load().set(lg);
      });
      f.get(nHeadingBins).get(pHBin).get(t).i32(2).i32Shl().i32Add().i32Load().tee(i).get(i).i32(0).i32LtS().select();
      f.get(nLinks).i32Mul().i32(3).i32Shl().get(pLogSplitIn).i32Add().set(split);
      f.forRange(j, () => f.i32(0), () => f.get(n), () => {
        f.get(j).i32(3).i32Shl().set(cell);
        f.get(db).i32(0).i32GeS().get(pElig).get(j).i32(2).i32Shl().i32Add().i32Load().i32(1).i32Eq().i32And().set(known);
        f.get(prev).get(cell).i32Add().f64Load().set(d);
        f.get(pWork).get(cell).i32Add();
        f.get(d).get(ls).get(pLogDwell).get(cell).i32Add().f64Load().get(known).select().f64Add();
        f.f64Store();
        f.get(going).get(cell).i32Add();
        f.get(d).get(lg).get(pLogDwellGo).get(cell).i32Add().f64Load().get(known).select().f64Add();
        f.f64Store();
      });
      f.forRange(j, () => f.i32(0), () => f.get(n), () => {
        f.get(j).i32(3).i32Shl().set(cell);
        f.get(pWork).get(cell).i32Add().f64Load().set(best);
        f.get(j).set(bestI);
        f.get(pInPtr).get(j).i32(2).i32Shl().i32Add().tee(p).i32Load(4).set(end);
        f.forRange(p, () => f.get(p).i32Load(0), () => f.get(end), () => {
          f.get(pInIdx).get(p).i32(2).i32Shl().i32Add().i32Load().set(i);
          f.get(going).get(i).i32(3).i32Shl().i32Add().f64Load().get(split).get(p).i32(3).i32Shl().i32Add().f64Load().f64Add().set(v);
          f.get(v).get(best).f64Gt().get(v).get(best).f64Eq().get(i).get(bestI).i32LtS().i32And().i32Or().set(take);
          f.get(v).get(best).get(take).select().set(best);
          f.get(i).get(bestI).get(take).select().set(bestI);
        });
        f.get(backRow).get(j).i32(shift).i32Shl().i32Add().get(bestI).i32Store(pointerBytes);
        f.get(cur).get(cell).i32Add().get(best).get(e).get(cell).i32Add().f64Load().f64Add().f64Store();
      });
    });
    f.get(prev).set(swap);
    f.get(cur).set(prev);
    f.get(swap).set(cur);
  });
  f.get(prev).get(pDelta).i32Ne().when(() => {
    f.forRange(j, () => f.i32(0), () => f.get(n), () => {
      f.get(j).i32(3).i32Shl().set(cell);
      f.get(pDelta).get(cell).i32Add().get(prev).get(cell).i32Add().f64Load().f64Store();
    });
  });
  return f;
}
