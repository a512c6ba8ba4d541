import type { WasmFunction } from './wasm-function.js';
import { LOG2_IVLN2HI, LOG2_IVLN2LO, LOG2_LG, LOG2_TWO54 } from './log2-exact.js';

/**
 * `log2Exact` on both lanes of a float64 vector, as WebAssembly SIMD: the same operations in the same
 * order (integer steps on the 64-bit lanes, the subnormal case by a select), so the same numbers as
 * `log2Exact` and `Math.log2`, bit for bit. The int-to-float conversion of the exponent k (|k| < 1100)
 * uses the exact 2^52 + 2^51 trick. Allocates its scratch locals in `f` once; returns an emitter that
 * writes log2 of the vector in local `x` (every lane > 0 and finite; other lanes give unspecified
 * values, to be masked by the caller) into local `out`.
 */
export function log2LanesWasm(f: WasmFunction): (x: number, out: number) => void {
  const xs = f.local('v128');
  const sub = f.local('v128');
  const bits = f.local('v128');
  const k = f.local('v128');
  const hx = f.local('v128');
  const i = f.local('v128');
  const y = f.local('v128');
  const fr = f.local('v128');
  const hfsq = f.local('v128');
  const s = f.local('v128');
  const z = f.local('v128');
  const w = f.local('v128');
  const r = f.local('v128');
  const hi = f.local('v128');
  const lo = f.local('v128');
  const valHi = f.local('v128');
  const valLo = f.local('v128');
  const sum = f.local('v128');
  const [lg1, lg2, lg3, lg4, lg5, lg6, lg7] = LOG2_LG;
  const c = (v: number): void => void f.v128ConstF64(v);
  return (x, out) => {
    // Subnormal lanes (rare: tested for first): scale by 2^54 and take 54 off the exponent.
    f.get(x).set(xs);
    f.v128ConstI64(0, 0).set(k);
    f.get(x).v128ConstF64(2.2250738585072014e-308).f64x2Lt().tee(sub).v128AnyTrue().when(() => {
      f.get(x).v128ConstF64(LOG2_TWO54).f64x2Mul().get(x).get(sub).v128Bitselect().set(xs);
      f.v128ConstI64(-1, -54).v128ConstI64(0, 0).get(sub).v128Bitselect().set(k);
    });
    // On the 64-bit words (hx = the high word): i = (hx & 0xfffff) + 0x95f64) & 0x100000 in the high word;
    // the high word := (hx & 0xfffff) | (i ^ 0x3ff00000), the low word kept; k += (hx >> 20) − 1023 + (i >> 20).
    f.get(xs).v128ConstI64(0x000fffff, -1).v128And().tee(hx);
    f.v128ConstI64(0x95f64, 0).i64x2Add().v128ConstI64(0x100000, 0).v128And().set(i);
    f.get(hx).get(i).v128ConstI64(0x3ff00000, 0).v128Xor().v128Or().set(bits);
    f.get(k).get(xs).i32(52).i64x2ShrU().i64x2Add().get(i).i32(52).i64x2ShrU().i64x2Add().set(k);
    f.get(bits).set(xs);
    // y = (double) (k − 1023), exactly: the bits of 2^52 + 2^51 + k − 1023, less 2^52 + 2^51.
    f.get(k).v128ConstI64(0x4337ffff, 0xfffffc01).i64x2Add().v128ConstF64(6755399441055744.0).f64x2Sub().set(y);
    // f = x − 1, hfsq = 0.5 f f, and k_log1p(f) = s (hfsq + R).
    f.get(xs).v128ConstF64(1.0).f64x2Sub().set(fr);
    c(0.5);
    f.get(fr).f64x2Mul().get(fr).f64x2Mul().set(hfsq);
    f.get(fr).v128ConstF64(2.0).get(fr).f64x2Add().f64x2Div().set(s);
    f.get(s).get(s).f64x2Mul().set(z);
    f.get(z).get(z).f64x2Mul().set(w);
    // t1 = w (Lg2 + w (Lg4 + w Lg6)) into r; t2 = z (Lg1 + w (Lg3 + w (Lg5 + w Lg7))); R = t2 + t1.
    f.get(w);
    c(lg2);
    f.get(w);
    c(lg4);
    f.get(w);
    c(lg6);
    f.f64x2Mul().f64x2Add().f64x2Mul().f64x2Add().f64x2Mul().set(r);
    f.get(z);
    c(lg1);
    f.get(w);
    c(lg3);
    f.get(w);
    c(lg5);
    f.get(w);
    c(lg7);
    f.f64x2Mul().f64x2Add().f64x2Mul().f64x2Add().f64x2Mul().f64x2Add().f64x2Mul();
    f.get(r).f64x2Add().set(r);
    f.get(s).get(hfsq).get(r).f64x2Add().f64x2Mul().set(r);
    // hi = f − hfsq with its low word cleared; lo = (f − hi) − hfsq + r.
    f.get(fr).get(hfsq).f64x2Sub().v128ConstI64(-1, 0).v128And().set(hi);
    f.get(fr).get(hi).f64x2Sub().get(hfsq).f64x2Sub().get(r).f64x2Add().set(lo);
    f.get(hi);
    c(LOG2_IVLN2HI);
    f.f64x2Mul().set(valHi);
    f.get(lo).get(hi).f64x2Add();
    c(LOG2_IVLN2LO);
    f.f64x2Mul().get(lo);
    c(LOG2_IVLN2HI);
    f.f64x2Mul().f64x2Add().set(valLo);
    f.get(y).get(valHi).f64x2Add().set(sum);
    f.get(valLo).get(y).get(sum).f64x2Sub().get(valHi).f64x2Add().f64x2Add().set(valLo);
    f.get(valLo).get(sum).f64x2Add().set(out);
  };
}
