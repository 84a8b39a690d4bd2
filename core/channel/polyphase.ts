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
// Each keeps a linear buffer: the last (taps - 1) inputs, then the block. Every
// output is a dot product over one contiguous run of it, and runs of neighbouring
// outputs are computed together (see firRun), which is what makes them fast.

export class FirDecimator {
  readonly factor: number;
  readonly length: number;
  /** Largest block process() accepts. */
  readonly maxInput: number;
  /** Taps reversed, so a dot product runs forward over the buffer. */
  private readonly rev: Float64Array;
  /** [length - 1 history | up to maxInput new samples]. */
  private readonly buf: Float64Array;
  /** Input samples until the next kept one (0: the next input is kept). */
  private wait = 0;

  constructor(taps: Float64Array, factor: number, maxInput: number) {
    checkShape(taps, factor, maxInput);
    this.factor = factor;
    this.length = taps.length;
    this.maxInput = maxInput;
    this.rev = taps.slice().reverse();
    this.buf = new Float64Array(taps.length - 1 + maxInput);
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
    const hist = this.length - 1;
    const buf = this.buf;
    for (let i = 0; i < n; i++) buf[hist + i] = input[inStart + i];
    const count = this.outputsFor(n);
    // The window of block sample q is buf[q .. q + length), ending on the sample itself.
    firRun(this.rev, 0, this.length, buf, this.wait, this.factor, count, output, outStart, 1);
    this.wait = count > 0 ? this.wait + count * this.factor - n : this.wait - n;
    buf.copyWithin(0, n, n + hist);
    return count;
  }
}

export class FirInterpolator {
  readonly factor: number;
  readonly length: number;
  readonly maxInput: number;
  /** Taps per phase: ceil(length / factor). */
  readonly phaseLength: number;
  /** Phase r at [r K, (r + 1) K): factor * h[j factor + r], reversed, zero-padded. */
  private readonly phases: Float64Array;
  private readonly buf: Float64Array;

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
    for (let i = 0; i < n; i++) buf[hist + i] = input[inStart + i];
    for (let r = 0; r < factor; r++)
      firRun(this.phases, r * k, k, buf, 0, 1, n, output, outStart + r, factor);
    buf.copyWithin(0, n, n + hist);
  }
}

function checkShape(taps: Float64Array, factor: number, maxInput: number): void {
  if (!Number.isInteger(factor) || factor < 1) throw new RangeError(`factor must be a whole number >= 1`);
  if (taps.length < 1) throw new RangeError('a filter needs at least one tap');
  if (!Number.isInteger(maxInput) || maxInput < 1)
    throw new RangeError(`maxInput must be a whole number >= 1`);
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
