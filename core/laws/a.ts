// Continuous A-law characteristic on the normalised range [-1, 1]:
// linear below 1/A, logarithmic above. A = 1 is the identity.

/** Compress x with parameter A >= 1. */
export function aCompress(x: number, a: number): number {
  const m = Math.abs(x);
  const k = 1 + Math.log(a);
  const y = m < 1 / a ? (a * m) / k : (1 + Math.log(a * m)) / k;
  return x < 0 ? -y : y;
}

/** Inverse of aCompress. */
export function aExpand(y: number, a: number): number {
  const m = Math.abs(y);
  const k = 1 + Math.log(a);
  const x = m < 1 / k ? (m * k) / a : Math.exp(m * k - 1) / a;
  return y < 0 ? -x : x;
}

/** Slope of the compressor at |x|. */
export function aSlope(x: number, a: number): number {
  const m = Math.abs(x);
  const k = 1 + Math.log(a);
  return m < 1 / a ? a / k : 1 / (m * k);
}

export function checkA(a: number): void {
  if (!Number.isFinite(a) || a < 1) throw new RangeError(`A must be a finite number >= 1 (got ${a})`);
}
