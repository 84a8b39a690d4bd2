// Seeded pseudo-random numbers for test signals: xoshiro128** (D. Blackman and
// S. Vigna, "Scrambled linear pseudorandom number generators", ACM TOMS 47(4), 2021),
// 32-bit state words, period 2^128 - 1. The four state words come from a seed by
// the SplitMix32 scheme (a Weyl sequence through the murmur3 32-bit finalizer), so
// nearby seeds give unrelated streams and the state is never all zero.

const TWO_POW_M32 = 2 ** -32;
const TWO_POW_M53 = 2 ** -53;

function mix32(z: number): number {
  z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
  z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
  return (z ^ (z >>> 16)) >>> 0;
}

export class Xoshiro128 {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;

  /** Any finite number is a seed; its low 32 bits and the next 32 are used. */
  constructor(seed: number) {
    if (!Number.isFinite(seed)) throw new RangeError(`seed must be a finite number (got ${seed})`);
    const lo = seed >>> 0;
    const hi = Math.floor(seed / 4294967296) >>> 0;
    let w = (lo ^ Math.imul(hi, 0x27d4eb2d)) >>> 0;
    const next = (): number => {
      w = (w + 0x9e3779b9) >>> 0;
      return mix32(w);
    };
    this.s0 = next();
    this.s1 = next();
    this.s2 = next();
    this.s3 = next();
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1;
  }

  /** Next 32 random bits as an unsigned integer. */
  nextUint32(): number {
    const s1 = this.s1;
    const r = Math.imul(rotl(Math.imul(s1, 5), 7), 9) >>> 0;
    const t = s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    return r;
  }

  /** Uniform on [0, 1) with 53 random bits. */
  nextFloat(): number {
    const hi = this.nextUint32() >>> 5; // 27 bits
    const lo = this.nextUint32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) * TWO_POW_M53;
  }

  /** Uniform on the open interval (0, 1): safe under a logarithm. */
  nextOpenFloat(): number {
    const hi = this.nextUint32() >>> 5;
    const lo = this.nextUint32() >>> 6;
    return (hi * 67108864 + lo + 0.5) * TWO_POW_M53;
  }

  /** Uniform on [0, 1) with 32 random bits (cheaper). */
  nextFloat32Bits(): number {
    return this.nextUint32() * TWO_POW_M32;
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}

/** Fills `out` with uniform samples on [lo, hi). */
export function fillUniform(rng: Xoshiro128, out: Float64Array | Float32Array, lo = 0, hi = 1): void {
  const w = hi - lo;
  for (let i = 0; i < out.length; i++) out[i] = lo + w * rng.nextFloat();
}
