// The building blocks of the SNR theory: erfc and the closed-form partial moments
// of the three input densities, checked against published values and against
// numerical integration of each density's definition done here in the test.
import { describe, expect, it } from 'vitest';
import {
  type Density,
  clipNoise,
  densityOf,
  GaussianDensity,
  innerMoments,
  intervalMoments,
  LaplacianDensity,
  SineDensity,
} from '../../core/theory/densities';
import { erf, erfc } from '../../core/theory/special';

describe('erfc', () => {
  // Values of the mpmath package (arbitrary precision), which agree with the erfc tables of
  // Abramowitz and Stegun, Handbook of Mathematical Functions (1964), where those reach (from memory).
  const table: [number, number][] = [
    [0.1, 0.8875370839817152],
    [0.5, 0.4795001221869535],
    [1, 0.1572992070502851],
    [2, 0.004677734981047266],
    [2.5, 0.0004069520174449589],
    [2.75, 0.0001006219221196368],
    [3, 2.209049699858544e-5],
    [5, 1.537459794428035e-12],
    [10, 2.088487583762545e-45],
  ];
  it('matches tabulated values: 5e-16 absolute everywhere, 1e-14 relative in the tail', () => {
    for (const [x, v] of table) {
      expect(Math.abs(erfc(x) - v), `erfc(${x})`).toBeLessThan(5e-16);
      if (x >= 2.5) expect(Math.abs(erfc(x) / v - 1), `erfc(${x})`).toBeLessThan(1e-14);
    }
  });

  it('gives the 68-95 rule of the normal distribution', () => {
    // P(|z| < 1) and P(|z| < 2) for a standard normal variable (common practice, no source).
    expect(erf(1 / Math.SQRT2)).toBeCloseTo(0.682689492137086, 14);
    expect(erf(2 / Math.SQRT2)).toBeCloseTo(0.954499736103642, 14);
  });

  it('is continuous where its two expansions meet and keeps erfc(-x) = 2 - erfc(x)', () => {
    // erfc is smooth (its derivative is -2/sqrt(pi) exp(-x^2)): a jump at 2.5 would be a bug
    // (common practice, no source).
    const below = erfc(2.5 - 1e-12);
    const above = erfc(2.5);
    const slope = (2 / Math.sqrt(Math.PI)) * Math.exp(-6.25);
    expect(Math.abs(below - above - slope * 1e-12)).toBeLessThan(1e-15);
    for (const x of [0.3, 1.7, 4.2]) expect(erfc(-x)).toBeCloseTo(2 - erfc(x), 15);
  });
});

/** Composite Simpson rule with n (even) panels. */
function simpson(f: (x: number) => number, a: number, b: number, n = 20000): number {
  const h = (b - a) / n;
  let s = f(a) + f(b);
  for (let i = 1; i < n; i++) s += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return (s * h) / 3;
}

/** Moments of x^0, x^1, x^2 over [a, b] by quadrature of the density's defining formula. */
function quadratureMoments(d: Density, a: number, b: number): number[] {
  if (d instanceof SineDensity) {
    // Arcsine density 1/(pi sqrt(A^2 - x^2)); x = A sin(theta) removes the end singularities.
    const A = d.amplitude;
    const lo = Math.asin(Math.max(-1, Math.min(1, a / A)));
    const hi = Math.asin(Math.max(-1, Math.min(1, b / A)));
    return [0, 1, 2].map((j) => simpson((t) => Math.pow(A * Math.sin(t), j) / Math.PI, lo, hi));
  }
  const p =
    d instanceof GaussianDensity
      ? (x: number) => Math.exp(-0.5 * (x / d.sigma) ** 2) / (d.sigma * Math.sqrt(2 * Math.PI))
      : (x: number) => {
          const bb = (d as LaplacianDensity).sigma / Math.SQRT2;
          return Math.exp(-Math.abs(x) / bb) / (2 * bb);
        };
  const lo = Math.max(a, -40 * d.rms);
  const hi = Math.min(b, 40 * d.rms);
  // Split at 0, where the Laplacian has its kink.
  const parts =
    lo < 0 && hi > 0
      ? [
          [lo, 0],
          [0, hi],
        ]
      : [[lo, hi]];
  return [0, 1, 2].map((j) => parts.reduce((s, [u, v]) => s + simpson((x) => x ** j * p(x), u, v), 0));
}

function closedFormMoments(d: Density, a: number, b: number): number[] {
  const ta = new Float64Array(3);
  const tb = new Float64Array(3);
  const tz = new Float64Array(3);
  const m = new Float64Array(3);
  d.tails(Math.abs(a), ta, 0);
  d.tails(Math.abs(b), tb, 0);
  d.tails(0, tz, 0);
  intervalMoments(a, b, ta, 0, tb, 0, tz, m);
  return Array.from(m);
}

const densities: Density[] = [new SineDensity(0.8), new GaussianDensity(0.3), new LaplacianDensity(0.3)];
const intervals: [number, number][] = [
  [-Infinity, -0.5],
  [-0.9, -0.2],
  [-0.35, 0.1],
  [0, 0.05],
  [0.2, 0.21],
  [0.6, 0.79],
  [0.5, Infinity],
];

describe('closed-form partial moments', () => {
  it('equal numerical integration of each density, on both sides of zero and in the tails', () => {
    // Definitions of the arcsine (sine at random phase), Gaussian and Laplacian densities,
    // integrated numerically (common practice, no source).
    for (const d of densities) {
      for (const [a, b] of intervals) {
        const exact = closedFormMoments(d, a, b);
        const quad = quadratureMoments(d, a, b);
        for (let j = 0; j < 3; j++) {
          expect(Math.abs(exact[j] - quad[j]), `${d.shape} [${a}, ${b}] x^${j}`).toBeLessThan(1e-9);
        }
      }
    }
  });

  it('give total probability 1, power rms^2 and the known mean magnitudes', () => {
    // E|x|: sine 2A/pi, Gaussian sigma sqrt(2/pi), Laplacian sigma/sqrt(2) (common practice, no source).
    const expected: Record<string, number> = {
      sine: (2 * 0.8) / Math.PI,
      gaussian: 0.3 * Math.sqrt(2 / Math.PI),
      laplacian: 0.3 / Math.SQRT2,
    };
    const scratch = new Float64Array(6);
    const m = new Float64Array(3);
    for (const d of densities) {
      innerMoments(d, Infinity, scratch, m);
      expect(m[0]).toBeCloseTo(1, 14);
      expect(m[1]).toBeCloseTo(expected[d.shape], 14);
      expect(m[2]).toBeCloseTo(d.rms * d.rms, 14);
    }
  });

  it('give the clipping noise E[(|x|-V)^2; |x|>V] of numerical integration', () => {
    // Definition of clipping (overload) noise, integrated numerically (common practice, no source).
    const scratch = new Float64Array(3);
    for (const d of densities) {
      for (const v of [0.25, 0.5, 0.75]) {
        const quad =
          d instanceof SineDensity
            ? 2 *
              simpson(
                (t) => (d.amplitude * Math.sin(t) - v) ** 2 / Math.PI,
                Math.asin(Math.min(1, v / d.amplitude)),
                Math.PI / 2,
              )
            : (() => {
                const q = quadratureMoments(d, v, Infinity);
                return 2 * (q[2] - 2 * v * q[1] + v * v * q[0]);
              })();
        expect(Math.abs(clipNoise(d, v, scratch) - quad), `${d.shape} V=${v}`).toBeLessThan(1e-10);
      }
    }
  });

  it('keep relative accuracy for overload probabilities far below 1e-16', () => {
    // Gaussian tail P(z > 10) = erfc(10/sqrt(2))/2 = 7.619853024160526e-24 (value of the mpmath package).
    const t = new Float64Array(3);
    densityOf('gaussian', 1).tails(10, t, 0);
    expect(Math.abs(t[0] / 7.619853024160525e-24 - 1)).toBeLessThan(1e-12);
  });
});
