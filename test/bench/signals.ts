// Bench input: seeded, speech-like (Laplacian) samples, the same for every figure.
import { fillLaplacian } from '../../core/signals/noise';
import { Xoshiro128 } from '../../core/signals/random';

/** Samples per call: a block large enough that per-call overhead is small. */
export const BLOCK = 1 << 16;

/** Laplacian noise at an RMS of -20 dBov of full scale, as floats in [-1, 1). */
export function speechLikeFloat(length: number, seed: number): Float32Array {
  const x = new Float32Array(length);
  fillLaplacian(new Xoshiro128(seed), x, 0.1);
  for (let i = 0; i < length; i++) x[i] = Math.max(-1, Math.min(32767 / 32768, x[i]));
  return x;
}

/** The same signal as int16 (float * 32768, rounded). */
export function speechLikeInt16(length: number, seed: number): Int16Array {
  const f = speechLikeFloat(length, seed);
  return Int16Array.from(f, (v) => Math.round(v * 32768));
}
