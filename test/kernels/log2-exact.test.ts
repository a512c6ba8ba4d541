import { describe, it, expect } from 'vitest';
import { log2Exact } from '../../src/kernels/log2-exact.js';
import { log2LanesWasm } from '../../src/kernels/log2-lanes-wasm.js';
import { WasmFunction } from '../../src/kernels/wasm-function.js';
import { wasmModule } from '../../src/kernels/wasm-module.js';
import { SeededRandom } from '../../src/model/seeded-random.js';

// Oracle: the runtime's own Math.log2 (V8 computes it by the same FreeBSD e_log2.c algorithm, which is
// what makes bit-for-bit agreement possible). Arguments are seeded random: uniform in (0, 1), log-uniform
// down to 1e-300, subnormal, just above and below 1 and powers of two.
function argumentsToTest(): Float64Array {
  const rng = new SeededRandom(2026);
  const xs: number[] = [1, 0.5, 2, 1 + 2 ** -52, 1 - 2 ** -53, Math.SQRT1_2, Math.SQRT2, 5e-324, 2.2250738585072014e-308, 2.225073858507201e-308, 0.9999999, 1.0000001];
  for (let k = 0; k < 20000; k++) {
    xs.push(rng.next() || 0.5);
    xs.push(Math.exp(-690 * rng.next()));
    xs.push(rng.next() * 2.2e-308 || 5e-324);
    xs.push(1 + (rng.next() - 0.5) * 1e-6);
  }
  for (let e = -1074; e <= 10; e += 7) xs.push(2 ** e);
  return Float64Array.from(xs.length % 2 === 0 ? xs : [...xs, 0.25]);
}

describe('log2Exact and its WebAssembly lanes', () => {
  const xs = argumentsToTest();

  it('log2Exact gives Math.log2 bit for bit', () => {
    let bad = 0;
    for (const x of xs) if (!Object.is(log2Exact(x), Math.log2(x))) bad++;
    expect(bad).toBe(0);
  });

  it('log2LanesWasm gives Math.log2 bit for bit on both lanes (subnormals included)', () => {
    // A test function: for p in [0, count) step 16 bytes, out[p] = log2(in[p]) on two lanes.
    const f = new WasmFunction(['i32', 'i32', 'i32']);
    const [pIn, pOut, bytes] = [0, 1, 2];
    const p = f.local('i32');
    const x = f.local('v128');
    const y = f.local('v128');
    const log2 = log2LanesWasm(f);
    f.forRange(p, () => f.i32(0), () => f.get(bytes), () => {
      f.get(pIn).get(p).i32Add().v128Load().set(x);
      log2(x, y);
      f.get(pOut).get(p).i32Add().get(y).v128Store();
      f.get(p).i32(15).i32Add().set(p);
    });
    let instance: WebAssembly.Instance;
    const memory = new WebAssembly.Memory({ initial: Math.ceil((16 * xs.length + 64) / 65536) });
    try {
      instance = new WebAssembly.Instance(new WebAssembly.Module(wasmModule([{ name: 'log2', fn: f }])), { env: { memory } });
    } catch {
      return; // no WebAssembly SIMD here: the JavaScript lanes are used, nothing to check
    }
    new Float64Array(memory.buffer, 0, xs.length).set(xs);
    (instance.exports.log2 as (...a: number[]) => void)(0, 8 * xs.length, 8 * xs.length);
    const got = new Float64Array(memory.buffer, 8 * xs.length, xs.length);
    let bad = 0;
    let first = '';
    for (let k = 0; k < xs.length; k++) {
      if (!Object.is(got[k], Math.log2(xs[k]))) {
        if (bad++ === 0) first = `log2(${xs[k]}) = ${got[k]}, want ${Math.log2(xs[k])}`;
      }
    }
    expect(bad, first).toBe(0);
  });
});
