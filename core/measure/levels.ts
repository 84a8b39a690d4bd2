// Level spread: a histogram of the instantaneous level |x| in dBov, and the
// occupancy of each code of a quantizer with at most 256 codes.
//
// No logarithm per sample: x^2 is compared against precomputed squared bin
// edges. A lookup on the exponent and top eight mantissa bits of x^2/V^2 (as
// float32) lands on the right bin or its neighbour (a step of 1/256 octave in
// power, 0.012 dB, holds at most one edge, and few steps hold one, so the
// settling comparison rarely moves), and one or two comparisons settle it.

/** Width of a level bin, dB. */
export const LEVEL_BIN_DB = 0.5;
/** Lower edge of the lowest level bin, dBov. */
export const LEVEL_MIN_DBOV = -96;
/** Bins from LEVEL_MIN_DBOV up to 0 dBov. */
export const LEVEL_BIN_COUNT = Math.round(-LEVEL_MIN_DBOV / LEVEL_BIN_DB);

/** Float32 bits dropped to form a lookup key: sign, exponent and 8 mantissa bits remain. */
const KEY_SHIFT = 15;
// Scratch for reading the bits of a float32 (one realm, one thread: shared safely).
const F32 = new Float32Array(1);
const U32 = new Uint32Array(F32.buffer);
const bitsKey = (r: number): number => {
  F32[0] = r;
  return U32[0] >>> KEY_SHIFT;
};

/**
 * Counts of |x| per 0.5 dB level bin from -96 to 0 dBov, relative to an overload
 * point V. Bin k holds V 10^((-96 + k/2)/20) <= |x| < V 10^((-96 + (k+1)/2)/20);
 * the top bin also holds |x| = V exactly. |x| above V counts as overload (the
 * quantizers' rule), anything below -96 dBov, zero included, as underflow.
 */
export class LevelHistogram {
  readonly overloadPoint: number;
  readonly counts = new Float64Array(LEVEL_BIN_COUNT);
  underflow = 0;
  overload = 0;
  /** Squared bin edges, absolute (V^2 times the power ratio); edge[LEVEL_BIN_COUNT] = V^2. */
  private readonly edges2 = new Float64Array(LEVEL_BIN_COUNT + 1);
  private readonly lookup: Uint8Array;
  private readonly keyBase: number;
  private readonly invV2: number;

  constructor(overloadPoint = 1) {
    if (!(overloadPoint > 0)) throw new RangeError(`overload point must be > 0 (got ${overloadPoint})`);
    this.overloadPoint = overloadPoint;
    const v2 = overloadPoint * overloadPoint;
    this.invV2 = 1 / v2;
    const rel = new Float64Array(LEVEL_BIN_COUNT + 1);
    for (let k = 0; k <= LEVEL_BIN_COUNT; k++) {
      rel[k] = k === LEVEL_BIN_COUNT ? 1 : Math.pow(10, (LEVEL_MIN_DBOV + k * LEVEL_BIN_DB) / 10);
      this.edges2[k] = k === LEVEL_BIN_COUNT ? v2 : v2 * rel[k];
    }
    // One entry per key from the lowest edge to 1.0 (x^2 = V^2), each the bin of its key's
    // smallest value; one spare key at either end absorbs the rounding of x^2/V^2.
    this.keyBase = bitsKey(rel[0]) - 1;
    const top = bitsKey(1) + 1;
    this.lookup = new Uint8Array(top - this.keyBase + 1);
    // Keys of positive floats ascend with the value, so each bin search goes on from the last.
    let b = 0;
    for (let key = this.keyBase; key <= top; key++) {
      U32[0] = key << KEY_SHIFT;
      const r = F32[0];
      while (b < LEVEL_BIN_COUNT - 1 && r >= rel[b + 1]) b++;
      this.lookup[key - this.keyBase] = b;
    }
  }

  reset(): void {
    this.counts.fill(0);
    this.underflow = 0;
    this.overload = 0;
  }

  /** Adds samples [start, end) of a block. */
  add(x: ArrayLike<number>, start = 0, end = x.length): void {
    const v = this.overloadPoint;
    const e2 = this.edges2;
    const floor2 = e2[0];
    const lut = this.lookup;
    const base = this.keyBase;
    const shift = KEY_SHIFT;
    // Locals, so the loop need not reload module bindings (bundlers turn them into vars).
    const f32 = F32;
    const u32 = U32;
    const inv = this.invV2;
    const counts = this.counts;
    const last = LEVEL_BIN_COUNT - 1;
    let under = 0;
    let over = 0;
    for (let i = start; i < end; i++) {
      const s = x[i];
      // Math.abs, not a comparison: the sign of speech is a coin toss that no branch predicts.
      const a = Math.abs(s);
      if (a > v) {
        over++;
        continue;
      }
      const s2 = a * a;
      if (s2 < floor2) {
        under++;
        continue;
      }
      f32[0] = s2 * inv;
      let b = lut[(u32[0] >>> shift) - base];
      // The float32 rounding may put x^2 one key off: settle against the exact edges.
      while (b > 0 && s2 < e2[b]) b--;
      while (b < last && s2 >= e2[b + 1]) b++;
      counts[b]++;
    }
    this.underflow += under;
    this.overload += over;
  }

  /** Samples counted, overload and underflow included. */
  get total(): number {
    let n = this.underflow + this.overload;
    for (let k = 0; k < LEVEL_BIN_COUNT; k++) n += this.counts[k];
    return n;
  }
}

/** Lower edge of level bin k in dBov. */
export function levelBinLowerDbov(k: number): number {
  return LEVEL_MIN_DBOV + k * LEVEL_BIN_DB;
}

/**
 * How often each code was sent, for quantizers with at most 256 codes (G.711: the
 * line character; others: the level index). Codes outside the range are ignored.
 */
export class CodeOccupancy {
  readonly counts: Float64Array;

  constructor(readonly codeCount = 256) {
    if (!Number.isInteger(codeCount) || codeCount < 0 || codeCount > 256) {
      throw new RangeError(`code count must be a whole number from 0 to 256 (got ${codeCount})`);
    }
    this.counts = new Float64Array(codeCount);
  }

  reset(): void {
    this.counts.fill(0);
  }

  add(codes: ArrayLike<number>, start = 0, end = codes.length): void {
    const c = this.counts;
    const n = this.codeCount;
    for (let i = start; i < end; i++) {
      const k = codes[i];
      if (k >= 0 && k < n) c[k]++;
    }
  }
}
