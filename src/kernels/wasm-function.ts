/**
 * A WebAssembly function under construction: typed locals and a small, readable emitter for the
 * instructions the lane kernels use (integer and float arithmetic, memory access, 128-bit SIMD on pairs
 * of float64, structured loops). Instructions are appended in stack-machine order; each method returns
 * `this` so a line of code reads as one expression, e.g. `f.get(a).get(b).f64Add().set(c)`.
 *
 * Binary encodings follow the WebAssembly Core Specification 2.0 (W3C, 2022), section 5 "Binary Format",
 * and its fixed-width SIMD instructions (opcodes prefixed with 0xFD). Memory offsets are byte offsets;
 * every memory access here is 8- or 16-byte aligned by construction of the lane layout.
 */
export type ValueType = 'i32' | 'f64' | 'v128';

const TYPE_CODE: Record<ValueType, number> = { i32: 0x7f, f64: 0x7c, v128: 0x7b };

/** Unsigned LEB128. */
export function uleb(value: number): number[] {
  const out: number[] = [];
  let v = value >>> 0;
  do {
    let byte = v & 0x7f;
    v >>>= 7;
    if (v !== 0) byte |= 0x80;
    out.push(byte);
  } while (v !== 0);
  return out;
}

/** Signed LEB128 (32-bit). */
export function sleb(value: number): number[] {
  const out: number[] = [];
  let v = value | 0;
  for (;;) {
    const byte = v & 0x7f;
    v >>= 7;
    if ((v === 0 && (byte & 0x40) === 0) || (v === -1 && (byte & 0x40) !== 0)) {
      out.push(byte);
      return out;
    }
    out.push(byte | 0x80);
  }
}

export class WasmFunction {
  readonly locals: ValueType[] = [];
  readonly code: number[] = [];

  constructor(
    readonly params: ValueType[],
    readonly results: ValueType[] = [],
  ) {}

  /** A new local of type `type`; returns its index. */
  local(type: ValueType): number {
    this.locals.push(type);
    return this.params.length + this.locals.length - 1;
  }

  private simd(op: number, ...immediates: number[]): this {
    this.code.push(0xfd, ...uleb(op), ...immediates);
    return this;
  }

  // Locals and constants.
  get(i: number): this { this.code.push(0x20, ...uleb(i)); return this; }
  set(i: number): this { this.code.push(0x21, ...uleb(i)); return this; }
  tee(i: number): this { this.code.push(0x22, ...uleb(i)); return this; }
  i32(value: number): this { this.code.push(0x41, ...sleb(value)); return this; }
  f64(value: number): this {
    const bytes = new Uint8Array(new Float64Array([value]).buffer);
    this.code.push(0x44, ...bytes);
    return this;
  }
  drop(): this { this.code.push(0x1a); return this; }
  /** select(a, b, c): a when c ≠ 0, else b. */
  select(): this { this.code.push(0x1b); return this; }

  // 32-bit integers.
  i32Add(): this { this.code.push(0x6a); return this; }
  i32Sub(): this { this.code.push(0x6b); return this; }
  i32Mul(): this { this.code.push(0x6c); return this; }
  i32Shl(): this { this.code.push(0x74); return this; }
  i32Eq(): this { this.code.push(0x46); return this; }
  i32Ne(): this { this.code.push(0x47); return this; }
  i32LtS(): this { this.code.push(0x48); return this; }
  i32GeS(): this { this.code.push(0x4e); return this; }
  i32Or(): this { this.code.push(0x72); return this; }
  i32And(): this { this.code.push(0x71); return this; }
  /** i32.load from the address on the stack plus `offset` bytes. */
  i32Load(offset = 0): this { this.code.push(0x28, 2, ...uleb(offset)); return this; }
  /** Stores the low 8, 16 or 32 bits of an i32 (value on top, address below). */
  i32Store(bytes: 1 | 2 | 4, offset = 0): this {
    this.code.push(bytes === 1 ? 0x3a : bytes === 2 ? 0x3b : 0x36, bytes === 1 ? 0 : bytes === 2 ? 1 : 2, ...uleb(offset));
    return this;
  }

  // float64 scalars.
  f64Load(offset = 0): this { this.code.push(0x2b, 3, ...uleb(offset)); return this; }
  f64Store(offset = 0): this { this.code.push(0x39, 3, ...uleb(offset)); return this; }
  f64Add(): this { this.code.push(0xa0); return this; }
  f64Mul(): this { this.code.push(0xa2); return this; }
  f64Div(): this { this.code.push(0xa3); return this; }
  f64Gt(): this { this.code.push(0x64); return this; }
  f64Ne(): this { this.code.push(0x62); return this; }
  f64Eq(): this { this.code.push(0x61); return this; }

  // 128-bit vectors of two float64 lanes.
  v128Load(offset = 0): this { return this.simd(0x00, 4, ...uleb(offset)); }
  v128Store(offset = 0): this { return this.simd(0x0b, 4, ...uleb(offset)); }
  f64x2Splat(): this { return this.simd(0x14); }
  f64x2ExtractLane(lane: 0 | 1): this { return this.simd(0x21, lane); }
  f64x2ReplaceLane(lane: 0 | 1): this { return this.simd(0x22, lane); }
  f64x2Add(): this { return this.simd(0xf0); }
  f64x2Mul(): this { return this.simd(0xf2); }
  f64x2Sub(): this { return this.simd(0xf1); }
  /** Bitwise and of two vectors (used with all-ones / all-zeros lane masks). */
  v128And(): this { return this.simd(0x4e); }
  /** a & ~b for the vectors a (below) and b (on top). */
  v128AndNot(): this { return this.simd(0x4f); }
  /** bitselect(a, b, mask): the bits of a where mask is 1, of b where it is 0 (a, b, mask pushed in that order). */
  v128Bitselect(): this { return this.simd(0x52); }

  // More scalar and vector instructions, for the decode kernels (Viterbi maxima, log2, position sums).
  f64Sub(): this { this.code.push(0xa1); return this; }
  i32ShrU(): this { this.code.push(0x76); return this; }
  f64Sqrt(): this { this.code.push(0x9f); return this; }
  f64Lt(): this { this.code.push(0x63); return this; }
  i32Load8U(offset = 0): this { this.code.push(0x2d, 0, ...uleb(offset)); return this; }
  /** v128.const of two float64 values (IEEE bytes, little-endian). */
  v128ConstF64(a: number, b: number = a): this {
    return this.simd(0x0c, ...new Uint8Array(new Float64Array([a, b]).buffer));
  }
  /** v128.const of two 64-bit integers given as [high 32 bits, low 32 bits] (the same in both lanes). */
  v128ConstI64(high: number, low: number): this {
    const words = new Uint32Array([low >>> 0, high >>> 0, low >>> 0, high >>> 0]);
    return this.simd(0x0c, ...new Uint8Array(words.buffer));
  }
  i32x4Splat(): this { return this.simd(0x11); }
  i32x4ExtractLane(lane: 0 | 1 | 2 | 3): this { return this.simd(0x1b, lane); }
  f64x2Div(): this { return this.simd(0xf3); }
  /** pmax(a, b) = a < b ? b : a, lane by lane. */
  f64x2Pmax(): this { return this.simd(0xf7); }
  f64x2Lt(): this { return this.simd(0x49); }
  f64x2Gt(): this { return this.simd(0x4a); }
  /** v128.any_true: i32 1 when any bit is set. */
  v128AnyTrue(): this { return this.simd(0x53); }
  v128Or(): this { return this.simd(0x50); }
  v128Xor(): this { return this.simd(0x51); }
  i64x2Shl(): this { return this.simd(0xcb); }
  i64x2ShrU(): this { return this.simd(0xcd); }
  i64x2Add(): this { return this.simd(0xce); }

  // Control.
  /** `block … end` with a body; inside, `br(0)` leaves the block. */
  block(body: () => void): this {
    this.code.push(0x02, 0x40);
    body();
    this.code.push(0x0b);
    return this;
  }
  /** `if … end` on the i32 on the stack. */
  when(body: () => void): this {
    this.code.push(0x04, 0x40);
    body();
    this.code.push(0x0b);
    return this;
  }
  br(depth: number): this { this.code.push(0x0c, ...uleb(depth)); return this; }
  brIf(depth: number): this { this.code.push(0x0d, ...uleb(depth)); return this; }

  /**
   * `for (i = from; i < to; i++) body` as block/loop: `from` and `to` are emitters that push one i32;
   * `to` is evaluated at every test (push a local). Inside `body`, `br(0)` continues and `br(1)` leaves
   * the loop (add the depth of any block opened inside the body).
   */
  forRange(i: number, from: () => void, to: () => void, body: () => void): this {
    from();
    this.set(i);
    this.code.push(0x02, 0x40, 0x03, 0x40); // block, loop
    this.get(i);
    to();
    this.i32GeS().brIf(1);
    body();
    this.get(i).i32(1).i32Add().set(i).br(0);
    this.code.push(0x0b, 0x0b);
    return this;
  }

  /** Same, counting down: `for (i = from; i >= downTo; i--) body`. */
  forDown(i: number, from: () => void, downTo: () => void, body: () => void): this {
    from();
    this.set(i);
    this.code.push(0x02, 0x40, 0x03, 0x40);
    this.get(i);
    downTo();
    this.i32LtS().brIf(1);
    body();
    this.get(i).i32(1).i32Sub().set(i).br(0);
    this.code.push(0x0b, 0x0b);
    return this;
  }

  /** The function's body as encoded in the code section (size, locals, instructions, end). */
  encodeBody(): number[] {
    const groups: Array<[number, ValueType]> = [];
    for (const t of this.locals) {
      const last = groups[groups.length - 1];
      if (last && last[1] === t) last[0]++;
      else groups.push([1, t]);
    }
    const body = [...uleb(groups.length), ...groups.flatMap(([count, t]) => [...uleb(count), TYPE_CODE[t]]), ...this.code, 0x0b];
    return [...uleb(body.length), ...body];
  }

  /** The function's type as encoded in the type section. */
  encodeType(): number[] {
    return [0x60, ...uleb(this.params.length), ...this.params.map((t) => TYPE_CODE[t]), ...uleb(this.results.length), ...this.results.map((t) => TYPE_CODE[t])];
  }
}
