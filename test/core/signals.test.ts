// Test signals: the seeded generator, Gaussian and Laplacian noise, and sine tones,
// checked against the textbook properties of each distribution and against an
// independent FFT (the npm package fft.js).
import FFT from 'fft.js';
import { describe, expect, it } from 'vitest';
import { measureSnr, SnrAccumulator, snrDb } from '../../core/measure/snr';
import { fillGaussian, fillLaplacian, gaussianBlock, laplacianBlock } from '../../core/signals/noise';
import { fillUniform, Xoshiro128 } from '../../core/signals/random';
import { fillSine, sineBlock } from '../../core/signals/tone';

function moments(x: ArrayLike<number>) {
  let m1 = 0;
  for (let i = 0; i < x.length; i++) m1 += x[i];
  m1 /= x.length;
  let m2 = 0;
  let m4 = 0;
  let abs = 0;
  for (let i = 0; i < x.length; i++) {
    const d = x[i] - m1;
    m2 += d * d;
    m4 += d * d * d * d;
    abs += Math.abs(x[i]);
  }
  m2 /= x.length;
  m4 /= x.length;
  return { mean: m1, variance: m2, kurtosis: m4 / (m2 * m2), meanAbs: abs / x.length };
}

const fraction = (x: ArrayLike<number>, pred: (v: number) => boolean) => {
  let n = 0;
  for (let i = 0; i < x.length; i++) if (pred(x[i])) n++;
  return n / x.length;
};

const N = 1 << 18;

describe('Xoshiro128 generator', () => {
  it('repeats a stream for a seed and gives unrelated streams for nearby seeds', () => {
    // Reproducible demo and test data must come from seeds (house rules; common practice, no source).
    const a = new Xoshiro128(42);
    const b = new Xoshiro128(42);
    const c = new Xoshiro128(43);
    let same = 0;
    for (let i = 0; i < 1000; i++) {
      const va = a.nextUint32();
      expect(b.nextUint32()).toBe(va);
      if (c.nextUint32() === va) same++;
    }
    expect(same).toBe(0);
  });

  it('gives uniform numbers: mean 1/2, variance 1/12, every bit set half of the time', () => {
    // Uniform distribution on [0, 1): mean 1/2, variance 1/12 (common practice, no source).
    const rng = new Xoshiro128(7);
    const u = new Float64Array(N);
    fillUniform(rng, u);
    const m = moments(u);
    // Standard errors: sqrt(1/12/N) = 5.6e-4 for the mean; 1/12 * sqrt(0.8/N) for the variance.
    expect(Math.abs(m.mean - 0.5)).toBeLessThan(5 * 5.6e-4);
    expect(Math.abs(m.variance - 1 / 12)).toBeLessThan(5 * (1 / 12) * Math.sqrt(0.8 / N));
    expect(fraction(u, (v) => v >= 0 && v < 1)).toBe(1);
    const counts = new Array<number>(32).fill(0);
    const words = 1 << 16;
    for (let i = 0; i < words; i++) {
      const w = rng.nextUint32();
      for (let bit = 0; bit < 32; bit++) counts[bit] += (w >>> bit) & 1;
    }
    // Binomial(65536, 1/2): standard deviation 128.
    for (const n of counts) expect(Math.abs(n - words / 2)).toBeLessThan(5 * 128);
  });

  it('keeps the open interval (0, 1) open, safe for logarithms', () => {
    // log(0) would give infinite noise samples (common practice, no source).
    const rng = new Xoshiro128(1);
    let inside = 0;
    for (let i = 0; i < 100000; i++) {
      const u = rng.nextOpenFloat();
      if (u > 0 && u < 1) inside++;
    }
    expect(inside).toBe(100000);
  });
});

describe('noise generators', () => {
  it('Gaussian: mean 0, variance sigma^2, kurtosis 3, and the 68-95 rule', () => {
    // Normal distribution: kurtosis 3, P(|x| < sigma) = 0.6827, P(|x| < 2 sigma) = 0.9545
    // (common practice, no source).
    const sigma = 0.25;
    const x = gaussianBlock(new Xoshiro128(3), N, sigma);
    const m = moments(x);
    expect(Math.abs(m.mean)).toBeLessThan(5 * (sigma / Math.sqrt(N)));
    expect(Math.abs(m.variance / (sigma * sigma) - 1)).toBeLessThan(5 * Math.sqrt(2 / N));
    expect(Math.abs(m.kurtosis - 3)).toBeLessThan(5 * Math.sqrt(24 / N));
    expect(Math.abs(fraction(x, (v) => Math.abs(v) < sigma) - 0.682689)).toBeLessThan(0.005);
    expect(Math.abs(fraction(x, (v) => Math.abs(v) < 2 * sigma) - 0.9545)).toBeLessThan(0.003);
  });

  it('Laplacian: variance sigma^2, kurtosis 6, E|x| = sigma/sqrt(2), P(|x| > sigma) = exp(-sqrt(2))', () => {
    // Laplace distribution of scale b = sigma/sqrt(2): kurtosis 6, E|x| = b,
    // P(|x| > t) = exp(-t/b) (common practice, no source).
    const sigma = 0.1;
    const x = laplacianBlock(new Xoshiro128(4), N, sigma);
    const m = moments(x);
    expect(Math.abs(m.mean)).toBeLessThan(5 * (sigma / Math.sqrt(N)));
    expect(Math.abs(m.variance / (sigma * sigma) - 1)).toBeLessThan(5 * Math.sqrt(5 / N));
    expect(Math.abs(m.kurtosis - 6)).toBeLessThan(0.3);
    expect(Math.abs(m.meanAbs / (sigma / Math.SQRT2) - 1)).toBeLessThan(0.01);
    expect(Math.abs(fraction(x, (v) => Math.abs(v) > sigma) - Math.exp(-Math.SQRT2))).toBeLessThan(0.004);
  });

  it('fill a Float32Array as well, and depend only on the seed', () => {
    // Same seed, same samples: the worklet and the offline analysis must agree (DESIGN, one source
    // of truth per number; common practice, no source).
    const a = new Float32Array(1000);
    const b = new Float64Array(1000);
    fillGaussian(new Xoshiro128(9), a);
    fillGaussian(new Xoshiro128(9), b);
    expect(a).toEqual(Float32Array.from(b));
    const c = new Float64Array(1000);
    fillLaplacian(new Xoshiro128(9), c);
    expect(c).not.toEqual(b);
  });
});

describe('sine tones', () => {
  it('have RMS A/sqrt(2) over whole periods', () => {
    // RMS of a sine of amplitude A (common practice, no source).
    const x = sineBlock(48000, 0.7, 997, 48000, 0.4);
    expect(Math.sqrt(moments(x).variance + moments(x).mean ** 2)).toBeCloseTo(0.7 / Math.SQRT2, 12);
  });

  it('sit in one FFT bin at their frequency, 250 dB above every other bin', () => {
    // Spectrum by the npm package fft.js as an independent oracle. fft.js needs a power-of-two
    // size, so the tone is 997 Hz at a rate of 65536 Hz: 997 whole cycles, bin 997 exactly.
    const size = 65536;
    const x = new Float64Array(size);
    fillSine(x, 1, 997, size);
    const fft = new FFT(size);
    const spectrum = fft.createComplexArray();
    fft.realTransform(spectrum, Array.from(x));
    let peak = 0;
    let peakBin = -1;
    let rest = 0;
    for (let k = 0; k <= size / 2; k++) {
      const p = spectrum[2 * k] ** 2 + spectrum[2 * k + 1] ** 2;
      if (p > peak) {
        rest = Math.max(rest, peak);
        peak = p;
        peakBin = k;
      } else rest = Math.max(rest, p);
    }
    expect(peakBin).toBe(997);
    expect(10 * Math.log10(peak / rest)).toBeGreaterThan(250);
  });

  it('stay exact over long runs: the phase comes from the sample index, not an accumulator', () => {
    // A tone at an integer frequency repeats every `rate` samples exactly (common practice, no source).
    const head = new Float64Array(16);
    const tail = new Float64Array(16);
    fillSine(head, 1, 997, 48000, 0.1, 0);
    fillSine(tail, 1, 997, 48000, 0.1, 9 * 48000);
    expect(tail).toEqual(head);
    const frac = new Float64Array(4);
    fillSine(frac, 1, 1000.5, 8000, 0, 16000);
    for (let i = 0; i < 4; i++) {
      expect(frac[i]).toBeCloseTo(Math.sin((2 * Math.PI * 1000.5 * (16000 + i)) / 8000), 9);
    }
  });
});

describe('plain SNR measurement', () => {
  it('is signal power over error power, in dB', () => {
    // Definition of SNR (common practice, no source): x and x + e with e of known power.
    const x = new Float64Array([1, -1, 1, -1]);
    const y = new Float64Array([1.1, -0.9, 0.9, -1.1]);
    const m = measureSnr(x, y);
    expect(m.signalPower).toBeCloseTo(1, 15);
    expect(m.noisePower).toBeCloseTo(0.01, 15);
    expect(m.snrDb).toBeCloseTo(20, 12);
    expect(snrDb(x, x)).toBe(Infinity);
    expect(measureSnr(x, y, 1, 3).count).toBe(2);
    expect(() => measureSnr(x, y, 2, 9)).toThrow(RangeError);
  });

  it('accumulates blocks to the same SNR, with a standard error that shrinks as 1/sqrt(n)', () => {
    // Batch-means error of a ratio estimator falls as one over the square root of the sample
    // count (common practice, no source).
    const rng = new Xoshiro128(5);
    const x = gaussianBlock(rng, 1 << 16);
    const e = gaussianBlock(rng, 1 << 16, 0.01);
    const y = x.map((v, i) => v + e[i]);
    const acc = new SnrAccumulator(64);
    for (let b = 0; b < 64; b++) acc.add(x, y, b * 1024, (b + 1) * 1024);
    expect(acc.snrDb).toBeCloseTo(measureSnr(x, y).snrDb, 10);
    expect(acc.count).toBe(1 << 16);
    // Signal and noise independent Gaussians: var(ln R) = 4/n, so se = 4.34 * 2/sqrt(n) dB.
    const expected = (10 / Math.LN10) * (2 / Math.sqrt(1 << 16));
    expect(acc.standardErrorDb() / expected).toBeGreaterThan(0.7);
    expect(acc.standardErrorDb() / expected).toBeLessThan(1.3);
    expect(Math.abs(acc.snrDb - 40)).toBeLessThan(5 * expected);
  });
});
