// Lowpass FIR design by the Kaiser window method: an ideal (sinc) lowpass cut off
// half way across the transition band, shaped by a Kaiser window whose beta and
// length follow from the wanted stopband attenuation and transition width
// (J. F. Kaiser, "Nonrecursive digital filter design using the I0-sinh window
// function", Proc. IEEE ISCAS 1974; the same formulas in Oppenheim and Schafer,
// Discrete-Time Signal Processing). The window method gives about the same ripple
// in passband and stopband (delta), so the stopband figure sets the passband too:
// 60 dB leaves a passband ripple near 0.02 dB peak to peak.
//
// Half-band filters: a lowpass cut off at a quarter of its rate, with the band edges
// symmetric about it (pass + stop = rate / 2). Its ideal response sinc(t / 2) is
// zero at every even t except the centre, and the window keeps those zeros, so
// nearly half the taps are zero and a rate changer by 2 skips them (polyphase.ts).
// Its response is complementary, H(f) + H(rate/2 - f) = 2 h[centre] = 1, so the
// passband deviation equals the stopband's delta exactly (P. P. Vaidyanathan,
// Multirate Systems and Filter Banks, 1993, on half-band filters, from memory).

/** What a lowpass prototype must do; frequencies in Hz at `rateHz`. */
export interface LowpassSpec {
  rateHz: number;
  /** Passband edge: gain within the ripple from 0 up to here. */
  passHz: number;
  /** Stopband edge: attenuation at least `attenuationDb` from here to rateHz/2. */
  stopHz: number;
  /** Stopband attenuation the Kaiser formulas are asked for, dB (> 0). */
  attenuationDb: number;
}

export interface LowpassDesign extends LowpassSpec {
  /** Linear-phase taps (odd length, symmetric), DC gain exactly 1. */
  readonly taps: Float64Array;
  readonly beta: number;
  /** Group delay in samples at `rateHz`: (length - 1) / 2, a whole number. */
  readonly delay: number;
  /**
   * A half-band design: length 4K - 1, centre tap exactly 1/2, every other tap
   * exactly 0 (those at an even, non-zero distance from the centre).
   */
  readonly halfband: boolean;
}

/** Kaiser's beta for a stopband attenuation in dB (Kaiser 1974). */
export function kaiserBeta(attenuationDb: number): number {
  const a = attenuationDb;
  if (a > 50) return 0.1102 * (a - 8.7);
  if (a >= 21) return 0.5842 * Math.pow(a - 21, 0.4) + 0.07886 * (a - 21);
  return 0;
}

/**
 * Filter order M (length M + 1) for an attenuation and a transition width given as
 * a fraction of the sample rate: M = (A - 8) / (2.285 * 2 pi * width) (Kaiser 1974).
 * Rounded up to an even order so the length is odd and the delay a whole sample.
 */
export function kaiserOrder(attenuationDb: number, transitionWidth: number): number {
  if (!(transitionWidth > 0 && transitionWidth < 0.5))
    throw new RangeError(`transition width must be within (0, 0.5) of the rate (got ${transitionWidth})`);
  const m = Math.ceil((attenuationDb - 8) / (2.285 * 2 * Math.PI * transitionWidth));
  const order = Math.max(2, m);
  return order % 2 === 0 ? order : order + 1;
}

/** Modified Bessel function of the first kind, order zero, by its power series. */
export function besselI0(x: number): number {
  const q = (x * x) / 4;
  let term = 1;
  let sum = 1;
  for (let k = 1; k < 500; k++) {
    term *= q / (k * k);
    sum += term;
    if (term < sum * 1e-17) break;
  }
  return sum;
}

/** Kaiser window of `length` points: I0(beta sqrt(1 - r^2)) / I0(beta), r from -1 to 1. */
export function kaiserWindow(length: number, beta: number): Float64Array {
  const w = new Float64Array(length);
  if (length === 1) {
    w[0] = 1;
    return w;
  }
  const half = (length - 1) / 2;
  const norm = besselI0(beta);
  for (let n = 0; n < length; n++) {
    const r = (n - half) / half;
    w[n] = besselI0(beta * Math.sqrt(Math.max(0, 1 - r * r))) / norm;
  }
  return w;
}

function checkSpec(spec: LowpassSpec): void {
  const { rateHz, passHz, stopHz, attenuationDb } = spec;
  if (!(rateHz > 0)) throw new RangeError(`rate must be > 0 (got ${rateHz})`);
  if (!(passHz > 0 && passHz < stopHz && stopHz <= rateHz / 2))
    throw new RangeError(
      `lowpass edges must satisfy 0 < pass < stop <= rate/2 (got ${passHz}, ${stopHz}, ${rateHz})`,
    );
  if (!(attenuationDb > 0)) throw new RangeError(`attenuation must be > 0 dB (got ${attenuationDb})`);
}

/** Kaiser-windowed ideal lowpass cut off at fc (cycles per sample), of even order. */
function windowedSinc(order: number, fc: number, beta: number): Float64Array {
  const length = order + 1;
  const w = kaiserWindow(length, beta);
  const taps = new Float64Array(length);
  const mid = order / 2;
  for (let n = 0; n < length; n++) {
    const t = n - mid;
    const ideal = t === 0 ? 2 * fc : Math.sin(2 * Math.PI * fc * t) / (Math.PI * t);
    taps[n] = ideal * w[n];
  }
  return taps;
}

/** Designs a linear-phase lowpass meeting `spec` by the Kaiser window method. */
export function designLowpass(spec: LowpassSpec): LowpassDesign {
  checkSpec(spec);
  const { rateHz, passHz, stopHz, attenuationDb } = spec;
  const order = kaiserOrder(attenuationDb, (stopHz - passHz) / rateHz);
  const beta = kaiserBeta(attenuationDb);
  // Ideal lowpass cut off mid-transition, in cycles per sample.
  const taps = windowedSinc(order, (passHz + stopHz) / 2 / rateHz, beta);
  let sum = 0;
  for (let n = 0; n < taps.length; n++) sum += taps[n];
  // Unit DC gain, so a level in dBov means the same before and after the filter.
  for (let n = 0; n < taps.length; n++) taps[n] /= sum;
  return { rateHz, passHz, stopHz, attenuationDb, taps, beta, delay: order / 2, halfband: false };
}

/**
 * Designs a half-band lowpass (pass + stop = rate / 2 exactly) by the Kaiser window
 * method. The order is the Kaiser estimate rounded up to 4K - 2, so the outermost
 * taps are not among the zeros; the zeros and the centre's 1/2 are set exactly, and
 * the other taps scaled to sum to 1/2, which keeps both unit DC gain and the
 * complementary response.
 */
export function designHalfband(spec: LowpassSpec): LowpassDesign {
  checkSpec(spec);
  const { rateHz, passHz, stopHz, attenuationDb } = spec;
  if (Math.abs(passHz + stopHz - rateHz / 2) > 1e-9 * rateHz)
    throw new RangeError(
      `a half-band filter needs pass + stop = rate/2 (got ${passHz} + ${stopHz}, rate ${rateHz})`,
    );
  const estimate = kaiserOrder(attenuationDb, (stopHz - passHz) / rateHz);
  const order = estimate % 4 === 2 ? estimate : estimate + 2;
  const beta = kaiserBeta(attenuationDb);
  const taps = windowedSinc(order, 0.25, beta);
  const mid = order / 2;
  let odd = 0;
  for (let n = 0; n < taps.length; n++) {
    if ((n - mid) % 2 === 0) taps[n] = 0;
    else odd += taps[n];
  }
  for (let n = 0; n < taps.length; n++) taps[n] *= 0.5 / odd;
  taps[mid] = 0.5;
  return { rateHz, passHz, stopHz, attenuationDb, taps, beta, delay: mid, halfband: true };
}
