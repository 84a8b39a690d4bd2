// Seeded Gaussian and Laplacian noise blocks, the test signals of the SNR theory.
import type { Xoshiro128 } from './random';

const TWO_PI = 2 * Math.PI;

/** Fills `out` with zero-mean Gaussian samples of standard deviation sigma (Box-Muller, both outputs used). */
export function fillGaussian(rng: Xoshiro128, out: Float64Array | Float32Array, sigma = 1): void {
  const n = out.length;
  let i = 0;
  while (i < n) {
    const r = sigma * Math.sqrt(-2 * Math.log(rng.nextOpenFloat()));
    const angle = TWO_PI * rng.nextFloat();
    out[i++] = r * Math.cos(angle);
    if (i < n) out[i++] = r * Math.sin(angle);
  }
}

/**
 * Fills `out` with zero-mean Laplacian samples of standard deviation sigma:
 * an exponential magnitude of mean sigma/sqrt(2) with a random sign.
 */
export function fillLaplacian(rng: Xoshiro128, out: Float64Array | Float32Array, sigma = 1): void {
  const b = sigma / Math.SQRT2;
  for (let i = 0; i < out.length; i++) {
    const m = -b * Math.log(rng.nextOpenFloat());
    out[i] = (rng.nextUint32() & 1) === 0 ? m : -m;
  }
}

/** A new block of Gaussian noise from a seed. */
export function gaussianBlock(rng: Xoshiro128, length: number, sigma = 1): Float64Array {
  const out = new Float64Array(length);
  fillGaussian(rng, out, sigma);
  return out;
}

/** A new block of Laplacian noise from a seed. */
export function laplacianBlock(rng: Xoshiro128, length: number, sigma = 1): Float64Array {
  const out = new Float64Array(length);
  fillLaplacian(rng, out, sigma);
  return out;
}
