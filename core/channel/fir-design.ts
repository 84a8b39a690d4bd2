// Lowpass FIR design by the Kaiser window method: an ideal (sinc) lowpass cut off
// half way across the transition band, shaped by a Kaiser window whose beta and
// length follow from the wanted stopband attenuation and transition width
// (J. F. Kaiser, "Nonrecursive digital filter design using the I0-sinh window
// function", Proc. IEEE ISCAS 1974; the same formulas in Oppenheim and Schafer,
// Discrete-Time Signal Processing). The window method gives about the same ripple
// in passband and stopband (delta), so the stopband figure sets the passband too:
// 60 dB leaves a passband ripple near 0.02 dB peak to peak.

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

/** Designs a linear-phase lowpass meeting `spec` by the Kaiser window method. */
export function designLowpass(spec: LowpassSpec): LowpassDesign {
  const { rateHz, passHz, stopHz, attenuationDb } = spec;
  if (!(rateHz > 0)) throw new RangeError(`rate must be > 0 (got ${rateHz})`);
  if (!(passHz > 0 && passHz < stopHz && stopHz <= rateHz / 2))
    throw new RangeError(
      `lowpass edges must satisfy 0 < pass < stop <= rate/2 (got ${passHz}, ${stopHz}, ${rateHz})`,
    );
  if (!(attenuationDb > 0)) throw new RangeError(`attenuation must be > 0 dB (got ${attenuationDb})`);
  const order = kaiserOrder(attenuationDb, (stopHz - passHz) / rateHz);
  const length = order + 1;
  const beta = kaiserBeta(attenuationDb);
  const w = kaiserWindow(length, beta);
  // Ideal lowpass cut off mid-transition, in cycles per sample.
  const fc = (passHz + stopHz) / 2 / rateHz;
  const taps = new Float64Array(length);
  const mid = order / 2;
  let sum = 0;
  for (let n = 0; n < length; n++) {
    const t = n - mid;
    const ideal = t === 0 ? 2 * fc : Math.sin(2 * Math.PI * fc * t) / (Math.PI * t);
    taps[n] = ideal * w[n];
    sum += taps[n];
  }
  // Unit DC gain, so a level in dBov means the same before and after the filter.
  for (let n = 0; n < length; n++) taps[n] /= sum;
  return { rateHz, passHz, stopHz, attenuationDb, taps, beta, delay: mid };
}
