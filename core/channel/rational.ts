// Sample-rate conversion by a rational factor L / M, for files whose rate is not a
// whole multiple of the channel rates (the channel path only divides by whole
// factors, rate-plan.ts). Conceptually: zero-stuff by L, lowpass at the high rate
// L * from, keep every M-th sample; a polyphase bank computes only the kept
// samples (R. E. Crochiere and L. R. Rabiner, Multirate Digital Signal Processing,
// 1983, from memory).
//
// Time convention, with input x[k], k = 0, 1, ... since the last reset, and the
// prototype h (N taps at the high rate, gain L):
//   y[m] = sum_k h[m M - k L] x[k]        (emitted when x[floor(m M / L)] arrives)
// Output m at the high-rate instant m M uses phase p = m M mod L of the bank,
// taps h[p + i L] against x[floor(m M / L) - i]: about N / L multiplies each.
//
// The lowpass: Kaiser-windowed sinc (fir-design.ts) stopping at min(from, to) / 2,
// so nothing above the lower Nyquist frequency lands in the output (images on the
// way up, aliases on the way down) above -80 dB; its pass edge is 0.91 of that
// half rate, which keeps 20 kHz at 44.1 kHz (0.91 * 22050 = 20065.5 Hz). The
// window method's passband ripple equals its stopband delta (Kaiser 1974), so at
// 90 dB asked the pass band is flat to about 3e-5 (3e-4 dB), far inside 0.1 dB.
//
// Latency: the prototype is padded at the front with zeros so its delay D is a
// multiple of M; then output m shows the input at output time m - D / M, a whole
// number of output samples (`latency`), which a DelayLine can match.
import type { ChannelRate } from '../spec/types';
import { designLowpass } from './fir-design';

/** Largest up or down factor after reduction; beyond it the bank or the work per sample grows absurd. */
export const MAX_RATIONAL_FACTOR = 1024;
/** Stopband attenuation every conversion reaches, dB. */
export const RATIONAL_STOPBAND_DB = 80;
/** What the Kaiser formulas are asked for: the required figure plus a margin for their approximation. */
export const RATIONAL_DESIGN_DB = 90;
/** Pass edge as a fraction of min(from, to) / 2. */
export const RATIONAL_PASS_FRACTION = 0.91;
/** The rate the channel path is laid out for, and the one files convert to when they must. */
export const PATH_HOME_RATE = 48000;
/** Highest rate a channel or a file may have (as the channel text form allows). */
export const MAX_RATE_HZ = 384000;

function gcd(a: number, b: number): number {
  while (b !== 0) {
    const r = a % b;
    a = b;
    b = r;
  }
  return a;
}

function checkRate(what: string, rate: number): void {
  if (!(Number.isInteger(rate) && rate > 0 && rate <= MAX_RATE_HZ))
    throw new RangeError(`${what} rate must be a whole number of Hz from 1 to ${MAX_RATE_HZ} (got ${rate})`);
}

/** L / M of from -> to, reduced; refuses ratios whose factors exceed MAX_RATIONAL_FACTOR. */
export function rationalFactors(fromRate: number, toRate: number): { up: number; down: number } {
  checkRate('input', fromRate);
  checkRate('output', toRate);
  const g = gcd(fromRate, toRate);
  const up = toRate / g;
  const down = fromRate / g;
  if (up > MAX_RATIONAL_FACTOR || down > MAX_RATIONAL_FACTOR)
    throw new RangeError(
      `cannot convert ${fromRate} Hz to ${toRate} Hz: the ratio reduces to ${up}/${down}, ` +
        `and factors above ${MAX_RATIONAL_FACTOR} would need an absurdly large filter bank`,
    );
  return { up, down };
}

export class RationalResampler {
  readonly fromRate: number;
  readonly toRate: number;
  /** Up factor L (after reduction by the gcd). */
  readonly up: number;
  /** Down factor M. */
  readonly down: number;
  readonly maxBlock: number;
  /** Prototype length at the high rate, front padding included. */
  readonly prototypeLength: number;
  /** Taps per phase K (a multiple of 4); the bank holds up * K. */
  readonly phaseLength: number;
  /** Output sample m shows the input at output time m - latency (whole output samples). */
  readonly latency: number;
  /** Pass and stop edges of the lowpass, Hz (0 and 0 for the identity, from === to). */
  readonly passHz: number;
  readonly stopHz: number;
  /** Most samples one process() call can write: ceil(maxBlock L / M). */
  readonly capacity: number;
  /** Written by process(): the first `count` samples are this block's output. */
  readonly output: Float64Array;
  /** Phase p at [p K, (p + 1) K): h[p + i L] for i = K-1 .. 0 (reversed, so a window reads forward). */
  private readonly bank: Float64Array;
  /** [K - 1 history | up to maxBlock new samples]. */
  private readonly buf: Float64Array;
  private readonly step: number;
  private readonly stepRem: number;
  /** Phase of the next output. */
  private phase = 0;
  /** Block index of the newest input the next output reads (may lie beyond this block). */
  private next = 0;

  constructor(fromRate: number, toRate: number, maxBlock: number) {
    const { up, down } = rationalFactors(fromRate, toRate);
    if (!(Number.isInteger(maxBlock) && maxBlock >= 1))
      throw new RangeError(`maxBlock must be a whole number >= 1 (got ${maxBlock})`);
    this.fromRate = fromRate;
    this.toRate = toRate;
    this.up = up;
    this.down = down;
    this.maxBlock = maxBlock;
    let proto: Float64Array;
    let delay: number;
    if (up === 1 && down === 1) {
      // Same rate: a copy, exact, no latency.
      proto = Float64Array.of(1);
      delay = 0;
      this.passHz = 0;
      this.stopHz = 0;
    } else {
      const nyquist = Math.min(fromRate, toRate) / 2;
      this.passHz = RATIONAL_PASS_FRACTION * nyquist;
      this.stopHz = nyquist;
      const design = designLowpass({
        rateHz: up * fromRate,
        passHz: this.passHz,
        stopHz: this.stopHz,
        attenuationDb: RATIONAL_DESIGN_DB,
      });
      const pad = (down - (design.delay % down)) % down;
      proto = new Float64Array(pad + design.taps.length);
      // Gain L restores the level that zero-stuffing spreads over L samples.
      for (let j = 0; j < design.taps.length; j++) proto[pad + j] = up * design.taps[j];
      delay = design.delay + pad;
    }
    this.prototypeLength = proto.length;
    this.latency = delay / down;
    const k = Math.ceil(proto.length / up / 4) * 4;
    this.phaseLength = k;
    this.bank = new Float64Array(up * k);
    for (let p = 0; p < up; p++)
      for (let i = 0; i < k; i++) {
        const t = p + i * up;
        this.bank[p * k + (k - 1 - i)] = t < proto.length ? proto[t] : 0;
      }
    this.buf = new Float64Array(k - 1 + maxBlock);
    this.step = Math.floor(down / up);
    this.stepRem = down % up;
    this.capacity = Math.ceil((maxBlock * up) / down);
    this.output = new Float64Array(this.capacity);
  }

  /** Filter bank size in taps (up * phaseLength). */
  get bankSize(): number {
    return this.bank.length;
  }

  reset(): void {
    this.buf.fill(0);
    this.phase = 0;
    this.next = 0;
  }

  /** Consumes input[0 .. n), writes the outputs it completes into `output` from 0; returns how many. */
  process(input: ArrayLike<number>, n: number): number {
    if (!(n >= 0 && n <= this.maxBlock))
      throw new RangeError(`rational resampler: block of ${n} exceeds ${this.maxBlock}`);
    const k = this.phaseLength;
    const buf = this.buf;
    const bank = this.bank;
    const out = this.output;
    const up = this.up;
    const step = this.step;
    const rem = this.stepRem;
    for (let i = 0; i < n; i++) buf[k - 1 + i] = input[i];
    let q = this.next;
    let p = this.phase;
    let count = 0;
    // Block sample q sits at buf[k - 1 + q], so its window is buf[q .. q + k).
    while (q < n) {
      const b = p * k;
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      // Four partial sums in flight; always in this order, so any blocking gives the same bits.
      for (let j = 0; j < k; j += 4) {
        s0 += bank[b + j] * buf[q + j];
        s1 += bank[b + j + 1] * buf[q + j + 1];
        s2 += bank[b + j + 2] * buf[q + j + 2];
        s3 += bank[b + j + 3] * buf[q + j + 3];
      }
      out[count++] = s0 + s1 + (s2 + s3);
      p += rem;
      q += step;
      if (p >= up) {
        p -= up;
        q++;
      }
    }
    this.phase = p;
    this.next = q - n;
    buf.copyWithin(0, n, n + k - 1);
    return count;
  }
}

/** How a file at some rate reaches the channel path. */
export interface InputRatePlan {
  fileRateHz: number;
  /** Rate the channel path runs at: the file's own when `direct`. */
  pathRateHz: number;
  /** True: the file's samples go to the path as they are (every channel rate divides the file's). */
  direct: boolean;
  /** Reduced factors of the conversion fileRate -> pathRate (1 and 1 when direct). */
  up: number;
  down: number;
}

/**
 * Whether a file can feed the channel path directly (its rate a whole multiple of
 * every channel rate, or equal; `native` channels take any rate), and if not, what
 * to convert it to: the common multiple of the channel rates nearest 48 kHz. That is
 * 48 kHz itself whenever every channel rate divides it (the path's home rate, so
 * files of any rate meet the very same channel filters), 44.1 kHz for a 44.1 kHz
 * or 11.025 kHz channel.
 */
export function planInputRate(fileRate: number, channelRates: readonly ChannelRate[]): InputRatePlan {
  checkRate('file', fileRate);
  const rates: number[] = [];
  for (const r of channelRates) {
    if (r === 'native') continue;
    checkRate('channel', r);
    if (!rates.includes(r)) rates.push(r);
  }
  if (rates.every((r) => fileRate % r === 0))
    return { fileRateHz: fileRate, pathRateHz: fileRate, direct: true, up: 1, down: 1 };
  let lcm = 1;
  for (const r of rates) {
    lcm = (lcm / gcd(lcm, r)) * r;
    if (lcm > MAX_RATE_HZ)
      throw new RangeError(
        `channels at ${rates.join(', ')} Hz have no common input rate up to ${MAX_RATE_HZ} Hz; ` +
          `analyse them in separate runs`,
      );
  }
  // The common multiple nearest the home rate: the home rate itself when every channel rate divides it.
  const below = Math.max(1, Math.floor(PATH_HOME_RATE / lcm)) * lcm;
  const above = below + lcm;
  const target = above <= MAX_RATE_HZ && above - PATH_HOME_RATE < PATH_HOME_RATE - below ? above : below;
  const { up, down } = rationalFactors(fileRate, target);
  return { fileRateHz: fileRate, pathRateHz: target, direct: false, up, down };
}
