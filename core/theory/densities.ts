// Input densities of the SNR theory, each given by its upper-tail partial moments
//   T_j(s) = integral from s to infinity of x^j p(x) dx,  s >= 0, j = 0, 1, 2,
// in closed form. All three densities are even, so any interval's moments follow
// from T_j at the magnitudes of its ends (see intervalMoments). Working from the
// tails, not from cumulative sums starting at -infinity, keeps the rare overload
// cells accurate: their moments never come from differences of numbers near 1.

import { erfc } from './special';

export type DensityShape = 'sine' | 'gaussian' | 'laplacian';

export const DENSITY_SHAPES: readonly DensityShape[] = ['sine', 'gaussian', 'laplacian'];

export interface Density {
  readonly shape: DensityShape;
  /** RMS value of the input (its power is rms^2). */
  readonly rms: number;
  /** Magnitude beyond which the density holds no mass representable in float64. */
  readonly support: number;
  /** Writes T_0(s), T_1(s), T_2(s) into out[at], out[at+1], out[at+2]; s >= 0 or +Infinity. */
  tails(s: number, out: Float64Array, at: number): void;
}

const INV_PI = 1 / Math.PI;
const INV_SQRT_2PI = 1 / Math.sqrt(2 * Math.PI);

/** Sine of amplitude A at a random phase: arcsine density 1/(pi sqrt(A^2 - x^2)) on (-A, A). */
export class SineDensity implements Density {
  readonly shape = 'sine' as const;
  readonly rms: number;
  readonly support: number;
  constructor(readonly amplitude: number) {
    this.rms = amplitude / Math.SQRT2;
    this.support = amplitude;
  }
  tails(s: number, out: Float64Array, at: number): void {
    const a = this.amplitude;
    if (!(s < a)) {
      out[at] = 0;
      out[at + 1] = 0;
      out[at + 2] = 0;
      return;
    }
    const angle = Math.acos(s / a);
    // sqrt(A^2 - s^2) as sqrt((A-s)(A+s)) stays accurate next to the peak.
    const root = Math.sqrt((a - s) * (a + s));
    out[at] = angle * INV_PI;
    out[at + 1] = root * INV_PI;
    out[at + 2] = (a * a * angle + s * root) * 0.5 * INV_PI;
  }
}

/** Zero-mean Gaussian of standard deviation sigma. */
export class GaussianDensity implements Density {
  readonly shape = 'gaussian' as const;
  readonly rms: number;
  readonly support: number;
  private readonly invSigmaSqrt2: number;
  constructor(readonly sigma: number) {
    this.rms = sigma;
    // exp(-z^2/2) underflows to 0 before z = 39.
    this.support = 39 * sigma;
    this.invSigmaSqrt2 = 1 / (sigma * Math.SQRT2);
  }
  tails(s: number, out: Float64Array, at: number): void {
    const g = this.sigma;
    if (!(s < this.support)) {
      out[at] = 0;
      out[at + 1] = 0;
      out[at + 2] = 0;
      return;
    }
    const z = s / g;
    const phi = INV_SQRT_2PI * Math.exp(-0.5 * z * z);
    const t0 = 0.5 * erfc(s * this.invSigmaSqrt2);
    out[at] = t0;
    out[at + 1] = g * phi;
    out[at + 2] = g * g * t0 + g * s * phi;
  }
}

/** Zero-mean Laplacian of standard deviation sigma: exp(-|x|/b)/(2b), b = sigma/sqrt(2). */
export class LaplacianDensity implements Density {
  readonly shape = 'laplacian' as const;
  readonly rms: number;
  readonly support: number;
  private readonly b: number;
  constructor(readonly sigma: number) {
    this.rms = sigma;
    this.b = sigma / Math.SQRT2;
    // exp(-s/b) underflows to 0 before s = 746 b.
    this.support = 746 * this.b;
  }
  tails(s: number, out: Float64Array, at: number): void {
    const b = this.b;
    if (!(s < this.support)) {
      out[at] = 0;
      out[at + 1] = 0;
      out[at + 2] = 0;
      return;
    }
    const e = 0.5 * Math.exp(-s / b);
    out[at] = e;
    out[at + 1] = (s + b) * e;
    out[at + 2] = (s * s + 2 * b * s + 2 * b * b) * e;
  }
}

/** Density of a given shape and RMS value. */
export function densityOf(shape: DensityShape, rms: number): Density {
  if (!(rms > 0) || !Number.isFinite(rms))
    throw new RangeError(`input RMS must be a finite number > 0 (got ${rms})`);
  switch (shape) {
    case 'sine':
      return new SineDensity(rms * Math.SQRT2);
    case 'gaussian':
      return new GaussianDensity(rms);
    case 'laplacian':
      return new LaplacianDensity(rms);
  }
}

/**
 * Moments of x^0, x^1, x^2 over [a, b] (a < b, either may be infinite) from the tails
 * ta at |a| and tb at |b| (and tz at 0 when a < 0 < b). Writes into out[0..2].
 */
export function intervalMoments(
  a: number,
  b: number,
  ta: Float64Array,
  ia: number,
  tb: Float64Array,
  ib: number,
  tz: Float64Array,
  out: Float64Array,
): void {
  if (a >= 0) {
    out[0] = ta[ia] - tb[ib];
    out[1] = ta[ia + 1] - tb[ib + 1];
    out[2] = ta[ia + 2] - tb[ib + 2];
  } else if (b <= 0) {
    // Mirror onto [|b|, |a|]; odd moment changes sign.
    out[0] = tb[ib] - ta[ia];
    out[1] = ta[ia + 1] - tb[ib + 1];
    out[2] = tb[ib + 2] - ta[ia + 2];
  } else {
    out[0] = tz[0] - ta[ia] + (tz[0] - tb[ib]);
    out[1] = ta[ia + 1] - tz[1] + (tz[1] - tb[ib + 1]);
    out[2] = tz[2] - ta[ia + 2] + (tz[2] - tb[ib + 2]);
  }
}

/** Probability, first absolute and second moments over |x| < s (s >= 0), into out[0..2]. */
export function innerMoments(d: Density, s: number, scratch: Float64Array, out: Float64Array): void {
  d.tails(0, scratch, 0);
  d.tails(s, scratch, 3);
  out[0] = 2 * (scratch[0] - scratch[3]);
  out[1] = 2 * (scratch[1] - scratch[4]);
  out[2] = 2 * (scratch[2] - scratch[5]);
}

/** E[(|x| - s)^2 ; |x| > s]: the clipping noise of an overload point s (s >= 0). */
export function clipNoise(d: Density, s: number, scratch: Float64Array): number {
  d.tails(s, scratch, 0);
  const v = 2 * (scratch[2] - 2 * s * scratch[1] + s * s * scratch[0]);
  return v > 0 ? v : 0;
}
