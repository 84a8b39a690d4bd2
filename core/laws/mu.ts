// Continuous mu-law characteristic on the normalised range [-1, 1].
// log1p/expm1 keep expand(compress(x)) exact to ~1e-16 even for small mu.

const SMALL_MU = 1e-8;

/** Compress x (|x| <= 1 is the design range) with parameter mu >= 0; mu = 0 is the identity. */
export function muCompress(x: number, mu: number): number {
  if (mu === 0) return x;
  const m = Math.abs(x);
  // Below 1e-8 the quotient of logs loses digits (mu*x can even underflow); the
  // first-order series is exact to O(mu^2) there.
  const y = mu < SMALL_MU ? m * (1 + 0.5 * mu * (1 - m)) : Math.log1p(mu * m) / Math.log1p(mu);
  return x < 0 ? -y : y;
}

/** Inverse of muCompress. */
export function muExpand(y: number, mu: number): number {
  if (mu === 0) return y;
  const m = Math.abs(y);
  const x = mu < SMALL_MU ? m * (1 - 0.5 * mu * (1 - m)) : Math.expm1(m * Math.log1p(mu)) / mu;
  return y < 0 ? -x : x;
}

/** Slope of the compressor at |x|, used by the granular-noise integral. */
export function muSlope(x: number, mu: number): number {
  if (mu === 0) return 1;
  return mu / ((1 + mu * Math.abs(x)) * Math.log1p(mu));
}

export function checkMu(mu: number): void {
  if (!Number.isFinite(mu) || mu < 0) throw new RangeError(`mu must be a finite number >= 0 (got ${mu})`);
}
