// Densities a quantizer is designed for. Each is even, so it is given, like the
// densities of the SNR theory, by its upper-tail partial moments
//   T_j(s) = integral from s to infinity of x^j p(x) dx,  j = 0, 1, 2,  s >= 0,
// plus, for the Panter-Dite compander, the tail of the cube root of the density
//   R(s) = integral from s to infinity of p(x)^(1/3) dx
// and its inverse. Everything is in closed form: Gaussian and Laplacian through the
// theory's own densities, measured distributions as piecewise-constant densities.
import { GaussianDensity, LaplacianDensity } from '../theory/densities';
import { erfc } from '../theory/special';

export interface DesignDensity {
  /** Short name for labels: gaussian, laplacian, measured, talker. */
  readonly label: string;
  readonly rms: number;
  /** Magnitude beyond which the density holds no mass. */
  readonly support: number;
  /** Writes T_0(s), T_1(s), T_2(s) into out[at], out[at+1], out[at+2]. */
  tails(s: number, out: Float64Array, at: number): void;
  /** p(s), s >= 0 (right-continuous where a measured density steps). */
  pdf(s: number): number;
  /** R(s): integral of p^(1/3) from s to infinity, s >= 0. */
  rootTail(s: number): number;
  /** The s >= 0 with R(s) = r, for 0 < r <= R(0). */
  rootTailInverse(r: number): number;
}

const SQRT_2PI = Math.sqrt(2 * Math.PI);

/** Upper tail of the standard normal, Q(z) = erfc(z / sqrt 2) / 2. */
function normalTail(z: number): number {
  return 0.5 * erfc(z / Math.SQRT2);
}

/**
 * The z with Q(z) = q, 0 < q < 1: the rational start of Abramowitz and Stegun 26.2.23
 * (error below 4.5e-4), then Newton steps on ln Q (log-concave, so the steps neither
 * overshoot nor lose accuracy where Q is tiny), to float64 precision in a few steps.
 */
export function inverseNormalTail(q: number): number {
  if (!(q > 0 && q < 1)) throw new RangeError(`inverse normal tail: q must lie in (0, 1) (got ${q})`);
  if (q > 0.5) return -inverseNormalTail(1 - q);
  const t = Math.sqrt(-2 * Math.log(q));
  let z =
    t -
    (2.515517 + 0.802853 * t + 0.010328 * t * t) /
      (1 + 1.432788 * t + 0.189269 * t * t + 0.001308 * t * t * t);
  const target = Math.log(q);
  for (let i = 0; i < 12; i++) {
    const qz = normalTail(z);
    const phi = Math.exp(-0.5 * z * z) / SQRT_2PI;
    if (!(qz > 0 && phi > 0)) break;
    const step = ((Math.log(qz) - target) * qz) / phi;
    z += step;
    if (Math.abs(step) <= 1e-15 * Math.max(1, Math.abs(z))) break;
  }
  return z;
}

export class GaussianDesignDensity implements DesignDensity {
  readonly label = 'gaussian';
  readonly rms: number;
  readonly support: number;
  private readonly inner: GaussianDensity;
  /** p^(1/3) is a Gaussian of deviation sqrt(3) sigma times this factor. */
  private readonly rootScale: number;
  private readonly rootSigma: number;
  constructor(readonly sigma: number) {
    this.inner = new GaussianDensity(sigma);
    this.rms = sigma;
    this.support = this.inner.support;
    this.rootSigma = Math.sqrt(3) * sigma;
    this.rootScale = Math.pow(SQRT_2PI * sigma, -1 / 3) * SQRT_2PI * this.rootSigma;
  }
  tails(s: number, out: Float64Array, at: number): void {
    this.inner.tails(s, out, at);
  }
  pdf(s: number): number {
    const z = s / this.sigma;
    return Math.exp(-0.5 * z * z) / (SQRT_2PI * this.sigma);
  }
  rootTail(s: number): number {
    return this.rootScale * normalTail(s / this.rootSigma);
  }
  rootTailInverse(r: number): number {
    const q = r / this.rootScale;
    return q >= 0.5 ? 0 : this.rootSigma * inverseNormalTail(q);
  }
}

export class LaplacianDesignDensity implements DesignDensity {
  readonly label = 'laplacian';
  readonly rms: number;
  readonly support: number;
  private readonly inner: LaplacianDensity;
  private readonly b: number;
  private readonly rootScale: number;
  constructor(readonly sigma: number) {
    this.inner = new LaplacianDensity(sigma);
    this.rms = sigma;
    this.support = this.inner.support;
    this.b = sigma / Math.SQRT2;
    // p^(1/3) = (2b)^(-1/3) exp(-x / 3b): its tail from s is (2b)^(-1/3) 3b exp(-s / 3b).
    this.rootScale = Math.pow(2 * this.b, -1 / 3) * 3 * this.b;
  }
  tails(s: number, out: Float64Array, at: number): void {
    this.inner.tails(s, out, at);
  }
  pdf(s: number): number {
    return Math.exp(-s / this.b) / (2 * this.b);
  }
  rootTail(s: number): number {
    return this.rootScale * Math.exp(-s / (3 * this.b));
  }
  rootTailInverse(r: number): number {
    const q = r / this.rootScale;
    return q >= 1 ? 0 : -3 * this.b * Math.log(q);
  }
}

/**
 * Even density that is constant on each magnitude bin [edges[i], edges[i+1]): the
 * density built from a histogram. `mass[i]` is the probability of |x| in bin i
 * (normalised here). Tails come from suffix sums kept from the top down, so small
 * upper tails keep their accuracy.
 */
export class PiecewiseDensity implements DesignDensity {
  readonly rms: number;
  readonly support: number;
  readonly edges: Float64Array;
  /** Two-sided density value on each bin: mass / (2 width). */
  private readonly height: Float64Array;
  /** Suffix sums at each edge: T_0, T_1, T_2 and R. */
  private readonly t0: Float64Array;
  private readonly t1: Float64Array;
  private readonly t2: Float64Array;
  private readonly r: Float64Array;

  constructor(
    readonly label: string,
    edges: ArrayLike<number>,
    mass: ArrayLike<number>,
  ) {
    const m = mass.length;
    if (m < 1 || edges.length !== m + 1) {
      throw new RangeError(`density: needs one edge more than bins (${edges.length} edges, ${m} bins)`);
    }
    if (!(edges[0] >= 0)) throw new RangeError('density: magnitude edges start at 0 or above');
    let total = 0;
    for (let i = 0; i < m; i++) {
      if (!(edges[i + 1] > edges[i]) || !Number.isFinite(edges[i + 1])) {
        throw new RangeError(`density: edge ${i + 2} does not ascend or is not finite`);
      }
      if (!(mass[i] >= 0) || !Number.isFinite(mass[i]))
        throw new RangeError(`density: bin ${i + 1} has a bad count`);
      total += mass[i];
    }
    if (!(total > 0)) throw new RangeError('density: the histogram is empty');
    this.edges = Float64Array.from(edges);
    this.height = new Float64Array(m);
    for (let i = 0; i < m; i++) this.height[i] = mass[i] / total / (2 * (edges[i + 1] - edges[i]));
    this.t0 = new Float64Array(m + 1);
    this.t1 = new Float64Array(m + 1);
    this.t2 = new Float64Array(m + 1);
    this.r = new Float64Array(m + 1);
    for (let i = m - 1; i >= 0; i--) {
      const a = this.edges[i];
      const b = this.edges[i + 1];
      const h = this.height[i];
      this.t0[i] = this.t0[i + 1] + h * (b - a);
      this.t1[i] = this.t1[i + 1] + (h * (b - a) * (b + a)) / 2;
      this.t2[i] = this.t2[i + 1] + (h * (b - a) * (b * b + a * b + a * a)) / 3;
      this.r[i] = this.r[i + 1] + Math.cbrt(h) * (b - a);
    }
    let top = m;
    while (top > 0 && this.height[top - 1] === 0) top--;
    this.support = this.edges[top];
    // Mass below edges[0] (if edges[0] > 0) is none: the density is zero there.
    this.rms = Math.sqrt(2 * this.t2[0]);
  }

  /** Bin holding s (edges[i] <= s < edges[i+1]), -1 below the first edge, m at or above the last. */
  private binOf(s: number): number {
    const e = this.edges;
    const m = e.length - 1;
    if (s < e[0]) return -1;
    if (s >= e[m]) return m;
    let lo = 0;
    let hi = m - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (e[mid] <= s) lo = mid;
      else hi = mid - 1;
    }
    return lo;
  }

  tails(s: number, out: Float64Array, at: number): void {
    const i = this.binOf(s);
    const m = this.edges.length - 1;
    if (i < 0) {
      out[at] = this.t0[0];
      out[at + 1] = this.t1[0];
      out[at + 2] = this.t2[0];
      return;
    }
    if (i >= m) {
      out[at] = 0;
      out[at + 1] = 0;
      out[at + 2] = 0;
      return;
    }
    const b = this.edges[i + 1];
    const h = this.height[i];
    out[at] = this.t0[i + 1] + h * (b - s);
    out[at + 1] = this.t1[i + 1] + (h * (b - s) * (b + s)) / 2;
    out[at + 2] = this.t2[i + 1] + (h * (b - s) * (b * b + b * s + s * s)) / 3;
  }

  pdf(s: number): number {
    const i = this.binOf(s);
    return i < 0 || i >= this.edges.length - 1 ? 0 : this.height[i];
  }

  rootTail(s: number): number {
    const i = this.binOf(s);
    if (i < 0) return this.r[0];
    if (i >= this.edges.length - 1) return 0;
    return this.r[i + 1] + Math.cbrt(this.height[i]) * (this.edges[i + 1] - s);
  }

  rootTailInverse(r: number): number {
    const m = this.edges.length - 1;
    if (r >= this.r[0]) return this.edges[0];
    if (!(r > 0)) return this.support;
    // Last bin whose suffix at its lower edge is still >= r.
    let lo = 0;
    let hi = m - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (this.r[mid] >= r) lo = mid;
      else hi = mid - 1;
    }
    const c = Math.cbrt(this.height[lo]);
    const b = this.edges[lo + 1];
    if (!(c > 0)) return this.edges[lo];
    const s = b - (r - this.r[lo + 1]) / c;
    return s < this.edges[lo] ? this.edges[lo] : s > b ? b : s;
  }
}

export function gaussianDesignDensity(sigma = 1): GaussianDesignDensity {
  if (!(sigma > 0) || !Number.isFinite(sigma))
    throw new RangeError(`sigma must be a finite number > 0 (got ${sigma})`);
  return new GaussianDesignDensity(sigma);
}

export function laplacianDesignDensity(sigma = 1): LaplacianDesignDensity {
  if (!(sigma > 0) || !Number.isFinite(sigma))
    throw new RangeError(`sigma must be a finite number > 0 (got ${sigma})`);
  return new LaplacianDesignDensity(sigma);
}
