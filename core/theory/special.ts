// Complementary error function in float64: absolute error below 5e-16 everywhere,
// relative error below 1e-14 from x = 2.5 to 10 and 1e-13 beyond (where rounding
// of x^2 inside exp sets the limit), so the small probabilities of overload that
// the theory needs stay meaningful.
//
// Two expansions, both with positive terms only (no cancellation):
// - below SWITCH: erf(x) = 2/sqrt(pi) * exp(-x^2) * sum_n (2x^2)^n x / (2n+1)!!
//   (Abramowitz and Stegun 7.1.6), erfc = 1 - erf;
// - from SWITCH up: Laplace's continued fraction
//   erfc(x) = exp(-x^2)/sqrt(pi) * 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + ...))))
//   (Abramowitz and Stegun 7.1.14), evaluated bottom-up with a fixed depth.

const TWO_OVER_SQRT_PI = 2 / Math.sqrt(Math.PI);
const ONE_OVER_SQRT_PI = 1 / Math.sqrt(Math.PI);
const SWITCH = 2.5;
/** Beyond this erfc(x) < 1e-320: returned as 0. */
const UNDERFLOW = 27;

function erfSeries(x: number): number {
  const x2 = x * x;
  const twoX2 = 2 * x2;
  let term = x;
  let sum = x;
  for (let n = 0; n < 200; n++) {
    term *= twoX2 / (2 * n + 3);
    sum += term;
    if (term < sum * 1e-17) break;
  }
  return TWO_OVER_SQRT_PI * Math.exp(-x2) * sum;
}

/** Continued-fraction depth for full float64 accuracy from x = SWITCH (depths found against an arbitrary-precision erfc). */
function fractionDepth(x: number): number {
  if (x < 3) return 50;
  if (x < 4) return 40;
  if (x < 6) return 28;
  return 16;
}

function erfcFraction(x: number): number {
  let f = x;
  for (let n = fractionDepth(x); n >= 1; n--) f = x + (n * 0.5) / f;
  return (ONE_OVER_SQRT_PI * Math.exp(-x * x)) / f;
}

export function erfc(x: number): number {
  if (x !== x) return NaN;
  if (x < 0) return 2 - erfc(-x);
  if (x >= UNDERFLOW) return 0;
  if (x < SWITCH) return 1 - erfSeries(x);
  return erfcFraction(x);
}

export function erf(x: number): number {
  if (x !== x) return NaN;
  const a = Math.abs(x);
  const r = a < SWITCH ? erfSeries(a) : 1 - erfcFraction(a);
  return x < 0 ? -r : r;
}
