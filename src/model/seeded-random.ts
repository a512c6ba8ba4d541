/**
 * A small seeded pseudo-random generator (SplitMix64 seeding a xoshiro128** state; Blackman & Vigna,
 * "Scrambled linear pseudorandom number generators", 2018), so fits, restarts and simulations are
 * reproducible from one integer seed on every machine. Not for cryptography.
 */
export class SeededRandom {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;

  constructor(seed: number) {
    // SplitMix32-style expansion of the seed into four non-zero words.
    let x = (Math.floor(seed) ^ 0x9e3779b9) >>> 0;
    const next = (): number => {
      x = (x + 0x9e3779b9) >>> 0;
      let z = x;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
      return (z ^ (z >>> 16)) >>> 0;
    };
    this.s0 = next();
    this.s1 = next();
    this.s2 = next();
    this.s3 = next() | 1;
  }

  /** Next 32-bit unsigned integer (xoshiro128**). */
  nextUint32(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5) >>> 0, 7), 9) >>> 0;
    const t = (this.s1 << 9) >>> 0;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    this.s0 >>>= 0;
    this.s1 >>>= 0;
    this.s2 >>>= 0;
    this.s3 >>>= 0;
    return result;
  }

  /** Uniform in [0, 1) with 53 random bits. */
  next(): number {
    const hi = this.nextUint32() >>> 5;
    const lo = this.nextUint32() >>> 6;
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  /** Uniform integer in [0, n). */
  int(n: number): number {
    return Math.floor(this.next() * n);
  }

  /** Standard exponential variate (for Dirichlet draws via normalised gammas with shape 1). */
  exponential(): number {
    return -Math.log(1 - this.next());
  }

  /** Gamma(shape, 1) variate (Marsaglia & Tsang 2000, with the shape < 1 boost). */
  gamma(shape: number): number {
    if (shape < 1) {
      const u = this.next();
      return this.gamma(shape + 1) * (u === 0 ? Number.MIN_VALUE : u) ** (1 / shape);
    }
    const d = shape - 1 / 3;
    const c = 1 / Math.sqrt(9 * d);
    for (;;) {
      let x: number;
      let v: number;
      do {
        x = this.normal();
        v = 1 + c * x;
      } while (v <= 0);
      v = v * v * v;
      const u = this.next();
      if (u < 1 - 0.0331 * x * x * x * x) return d * v;
      if (Math.log(u) < 0.5 * x * x + d * (1 - v + Math.log(v))) return d * v;
    }
  }

  /** Standard normal variate (Box–Muller). */
  normal(): number {
    let u = 0;
    while (u === 0) u = this.next();
    const v = this.next();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  }

  /** Index drawn from the (unnormalised, non-negative) weights `w[offset … offset+length-1]`. */
  pick(w: ArrayLike<number>, offset = 0, length = w.length - offset): number {
    let total = 0;
    for (let k = 0; k < length; k++) total += w[offset + k];
    let u = this.next() * total;
    for (let k = 0; k < length; k++) {
      u -= w[offset + k];
      if (u < 0) return k;
    }
    // Rounding left u ≥ 0: return the last index with positive weight.
    for (let k = length - 1; k >= 0; k--) if (w[offset + k] > 0) return k;
    return length - 1;
  }
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}
