/**
 * Base-2 logarithm by the algorithm of FreeBSD's `e_log2.c` (fdlibm lineage: argument reduction to
 * [√2/2, √2), the `k_log1p` polynomial, and a split of the result into high and low parts), which is the
 * algorithm V8 uses for `Math.log2`. Written out so that the WebAssembly decode kernels can vectorise it
 * (`log2LanesWasm`) and give the same numbers as `Math.log2`; this scalar copy is the reference they are
 * tested against (and `test/kernels/log2-exact.test.ts` checks it against `Math.log2` bit for bit on
 * random arguments). Defined for x > 0 and finite (the decoders call it only there).
 */
const BITS = new Float64Array(1);
const WORDS = new Uint32Array(BITS.buffer);

export const LOG2_TWO54 = 1.8014398509481984e16;
export const LOG2_IVLN2HI = 1.44269504072144627571e0;
export const LOG2_IVLN2LO = 1.67517131648865118353e-10;
export const LOG2_LG = [
  6.666666666666735130e-1, 3.999999999940941908e-1, 2.857142874366239149e-1, 2.222219843214978396e-1, 1.818357216161805012e-1,
  1.531383769920937332e-1, 1.479819860511658591e-1,
] as const;

export function log2Exact(value: number): number {
  let x = value;
  BITS[0] = x;
  let hx = WORDS[1] | 0;
  let k = 0;
  if (hx < 0x00100000) {
    // Subnormal: scale up by 2^54.
    k -= 54;
    x *= LOG2_TWO54;
    BITS[0] = x;
    hx = WORDS[1] | 0;
  }
  k += (hx >> 20) - 1023;
  hx &= 0x000fffff;
  const i = (hx + 0x95f64) & 0x100000;
  WORDS[1] = hx | (i ^ 0x3ff00000); // x or x/2 normalised into [√2/2, √2)
  x = BITS[0];
  k += i >> 20;
  const y = k;
  const f = x - 1.0;
  const hfsq = 0.5 * f * f;
  const s = f / (2.0 + f);
  const z = s * s;
  const w = z * z;
  const [lg1, lg2, lg3, lg4, lg5, lg6, lg7] = LOG2_LG;
  const t1 = w * (lg2 + w * (lg4 + w * lg6));
  const t2 = z * (lg1 + w * (lg3 + w * (lg5 + w * lg7)));
  const r = s * (hfsq + (t2 + t1));
  BITS[0] = f - hfsq;
  WORDS[0] = 0;
  const hi = BITS[0];
  const lo = f - hi - hfsq + r;
  let valHi = hi * LOG2_IVLN2HI;
  let valLo = (lo + hi) * LOG2_IVLN2LO + lo * LOG2_IVLN2HI;
  const sum = y + valHi;
  valLo += y - sum + valHi;
  valHi = sum;
  return valLo + valHi;
}
