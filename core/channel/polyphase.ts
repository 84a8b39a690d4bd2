// Streaming FIR rate changers by whole factors, state carried from block to block
// so any block length (even 1) gives the same samples as one long block.
//
// Time convention (what the channel path and its tests rely on): with input
// samples x[t], t = 0, 1, ... since the last reset and taps h,
//   decimator:    y[m] = sum_j h[j] x[M m - j]            (emitted when x[M m] arrives)
//   interpolator: y[L m + r] = L sum_j h[j L + r] x[m - j]  (all L emitted when x[m] arrives)
// i.e. plain convolution with h followed by keeping every M-th sample, or
// zero-stuffing by L followed by convolution with L h. Each computes only the
// samples it keeps (the polyphase saving): N multiplies per decimated output,
// about N / L per interpolated output.
//
// The taps are linear phase (odd length, symmetric, as fir-design.ts makes them),
// so each pair of taps equal by symmetry takes one multiply on the sum of its two
// samples (folding). Half-band filters (factor 2) go further: their zero taps are
// never touched. The decimator's odd phase is the centre tap alone, one multiply;
// the interpolator's odd phase is the input delayed, copied (its gain 2 x 1/2 is 1).
// With folding, a half-band 4K - 1 taps long costs K + 1 multiplies per decimated
// output and K per pair of interpolated ones.
//
// Each keeps a linear buffer: the last few inputs its window reaches back, then the
// block. Every output is a dot product over one contiguous window of it, and
// neighbouring outputs are computed together (see foldedRun), which is what makes
// them fast.

/** What the channel path needs of a decimator. */
export interface Decimator {
  readonly factor: number;
  readonly maxInput: number;
  /** Where the next block lands: process(inlet, 0, n, ...) takes n samples written here in place. */
  readonly inlet: Float64Array;
  reset(): void;
  outputsFor(n: number): number;
  process(
    input: ArrayLike<number>,
    inStart: number,
    n: number,
    output: Float64Array,
    outStart: number,
  ): number;
}

/** What the channel path needs of an interpolator. */
export interface Interpolator {
  readonly factor: number;
  readonly maxInput: number;
  /** Where the next block lands: process(inlet, 0, n, ...) takes n samples written here in place. */
  readonly inlet: Float64Array;
  reset(): void;
  process(input: ArrayLike<number>, inStart: number, n: number, output: Float64Array, outStart: number): void;
}

/** Decimation bookkeeping shared by both kinds: the buffer, and where the next kept sample falls. */
abstract class BufferedDecimator implements Decimator {
  readonly factor: number;
  readonly length: number;
  readonly maxInput: number;
  /**
   * Where the next block lands in the buffer (maxInput long). A caller may write a
   * block here itself and pass `inlet` as process()'s input (from 0): nothing is
   * copied then. The channel path chains stages so.
   */
  readonly inlet: Float64Array;
  /** [length - 1 history | up to maxInput new samples]. */
  protected readonly buf: Float64Array;
  /** Input samples until the next kept one (0: the next input is kept). */
  private wait = 0;

  constructor(taps: Float64Array, factor: number, maxInput: number) {
    checkShape(taps, factor, maxInput);
    this.factor = factor;
    this.length = taps.length;
    this.maxInput = maxInput;
    this.buf = new Float64Array(taps.length - 1 + maxInput);
    this.inlet = this.buf.subarray(taps.length - 1);
  }

  reset(): void {
    this.buf.fill(0);
    this.wait = 0;
  }

  /** How many outputs the next `n` inputs will produce. */
  outputsFor(n: number): number {
    return n <= this.wait ? 0 : Math.floor((n - this.wait - 1) / this.factor) + 1;
  }

  /**
   * Consumes input[inStart .. inStart + n) and writes the kept outputs from
   * output[outStart]; returns how many were written.
   */
  process(
    input: ArrayLike<number>,
    inStart: number,
    n: number,
    output: Float64Array,
    outStart: number,
  ): number {
    if (n > this.maxInput) throw new RangeError(`decimator: block of ${n} exceeds ${this.maxInput}`);
    if (input !== this.inlet || inStart !== 0) copyIn(input, inStart, n, this.inlet);
    const count = this.outputsFor(n);
    // The window of block sample q is buf[q .. q + length), ending on the sample itself.
    this.run(this.wait, count, output, outStart);
    this.wait = count > 0 ? this.wait + count * this.factor - n : this.wait - n;
    this.buf.copyWithin(0, n, n + this.length - 1);
    return count;
  }

  /** Writes `count` outputs, the first one's window starting at buf[start], the next `factor` later. */
  protected abstract run(start: number, count: number, output: Float64Array, outStart: number): void;
}

/** Any whole factor, any odd-length symmetric filter. */
export class FirDecimator extends BufferedDecimator {
  /** h[0 .. P): one tap of each symmetric pair; the centre h[P] is the last. */
  private readonly half: Float64Array;
  private readonly pairs: number;

  constructor(taps: Float64Array, factor: number, maxInput: number) {
    super(taps, factor, maxInput);
    checkSymmetric(taps);
    this.pairs = (taps.length - 1) >> 1;
    this.half = taps.slice(0, this.pairs + 1);
  }

  protected run(start: number, count: number, output: Float64Array, outStart: number): void {
    const p = this.pairs;
    // Pairs (w[i], w[L-1-i]), then the centre w[P]; symmetric, so the taps need no reversing.
    foldedRun(this.half, p, 1, 2 * p, p, this.buf, start, this.factor, count, output, outStart, 1);
  }
}

/** By 2, with a half-band filter: the zero taps cost nothing. */
export class HalfbandDecimator extends BufferedDecimator {
  /** h[0], h[2], ... h[2K - 2]: one of each symmetric pair of non-zero taps; then the centre h[2K - 1]. */
  private readonly even: Float64Array;
  private readonly pairs: number;

  constructor(taps: Float64Array, maxInput: number) {
    super(taps, 2, maxInput);
    checkHalfband(taps);
    const k = (taps.length + 1) >> 2;
    this.pairs = k;
    this.even = Float64Array.from({ length: k + 1 }, (_, i) => taps[i < k ? 2 * i : 2 * k - 1]);
  }

  protected run(start: number, count: number, output: Float64Array, outStart: number): void {
    const k = this.pairs;
    // Pairs (w[2i], w[L-1-2i]) on the even phase, then the centre w[2K-1] alone on the odd one.
    foldedRun(this.even, k, 2, 4 * k - 2, 2 * k - 1, this.buf, start, 2, count, output, outStart, 1);
  }
}

/** Any whole factor, any filter: one short filter per output phase. */
export class FirInterpolator implements Interpolator {
  readonly factor: number;
  readonly length: number;
  readonly maxInput: number;
  /** Taps per phase: ceil(length / factor). */
  readonly phaseLength: number;
  /** Phase r at [r K, (r + 1) K): factor * h[j factor + r], reversed, zero-padded. */
  private readonly phases: Float64Array;
  private readonly buf: Float64Array;
  readonly inlet: Float64Array;

  constructor(taps: Float64Array, factor: number, maxInput: number) {
    checkShape(taps, factor, maxInput);
    this.factor = factor;
    this.length = taps.length;
    this.maxInput = maxInput;
    const k = Math.ceil(taps.length / factor);
    this.phaseLength = k;
    this.phases = new Float64Array(factor * k);
    for (let r = 0; r < factor; r++) {
      for (let j = 0; j < k; j++) {
        const t = j * factor + r;
        // The gain `factor` restores the level that zero-stuffing spreads over L samples.
        this.phases[r * k + (k - 1 - j)] = t < taps.length ? factor * taps[t] : 0;
      }
    }
    this.buf = new Float64Array(k - 1 + maxInput);
    this.inlet = this.buf.subarray(k - 1);
  }

  reset(): void {
    this.buf.fill(0);
  }

  /** Consumes input[inStart .. inStart + n) and writes n * factor outputs from output[outStart]. */
  process(
    input: ArrayLike<number>,
    inStart: number,
    n: number,
    output: Float64Array,
    outStart: number,
  ): void {
    if (n > this.maxInput) throw new RangeError(`interpolator: block of ${n} exceeds ${this.maxInput}`);
    const k = this.phaseLength;
    const hist = k - 1;
    const buf = this.buf;
    const factor = this.factor;
    if (input !== this.inlet || inStart !== 0) copyIn(input, inStart, n, this.inlet);
    for (let r = 0; r < factor; r++)
      firRun(this.phases, r * k, k, buf, 0, 1, n, output, outStart + r, factor);
    buf.copyWithin(0, n, n + hist);
  }
}

/**
 * By 2, with a half-band filter of 4K - 1 taps: the even phase is the 2K non-zero
 * taps, symmetric, so K multiplies per output; the odd phase is x[m - K + 1] times
 * 2 h[centre] = 1, a copy.
 */
export class HalfbandInterpolator implements Interpolator {
  readonly factor = 2;
  readonly length: number;
  readonly maxInput: number;
  /** 2 h[0], 2 h[2], ... 2 h[2K - 2]: the even phase's taps, one of each pair; then 0 (it has no centre). */
  private readonly even: Float64Array;
  private readonly pairs: number;
  private readonly centre: number;
  /** [2K - 1 history | up to maxInput new samples]. */
  private readonly buf: Float64Array;
  readonly inlet: Float64Array;

  constructor(taps: Float64Array, maxInput: number) {
    checkShape(taps, 2, maxInput);
    checkHalfband(taps);
    this.length = taps.length;
    this.maxInput = maxInput;
    const k = (taps.length + 1) >> 2;
    this.pairs = k;
    this.even = Float64Array.from({ length: k + 1 }, (_, i) => (i < k ? 2 * taps[2 * i] : 0));
    this.centre = 2 * taps[2 * k - 1];
    this.buf = new Float64Array(2 * k - 1 + maxInput);
    this.inlet = this.buf.subarray(2 * k - 1);
  }

  reset(): void {
    this.buf.fill(0);
  }

  /** Consumes input[inStart .. inStart + n) and writes 2 n outputs from output[outStart]. */
  process(
    input: ArrayLike<number>,
    inStart: number,
    n: number,
    output: Float64Array,
    outStart: number,
  ): void {
    if (n > this.maxInput) throw new RangeError(`interpolator: block of ${n} exceeds ${this.maxInput}`);
    const k = this.pairs;
    const hist = 2 * k - 1;
    const buf = this.buf;
    if (input !== this.inlet || inStart !== 0) copyIn(input, inStart, n, this.inlet);
    // The window of block sample q is buf[q .. q + 2K), ending on the sample itself:
    // pairs (w[j], w[2K-1-j]), no centre (the even phase has an even length).
    foldedRun(this.even, k, 1, 2 * k - 1, 0, buf, 0, 1, n, output, outStart, 2);
    const c = this.centre;
    for (let q = 0; q < n; q++) output[outStart + 2 * q + 1] = c * buf[q + k];
    buf.copyWithin(0, n, n + hist);
  }
}

/** A decimator for these taps: the half-band kind when it can be one. */
export function createDecimator(taps: Float64Array, factor: number, maxInput: number): Decimator {
  return factor === 2 && isHalfband(taps)
    ? new HalfbandDecimator(taps, maxInput)
    : new FirDecimator(taps, factor, maxInput);
}

/** An interpolator for these taps: the half-band kind when it can be one. */
export function createInterpolator(taps: Float64Array, factor: number, maxInput: number): Interpolator {
  return factor === 2 && isHalfband(taps)
    ? new HalfbandInterpolator(taps, maxInput)
    : new FirInterpolator(taps, factor, maxInput);
}

/** Odd-length symmetric, 4K - 1 long, zero at every even non-zero distance from the centre. */
export function isHalfband(taps: Float64Array): boolean {
  const n = taps.length;
  if (n % 4 !== 3) return false;
  for (let i = 0; i < n >> 1; i++) if (taps[i] !== taps[n - 1 - i]) return false;
  const mid = (n - 1) >> 1;
  for (let i = mid % 2; i < mid; i += 2) if (taps[i] !== 0) return false;
  return true;
}

/** dst[0 .. n) = src[from .. from + n): a native copy when src is a whole typed array. */
function copyIn(src: ArrayLike<number>, from: number, n: number, dst: Float64Array): void {
  if (from === 0 && n === src.length && (src instanceof Float64Array || src instanceof Float32Array))
    dst.set(src);
  else for (let i = 0; i < n; i++) dst[i] = src[from + i];
}

function checkShape(taps: Float64Array, factor: number, maxInput: number): void {
  if (!Number.isInteger(factor) || factor < 1) throw new RangeError(`factor must be a whole number >= 1`);
  if (taps.length < 1) throw new RangeError('a filter needs at least one tap');
  if (!Number.isInteger(maxInput) || maxInput < 1)
    throw new RangeError(`maxInput must be a whole number >= 1`);
}

function checkSymmetric(taps: Float64Array): void {
  const n = taps.length;
  if (n % 2 !== 1) throw new RangeError(`a linear-phase filter here has an odd length (got ${n})`);
  for (let i = 0; i < n >> 1; i++)
    if (taps[i] !== taps[n - 1 - i]) throw new RangeError(`taps must be symmetric (tap ${i} differs)`);
}

function checkHalfband(taps: Float64Array): void {
  if (!isHalfband(taps))
    throw new RangeError(
      `not a half-band filter (needs 4K - 1 symmetric taps, zero at even distances from the centre)`,
    );
}

/**
 * out[o0 + j os] = sum_{i < pairs} g[i] (b[p + i ts] + b[p + span - i ts]) + c b[p + cAt]
 * with p = b0 + j stride, for j < count, and the centre tap c = g[pairs]. The centre is
 * read here, not passed: a double argument to a call not inlined is boxed, one
 * allocation per block. Four outputs at a time share each tap load
 * and keep independent sums in flight (on this machine four beat eight: the folded
 * loop needs more registers). Every output is summed in the same order whichever
 * branch computes it, so the result does not depend on how the input was cut into
 * blocks, to the last bit. c = 0 (an even length, no centre) adds exactly nothing.
 */
function foldedRun(
  g: Float64Array,
  pairs: number,
  ts: number,
  span: number,
  cAt: number,
  b: Float64Array,
  b0: number,
  stride: number,
  count: number,
  out: Float64Array,
  o0: number,
  os: number,
): void {
  const c = g[pairs];
  const d1 = stride;
  const d2 = 2 * stride;
  const d3 = 3 * stride;
  let j = 0;
  for (; j + 3 < count; j += 4) {
    const p = b0 + j * stride;
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    for (let i = 0; i < pairs; i++) {
      const h = g[i];
      const qa = p + i * ts;
      const qb = p + span - i * ts;
      s0 += h * (b[qa] + b[qb]);
      s1 += h * (b[qa + d1] + b[qb + d1]);
      s2 += h * (b[qa + d2] + b[qb + d2]);
      s3 += h * (b[qa + d3] + b[qb + d3]);
    }
    const q = p + cAt;
    const o = o0 + j * os;
    out[o] = s0 + c * b[q];
    out[o + os] = s1 + c * b[q + d1];
    out[o + 2 * os] = s2 + c * b[q + d2];
    out[o + 3 * os] = s3 + c * b[q + d3];
  }
  for (; j < count; j++) {
    const p = b0 + j * stride;
    let s0 = 0;
    for (let i = 0; i < pairs; i++) s0 += g[i] * (b[p + i * ts] + b[p + span - i * ts]);
    out[o0 + j * os] = s0 + c * b[p + cAt];
  }
}

/**
 * out[o0 + j os] = sum_{i < n} a[a0 + i] b[b0 + j stride + i] for j < count.
 * Eight (then four) outputs at a time share each tap load and keep independent
 * sums in flight; on this machine that halves the time per multiply-add. Every
 * output is summed in the same order whichever branch computes it, so the result
 * does not depend on how the input was cut into blocks, to the last bit.
 */
function firRun(
  a: Float64Array,
  a0: number,
  n: number,
  b: Float64Array,
  b0: number,
  stride: number,
  count: number,
  out: Float64Array,
  o0: number,
  os: number,
): void {
  let j = 0;
  for (; j + 7 < count; j += 8) {
    const p = b0 + j * stride - a0;
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    let s4 = 0;
    let s5 = 0;
    let s6 = 0;
    let s7 = 0;
    for (let i = a0; i < a0 + n; i++) {
      const h = a[i];
      const q = p + i;
      s0 += h * b[q];
      s1 += h * b[q + stride];
      s2 += h * b[q + 2 * stride];
      s3 += h * b[q + 3 * stride];
      s4 += h * b[q + 4 * stride];
      s5 += h * b[q + 5 * stride];
      s6 += h * b[q + 6 * stride];
      s7 += h * b[q + 7 * stride];
    }
    const o = o0 + j * os;
    out[o] = s0;
    out[o + os] = s1;
    out[o + 2 * os] = s2;
    out[o + 3 * os] = s3;
    out[o + 4 * os] = s4;
    out[o + 5 * os] = s5;
    out[o + 6 * os] = s6;
    out[o + 7 * os] = s7;
  }
  for (; j + 3 < count; j += 4) {
    const p = b0 + j * stride - a0;
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    for (let i = a0; i < a0 + n; i++) {
      const h = a[i];
      const q = p + i;
      s0 += h * b[q];
      s1 += h * b[q + stride];
      s2 += h * b[q + 2 * stride];
      s3 += h * b[q + 3 * stride];
    }
    const o = o0 + j * os;
    out[o] = s0;
    out[o + os] = s1;
    out[o + 2 * os] = s2;
    out[o + 3 * os] = s3;
  }
  for (; j < count; j++) {
    const p = b0 + j * stride - a0;
    let s0 = 0;
    for (let i = a0; i < a0 + n; i++) s0 += a[i] * b[p + i];
    out[o0 + j * os] = s0;
  }
}
