// Delay and gain between a channel's input and output (core/compare/align.ts),
// against the definitions: the cross-correlation sum computed directly, a known
// shift and scale of seeded noise, and rho^2 = S / (S + N) for added noise.
import { describe, expect, it } from 'vitest';
import { crossCorrelation, estimateDelay, leastSquaresGain } from '../../core/compare/align';
import { fillGaussian } from '../../core/signals/noise';
import { Xoshiro128 } from '../../core/signals/random';
import { fillSine } from '../../core/signals/tone';

function noise(n: number, seed: number, sigma = 1): Float64Array {
  const x = new Float64Array(n);
  fillGaussian(new Xoshiro128(seed), x, sigma);
  return x;
}

/** out[n] = g ref[n - d] (+ noise), zero where ref[n - d] does not exist. */
function shifted(ref: Float64Array, d: number, g: number, extra?: Float64Array): Float64Array {
  const out = new Float64Array(ref.length);
  for (let n = 0; n < out.length; n++) {
    const k = n - d;
    out[n] = (k >= 0 && k < ref.length ? g * ref[k] : 0) + (extra?.[n] ?? 0);
  }
  return out;
}

describe('crossCorrelation', () => {
  it('equals the direct sum r[d] = sum a[n] b[n + d] at every lag (definition)', () => {
    const a = noise(300, 1);
    const b = noise(257, 2);
    const maxLag = 320;
    const r = crossCorrelation(a, b, maxLag);
    for (let d = -maxLag; d <= maxLag; d++) {
      let s = 0;
      for (let n = 0; n < a.length; n++) {
        const m = n + d;
        if (m >= 0 && m < b.length) s += a[n] * b[m];
      }
      expect(r[d + maxLag]).toBeCloseTo(s, 9);
    }
  });
});

describe('estimateDelay and leastSquaresGain', () => {
  it('recover a known delay and gain of seeded noise, either way', () => {
    const ref = noise(8000, 3);
    for (const [d, g] of [
      [37, 0.5],
      [-121, 2],
      [0, 1],
      [250, -0.7],
    ]) {
      const out = shifted(ref, d, g);
      const est = estimateDelay(ref, out, 400);
      expect(est.delay).toBe(d);
      // A noiseless copy correlates perfectly (Cauchy-Schwarz equality), inverted when g < 0.
      expect(est.correlation).toBeCloseTo(Math.sign(g), 9);
      expect(Math.abs(est.fraction)).toBeLessThan(0.05);
      const fit = leastSquaresGain(ref, out, est.delay);
      expect(fit.gain).toBeCloseTo(g, 12);
      // No error but rounding: far above any channel.
      expect(fit.snrDb === null || fit.snrDb > 100).toBe(true);
    }
  });

  it('gives rho^2 = S / (S + N) and the SNR back for added noise (the signal model)', () => {
    const ref = noise(40000, 5);
    // Noise 20 dB under the scaled signal: S/N = 100, rho = sqrt(100 / 101) = 0.99504.
    const out = shifted(ref, 12, 0.8, noise(40000, 6, 0.08));
    const est = estimateDelay(ref, out, 100);
    expect(est.delay).toBe(12);
    const fit = leastSquaresGain(ref, out, 12);
    expect(fit.correlation).toBeCloseTo(Math.sqrt(100 / 101), 3);
    expect(fit.gain).toBeCloseTo(0.8, 2);
    expect(fit.snrDb as number).toBeCloseTo(20, 0);
  });

  it('finds half-sample delays between samples and flags periodic signals as ambiguous', () => {
    // A tone with an integer period gives equal peaks one period apart: ambiguous by nature.
    const tone = new Float64Array(4000);
    fillSine(tone, 1, 1000, 8000);
    const t = estimateDelay(tone, shifted(tone, 3, 1), 40);
    expect(t.ambiguity).toBeGreaterThan(0.95);
    // White noise has a single sharp peak.
    const ref = noise(4000, 9);
    expect(estimateDelay(ref, shifted(ref, 3, 1), 40).ambiguity).toBeLessThan(0.2);
    // Averaging two neighbours delays by half a sample: the peak sits between 0 and 1.
    const half = new Float64Array(ref.length);
    for (let n = 1; n < ref.length; n++) half[n] = 0.5 * (ref[n] + ref[n - 1]);
    const h = estimateDelay(ref, half, 10);
    expect(h.delay + h.fraction).toBeCloseTo(0.5, 1);
  });

  it('refuses a negative lag range', () => {
    expect(() => crossCorrelation([1], [1], -1)).toThrow(RangeError);
  });
});
