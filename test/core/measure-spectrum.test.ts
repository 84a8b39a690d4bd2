// O.41 psophometric weighting and the averaged spectra.
import { describe, expect, it } from 'vitest';
import { ChannelMeter } from '../../core/measure/channel-meter';
import { PowerSpectrum, defaultSpectrumSize } from '../../core/measure/spectrum';
import {
  designPsophometricFir,
  firGainAt,
  O41_WEIGHTS_DB,
  PsophometricFilter,
  psophometricWeightDb,
} from '../../core/measure/weighting';
import { createQuantizer } from '../../core/quantizers/index';
import { fillGaussian } from '../../core/signals/noise';
import { Xoshiro128 } from '../../core/signals/random';
import { fillSine } from '../../core/signals/tone';

const RATE = 8000;
const db = (r: number) => 10 * Math.log10(r);

/** Noise with a flat spectrum over [lo, hi] Hz: equal-amplitude tones at random phases, 5 Hz apart. */
function bandNoise(
  length: number,
  lo: number,
  hi: number,
  rate: number,
  seed: number,
): { x: Float64Array; power: number } {
  const rng = new Xoshiro128(seed);
  const x = new Float64Array(length);
  const tone = new Float64Array(length);
  let power = 0;
  for (let f = lo; f <= hi; f += 5) {
    fillSine(tone, 0.01, f, rate, 2 * Math.PI * rng.nextFloat());
    for (let i = 0; i < length; i++) x[i] += tone[i];
    power += 0.01 * 0.01 * 0.5;
  }
  return { x, power };
}

describe('O.41 psophometric weighting', () => {
  it('the designed FIR follows the O.41 table from 200 Hz to 3500 Hz', () => {
    // Source: ITU-T O.41 weighting values (from memory, see weighting.ts); within 0.5 dB at the
    // table's points over the voice band, at 8 and 16 kHz.
    for (const rate of [8000, 16000]) {
      const h = designPsophometricFir(rate);
      for (const [hz, w] of O41_WEIGHTS_DB) {
        if (hz < 200 || hz > 3500) continue;
        const got = 20 * Math.log10(Math.abs(firGainAt(h, hz, rate)));
        expect(Math.abs(got - w), `${rate} Hz rate, ${hz} Hz`).toBeLessThan(hz === 200 ? 1.5 : 0.5);
      }
      // Strongly attenuated hum: at least 30 dB down at 50 Hz.
      expect(20 * Math.log10(Math.abs(firGainAt(h, 50, rate)))).toBeLessThan(-30);
    }
    expect(psophometricWeightDb(800)).toBe(0);
    expect(psophometricWeightDb(1000)).toBe(1);
    expect(psophometricWeightDb(300)).toBe(-10.6);
  });

  it('the fast convolution equals a direct float64 convolution with the designed taps', () => {
    // Source: overlap-save equals linear convolution (common practice, no source); the direct
    // sum below is independent of fft.js.
    const f = new PsophometricFilter(RATE);
    const h = f.taps;
    const x = new Float64Array(3 * f.blockLength + 50);
    fillGaussian(new Xoshiro128(4), x, 0.1);
    for (let i = 0; i < x.length; i += 37) f.add(x, i, Math.min(37, x.length - i));
    expect(f.outputs).toBe(3 * f.blockLength);
    let direct = 0;
    for (let t = 0; t < f.outputs; t++) {
      let y = 0;
      for (let k = 0; k < h.length && k <= t; k++) y += h[k] * x[t - k];
      direct += y * y;
    }
    expect(Math.abs(f.energySum / direct - 1)).toBeLessThan(1e-9);
    // Linear phase: the taps are symmetric.
    for (let k = 0; k < h.length; k++) expect(h[k]).toBeCloseTo(h[h.length - 1 - k], 14);
  });

  it('white noise over 300-3400 Hz loses about 2.5 dB (+-1 dB); an 800 Hz tone passes at 0 dB', () => {
    // Source: weighting white noise over 300-3400 Hz lowers it by about 2.5 dB (common practice,
    // no source); 800 Hz is the reference frequency of O.41 (from memory).
    const n = 2 * RATE;
    const { x, power } = bandNoise(n, 300, 3400, RATE, 41);
    const f = new PsophometricFilter(RATE);
    f.add(x, 0, n);
    expect(f.outputs).toBeGreaterThan(n - f.blockLength);
    const weighted = f.energySum / f.outputs;
    const loss = db(power / weighted);
    expect(loss).toBeGreaterThan(1.5);
    expect(loss).toBeLessThan(3.5);

    const tone = new Float64Array(n);
    fillSine(tone, 0.5, 800, RATE);
    const g = new PsophometricFilter(RATE);
    // Skip the first block (the filter filling up), then count whole blocks only.
    g.add(tone, 0, g.blockLength);
    g.energySum = 0;
    g.outputs = 0;
    g.add(tone, g.blockLength, n - g.blockLength);
    const out = g.energySum / g.outputs;
    expect(Math.abs(db(out / 0.125))).toBeLessThan(0.05);
  });

  it('the channel meter reports the weighted error power and SNR', () => {
    // Source: as above: white error over the band is lowered by about 2.5 dB (common practice).
    const n = 2 * RATE;
    const { x: err } = bandNoise(n, 300, 3400, RATE, 8);
    const input = new Float64Array(n);
    fillSine(input, 0.3, 1020, RATE);
    const output = Float64Array.from(input, (v, i) => v + err[i]);
    const q = createQuantizer('uniform:16');
    const off = new ChannelMeter({ quantizer: q, rate: RATE });
    off.add(input, output);
    expect(off.snapshot().weighted).toBe(false);
    expect(off.snapshot().weightedSnrDb).toBeNull();
    const on = new ChannelMeter({ quantizer: q, rate: RATE, weighting: true });
    for (let i = 0; i < n; i += 160) on.add(input, output, undefined, undefined, i, i + 160);
    const s = on.snapshot();
    expect(s.weighted).toBe(true);
    const gain = (s.weightedSnrDb as number) - (s.snrDb as number);
    expect(gain).toBeGreaterThan(1.5);
    expect(gain).toBeLessThan(3.5);
    expect(db(s.errorPower / (s.weightedErrorPower as number))).toBeCloseTo(gain, 9);
  });
});

/** Hann-windowed periodogram by a direct float64 DFT: the independent reference. */
function directPeriodogram(x: Float64Array, from: number, n: number): Float64Array {
  const out = new Float64Array(n / 2 + 1);
  let u = 0;
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    w[i] = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / n);
    u += w[i] * w[i];
  }
  for (let k = 0; k <= n / 2; k++) {
    let re = 0;
    let im = 0;
    for (let i = 0; i < n; i++) {
      const a = (2 * Math.PI * k * i) / n;
      re += w[i] * x[from + i] * Math.cos(a);
      im -= w[i] * x[from + i] * Math.sin(a);
    }
    out[k] = ((k === 0 || k === n / 2 ? 1 : 2) * (re * re + im * im)) / (n * u);
  }
  return out;
}

describe('averaged power spectrum (fft.js)', () => {
  it.each([0, 0.5] as const)(
    'equals the mean of direct-DFT Hann periodograms (overlap %f), to 1e-9',
    (overlap) => {
      // Source: Welch's method (P. D. Welch, IEEE Trans. Audio Electroacoustics 15, 1967, from
      // memory) computed with a plain float64 DFT, independent of fft.js.
      const n = 64;
      const hop = overlap === 0.5 ? n / 2 : n;
      const x = new Float64Array(n * 5 + 17);
      fillGaussian(new Xoshiro128(2), x, 0.2);
      const s = new PowerSpectrum(RATE, n, 1, overlap);
      for (let i = 0; i < x.length; i += 7) s.add(x, i, Math.min(7, x.length - i));
      const snap = s.snapshot();
      const frames = Math.floor((x.length - n) / hop) + 1;
      expect(snap.frames).toBe(frames);
      const mean = new Float64Array(n / 2 + 1);
      for (let f = 0; f < frames; f++) {
        const p = directPeriodogram(x, f * hop, n);
        for (let k = 0; k < mean.length; k++) mean[k] += p[k] / frames;
      }
      for (let k = 0; k < mean.length; k++) {
        expect(Math.abs(snap.mean[k] - mean[k])).toBeLessThan(1e-9 * (1 + mean[k]));
      }
      expect(snap.binHz).toBe(RATE / n);
    },
  );

  it('bins add up to the mean square; a tone sits in its bin', () => {
    // Source: Parseval's theorem (common practice, no source).
    const x = new Float64Array(4 * RATE);
    fillGaussian(new Xoshiro128(12), x, 0.1);
    const s = new PowerSpectrum(RATE);
    expect(s.size).toBe(defaultSpectrumSize(RATE));
    expect(s.size).toBe(256);
    s.add(x, 0, x.length);
    const total = s.snapshot().mean.reduce((a, b) => a + b, 0);
    expect(Math.abs(db(total / 0.01))).toBeLessThan(0.2);

    const t = new PowerSpectrum(RATE, 256);
    const tone = new Float64Array(RATE);
    fillSine(tone, 0.5, 1000, RATE); // bin 32 exactly
    t.add(tone, 0, tone.length);
    const spec = t.snapshot().mean;
    let peak = 0;
    for (let k = 1; k < spec.length; k++) if (spec[k] > spec[peak]) peak = k;
    expect(peak).toBe(32);
    // Hann main lobe: the tone's power A^2/2 splits 2/3 in the centre bin and 1/6 to each neighbour.
    expect(spec[31] + spec[32] + spec[33]).toBeCloseTo(0.125, 6);
    expect(spec[32] / 0.125).toBeCloseTo(2 / 3, 6);
  });

  it("the channel's error spectrum of a fine quantizer is flat: every band within 2 dB of the mean", () => {
    // Source: quantization noise of a fine uniform quantizer on a busy signal is white (Bennett
    // 1948, from memory).
    const q = createQuantizer('uniform:12');
    const x = new Float64Array(20 * RATE);
    fillGaussian(new Xoshiro128(31), x, 0.2);
    const y = new Float64Array(x.length);
    q.quantizeBlock(x, y);
    const m = new ChannelMeter({ quantizer: q, rate: RATE });
    for (let i = 0; i < x.length; i += 160) m.add(x, y, undefined, undefined, i, i + 160);
    const e = m.snapshot().errorSpectrum;
    const avg = e.mean.reduce((a, b) => a + b, 0) / e.mean.length;
    // 16-bin bands, averaging out the estimate's own spread.
    for (let b = 1; b + 16 < e.mean.length; b += 16) {
      let band = 0;
      for (let k = b; k < b + 16; k++) band += e.mean[k] / 16;
      expect(Math.abs(db(band / avg))).toBeLessThan(2);
    }
    const total = e.mean.reduce((a, b) => a + b, 0);
    expect(Math.abs(db(total / m.snapshot().errorPower))).toBeLessThan(0.2);
    expect(e.recent[5]).toBeGreaterThan(0);
  });
});
