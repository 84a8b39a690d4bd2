// SNR of one short frame, in theory: what the recommender predicts for each of a
// talker's frames.
//
// A frame is n samples (160 for 20 ms at 8 kHz) of a Laplacian or Gaussian signal,
// clipped at the input's full scale as the converter that delivered them clips them
// (so a candidate whose overload point is at or beyond full scale never overloads,
// and one just inside it, like G.711 mu-law, overloads by little).
//
// Its SNR has an expectation, the exact theory of the quantizer for that density
// (core/theory, TableTheory), and a spread: over n samples the frame's error power
// wanders around its expectation. Given the frame's own signal power (its level is
// measured, so it is known), the log error power is taken as normal (delta method,
// first order) with the conditional variance
//   v = vE - c^2 / vS,  vS = Var(x^2) / (n E[x^2]^2),  vE = Var(e^2) / (n E[e^2]^2),
//   c = Cov(x^2, e^2) / (n E[x^2] E[e^2]),
// and the mean of 10 log10(S/E) moves up by v/2 nepers (Jensen, second order). The
// moments E[x^4], E[e^4] and E[x^2 e^2] come from the same cells, in centred powers
// (x - y)^k so that nothing is lost to cancellation: a cell narrower than an eighth of
// the frame's RMS takes the density as constant at its midpoint (the linear part of
// the density cancels against the near-symmetric error, leaving a relative error of
// order (width/RMS)^2 / 24, below 1e-3), a wider one three-point Gauss-Legendre on
// pieces no wider than a quarter of the RMS, split at zero (the Laplacian's cusp).
import type { Quantizer, QuantizerTable } from '../quantizers/types';
import { type Density, GaussianDensity, LaplacianDensity } from '../theory/densities';
import { TableTheory } from '../theory/snr-curves';

export type FrameShape = 'laplacian' | 'gaussian';

const NEPER_DB = 10 / Math.LN10;
const SQRT_2PI = Math.sqrt(2 * Math.PI);
// Three-point Gauss-Legendre on [-1, 1].
const GL_X = Math.sqrt(3 / 5);
const GL_W0 = 8 / 9;
const GL_W1 = 5 / 9;

/**
 * A Laplacian or Gaussian clipped at +-V: the density below V plus a point mass at
 * each of +-V holding the tail beyond. Tails follow the theory's convention (from s
 * inclusive), so the mass at V falls in the cell that starts at or below V.
 */
export class ClippedDensity implements Density {
  readonly shape: FrameShape;
  readonly rms: number;
  readonly support: number;
  /** Probability of the point mass at +V (and as much at -V). */
  readonly clipMass: number;
  private readonly base: GaussianDensity | LaplacianDensity;
  private readonly atClip = new Float64Array(3);

  constructor(
    shape: FrameShape,
    readonly sigma: number,
    readonly clip: number,
  ) {
    this.shape = shape;
    this.base = shape === 'gaussian' ? new GaussianDensity(sigma) : new LaplacianDensity(sigma);
    this.base.tails(clip, this.atClip, 0);
    this.clipMass = this.atClip[0];
    // Nudged past V so that the theory's support search keeps the cell holding V.
    this.support = Math.min(clip * (1 + 1e-12), this.base.support);
    const t = new Float64Array(3);
    this.tails(0, t, 0);
    this.rms = Math.sqrt(2 * t[2]);
  }

  tails(s: number, out: Float64Array, at: number): void {
    const v = this.clip;
    if (s > v) {
      out[at] = 0;
      out[at + 1] = 0;
      out[at + 2] = 0;
      return;
    }
    this.base.tails(s, out, at);
    const m = this.clipMass;
    out[at] += m - this.atClip[0];
    out[at + 1] += v * m - this.atClip[1];
    out[at + 2] += v * v * m - this.atClip[2];
  }

  /** Density of the continuous part at |x| = s < V. */
  pdf(s: number): number {
    const g = this.sigma;
    if (this.shape === 'gaussian') {
      const z = s / g;
      return Math.exp(-0.5 * z * z) / (SQRT_2PI * g);
    }
    const b = g / Math.SQRT2;
    return Math.exp(-s / b) / (2 * b);
  }
}

export interface FrameSnr {
  /** RMS level of the clipped frame, dB re the clip (full scale) point. */
  levelDbov: number;
  /** Exact theory: 10 log10(E[x^2] / E[e^2]). */
  theoryDb: number;
  /** Expected frame SNR in dB (theory plus the Jensen term). */
  meanDb: number;
  /** Standard deviation of the frame SNR in dB, given the frame's level. */
  spreadDb: number;
}

/** Frame-SNR theory of one quantizer, reused across levels. */
export class FrameSnrModel {
  private readonly theory: TableTheory;
  private readonly t: Float64Array;
  private readonly y: Float64Array;
  private readonly yAtClip: number;
  private readonly yAtMinusClip: number;
  // Running sums of one evaluation.
  private sx2 = 0;
  private sx4 = 0;
  private se2 = 0;
  private se4 = 0;
  private sxe = 0;

  constructor(
    q: Quantizer,
    readonly frameSamples: number,
    readonly clip: number,
  ) {
    if (!Number.isInteger(frameSamples) || frameSamples < 2) {
      throw new RangeError(`frame: needs a whole number of samples >= 2 (got ${frameSamples})`);
    }
    if (!(clip > 0)) throw new RangeError(`frame: the clip point must be > 0 (got ${clip})`);
    const table: QuantizerTable = q.table();
    this.theory = new TableTheory(table, q.overloadPoint);
    this.t = table.decisions;
    this.y = table.outputs;
    this.yAtClip = q.quantize(clip);
    this.yAtMinusClip = q.quantize(-clip);
  }

  /** Adds the moments of one piece [lo, hi] (same sign) of the continuous part, output y. */
  private piece(d: ClippedDensity, lo: number, hi: number, y: number): void {
    const h = 0.5 * (hi - lo);
    const mid = lo + h;
    for (let j = 0; j < 3; j++) {
      const x = j === 0 ? mid : j === 1 ? mid - GL_X * h : mid + GL_X * h;
      const w = (j === 0 ? GL_W0 : GL_W1) * h * d.pdf(Math.abs(x));
      const x2 = x * x;
      const e = x - y;
      const e2 = e * e;
      this.sx2 += w * x2;
      this.sx4 += w * x2 * x2;
      this.se2 += w * e2;
      this.se4 += w * e2 * e2;
      this.sxe += w * x2 * e2;
    }
  }

  /** Adds a narrow cell [lo, hi] with output y, the density taken as constant p. */
  private narrow(p: number, lo: number, hi: number, y: number): void {
    const ua = lo - y;
    const ub = hi - y;
    const w = hi - lo;
    // Differences of powers written as (b - a) times a sum, exact for narrow cells.
    const a2 = ua * ua;
    const b2 = ub * ub;
    const u2 = (w * (b2 + ua * ub + a2)) / 3;
    const u3 = (w * (ub + ua) * (b2 + a2)) / 4;
    const u4 = (w * (b2 * b2 + b2 * ub * ua + b2 * a2 + ub * ua * a2 + a2 * a2)) / 5;
    const la = lo * lo;
    const lb = hi * hi;
    const x2 = (w * (lb + lo * hi + la)) / 3;
    const x4 = (w * (lb * lb + lb * hi * lo + lb * la + hi * lo * la + la * la)) / 5;
    this.sx2 += p * x2;
    this.sx4 += p * x4;
    this.se2 += p * u2;
    this.se4 += p * u4;
    // x^2 u^2 = (u + y)^2 u^2 = u^4 + 2 y u^3 + y^2 u^2.
    this.sxe += p * (u4 + 2 * y * u3 + y * y * u2);
  }

  private point(mass: number, x: number, y: number): void {
    const x2 = x * x;
    const e = x - y;
    const e2 = e * e;
    this.sx2 += mass * x2;
    this.sx4 += mass * x2 * x2;
    this.se2 += mass * e2;
    this.se4 += mass * e2 * e2;
    this.sxe += mass * x2 * e2;
  }

  /** Frame SNR for frames of a shape whose unclipped RMS is sigma. */
  evaluate(shape: FrameShape, sigma: number): FrameSnr {
    const d = new ClippedDensity(shape, sigma, this.clip);
    const mean = this.theory.evaluate(d);
    this.sx2 = 0;
    this.sx4 = 0;
    this.se2 = 0;
    this.se4 = 0;
    this.sxe = 0;
    // Beyond this reach the continuous part holds nothing that float64 can see.
    const reach = Math.min(this.clip, (shape === 'gaussian' ? 12 : 40) * sigma);
    const width = 0.25 * sigma;
    const t = this.t;
    const y = this.y;
    const last = y.length - 1;
    // First cell that reaches above -reach.
    let lo = 0;
    let hi = t.length;
    while (lo < hi) {
      const m = (lo + hi) >> 1;
      if (t[m] > -reach) hi = m;
      else lo = m + 1;
    }
    for (let k = lo; k <= last; k++) {
      const a = Math.max(k === 0 ? -Infinity : t[k - 1], -reach);
      const b = Math.min(k === last ? Infinity : t[k], reach);
      if (a >= reach) break;
      if (!(b > a)) continue;
      const yk = y[k];
      if (b - a <= 0.5 * width && (a >= 0 || b <= 0)) {
        this.narrow(d.pdf(Math.abs(0.5 * (a + b))), a, b, yk);
        continue;
      }
      // Split at zero, then into pieces no wider than `width`.
      const parts = a < 0 && b > 0 ? 2 : 1;
      for (let p = 0; p < parts; p++) {
        const pa = parts === 2 ? (p === 0 ? a : 0) : a;
        const pb = parts === 2 ? (p === 0 ? 0 : b) : b;
        const count = Math.max(1, Math.ceil((pb - pa) / width));
        const step = (pb - pa) / count;
        for (let i = 0; i < count; i++)
          this.piece(d, pa + i * step, i === count - 1 ? pb : pa + (i + 1) * step, yk);
      }
    }
    if (d.clipMass > 0) {
      this.point(d.clipMass, this.clip, this.yAtClip);
      this.point(d.clipMass, -this.clip, this.yAtMinusClip);
    }
    const n = this.frameSamples;
    const a2 = this.sx2;
    const b2 = this.se2;
    let v = 0;
    if (a2 > 0 && b2 > 0) {
      const vS = (this.sx4 - a2 * a2) / (n * a2 * a2);
      const vE = (this.se4 - b2 * b2) / (n * b2 * b2);
      const c = (this.sxe - a2 * b2) / (n * a2 * b2);
      v = vS > 0 ? vE - (c * c) / vS : vE;
      if (!(v > 0)) v = 0;
    }
    return {
      levelDbov: 20 * Math.log10(d.rms / this.clip),
      theoryDb: mean.snrDb,
      meanDb: mean.snrDb + NEPER_DB * 0.5 * v,
      spreadDb: NEPER_DB * Math.sqrt(v),
    };
  }
}
