// Sine test tones. The phase of sample n is computed from n directly (never
// accumulated), exactly modulo the period when frequency and rate are whole
// numbers, so a 10 s tone is as clean at its end as at its start.

const TWO_PI = 2 * Math.PI;

/**
 * Fills `out` with amplitude * sin(2 pi f n / rate + phase) for
 * n = start .. start + out.length - 1.
 */
export function fillSine(
  out: Float64Array | Float32Array,
  amplitude: number,
  frequencyHz: number,
  rateHz: number,
  phase = 0,
  start = 0,
): void {
  if (!(rateHz > 0)) throw new RangeError(`sample rate must be > 0 (got ${rateHz})`);
  const exact =
    Number.isInteger(frequencyHz) &&
    Number.isInteger(rateHz) &&
    Number.isInteger(start) &&
    Math.abs(frequencyHz) * (start + out.length) < Number.MAX_SAFE_INTEGER;
  const f = frequencyHz / rateHz;
  for (let i = 0; i < out.length; i++) {
    const n = start + i;
    let cycles: number;
    if (exact) {
      cycles = ((frequencyHz * n) % rateHz) / rateHz;
    } else {
      const c = f * n;
      cycles = c - Math.floor(c);
    }
    out[i] = amplitude * Math.sin(TWO_PI * cycles + phase);
  }
}

/** A new sine block of `length` samples. */
export function sineBlock(
  length: number,
  amplitude: number,
  frequencyHz: number,
  rateHz: number,
  phase = 0,
): Float64Array {
  const out = new Float64Array(length);
  fillSine(out, amplitude, frequencyHz, rateHz, phase);
  return out;
}
