// O.41 psophometric weighting (from the error spectrum) and the averaged spectra.
import { describe, expect, it } from 'vitest';
import { ChannelMeter } from '../../core/measure/channel-meter';
import { PowerSpectrum, defaultSpectrumSize } from '../../core/measure/spectrum';
import { O41_WEIGHTS_DB, psophometricBinWeights, psophometricWeightDb } from '../../core/measure/weighting';
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

/** A channel meter whose error (output - input) is exactly `err`, on a 1020 Hz input at -13 dBov. */
function meterWithError(err: Float64Array, rate: number, weighting = true): ChannelMeter {
  const input = new Float64Array(err.length);
  fillSine(input, 0.3, 1020, rate);
  const output = Float64Array.from(input, (v, i) => v + err[i]);
  const m = new ChannelMeter({ quantizer: createQuantizer('uniform:16'), rate, weighting });
  for (let i = 0; i < err.length; i += 160)
    m.add(input, output, undefined, undefined, i, Math.min(err.length, i + 160));
  return m;
}

/** What the weighting took off the error, dB (positive: the weighted error is smaller). */
function weightingLossDb(m: ChannelMeter): number {
  const s = m.snapshot();
  return db(s.errorPower / (s.weightedErrorPower as number));
}

describe('O.41 psophometric weighting', () => {
  it('the curve passes through the values fixed in the table', () => {
    // Source: ITU-T O.41 weighting values (from memory, see weighting.ts).
    expect(psophometricWeightDb(800)).toBe(0);
    expect(psophometricWeightDb(1000)).toBe(1);
    expect(psophometricWeightDb(300)).toBe(-10.6);
    expect(psophometricWeightDb(2000)).toBe(-3);
    expect(psophometricWeightDb(3000)).toBe(-5.6);
    // Bin k of a 256-point spectrum at 8 kHz sits at k * 31.25 Hz: bin 32 is 1000 Hz.
    const w = psophometricBinWeights(RATE, 256);
    expect(w.length).toBe(129);
    expect(w[32]).toBeCloseTo(Math.pow(10, 0.1), 12);
    expect(w[64]).toBeCloseTo(Math.pow(10, -0.3), 12);
  });

  it('an error tone is weighted by the O.41 value at its frequency, 300 to 3500 Hz, at 8 and 16 kHz', () => {
    // Source: ITU-T O.41 weighting values (from memory, see weighting.ts): a tone of power P at f
    // comes out at P |W(f)|^2. Within 0.3 dB at the table's points, on and between bins (the
    // Hann window spreads a tone over about two bins of 31 Hz); 1 dB at 200 Hz, where the curve
    // falls 18 dB an octave.
    for (const rate of [8000, 16000]) {
      for (const [hz, w] of O41_WEIGHTS_DB) {
        if (hz < 200 || hz > 3500) continue;
        const tone = new Float64Array(rate);
        fillSine(tone, 0.01, hz, rate, 0.3);
        const loss = weightingLossDb(meterWithError(tone, rate));
        expect(Math.abs(-loss - w), `${rate} Hz rate, ${hz} Hz`).toBeLessThan(hz === 200 ? 1 : 0.3);
      }
    }
  });

  it('hum and DC in the error are strongly attenuated: at least 30 dB at 50 Hz, 60 dB at DC', () => {
    // Source: ITU-T O.41 weighting values (from memory): -63 dB at 50 Hz; DC lies below the
    // table's first point (16.66 Hz, -85 dB).
    const hum = new Float64Array(2 * RATE);
    fillSine(hum, 0.01, 50, RATE);
    expect(weightingLossDb(meterWithError(hum, RATE))).toBeGreaterThan(30);
    const dc = new Float64Array(2 * RATE).fill(0.01);
    expect(weightingLossDb(meterWithError(dc, RATE))).toBeGreaterThan(60);
  });

  it('white noise over 300-3400 Hz loses about 2.5 dB (+-1 dB); an 800 Hz tone passes at 0 dB', () => {
    // Source: weighting white noise over 300-3400 Hz lowers it by about 2.5 dB (common practice,
    // no source); 800 Hz is the reference frequency of O.41 (from memory).
    const { x: err } = bandNoise(2 * RATE, 300, 3400, RATE, 8);
    const m = meterWithError(err, RATE);
    const s = m.snapshot();
    expect(s.weighted).toBe(true);
    const gain = (s.weightedSnrDb as number) - (s.snrDb as number);
    expect(gain).toBeGreaterThan(1.5);
    expect(gain).toBeLessThan(3.5);
    expect(weightingLossDb(m)).toBeCloseTo(gain, 9);

    const tone = new Float64Array(2 * RATE);
    fillSine(tone, 0.5, 800, RATE);
    expect(Math.abs(weightingLossDb(meterWithError(tone, RATE)))).toBeLessThan(0.05);
  });

  it('weighted figures are null when off, before the first spectrum frame, and with no signal; 0 with no error', () => {
    // Source: the snapshot convention (core/measure/snapshot.ts): a figure that does not exist is null.
    const { x: err } = bandNoise(2 * RATE, 300, 3400, RATE, 9);
    const off = meterWithError(err, RATE, false).snapshot();
    expect(off.weighted).toBe(false);
    expect(off.weightedErrorPower).toBeNull();
    expect(off.weightedSnrDb).toBeNull();
    const q = createQuantizer('uniform:16');
    const m = new ChannelMeter({ quantizer: q, rate: RATE, weighting: true });
    expect(m.snapshot().weightedErrorPower).toBeNull();
    // 200 samples: some error, but not yet a whole 256-point frame of it.
    const x = new Float64Array(200).fill(0.25);
    const y = Float64Array.from(x, (v) => v + 1e-3);
    m.add(x, y);
    expect(m.snapshot().snrDb).not.toBeNull();
    expect(m.snapshot().weightedErrorPower).toBeNull();
    expect(m.snapshot().weightedSnrDb).toBeNull();
    m.add(x, y);
    expect(m.snapshot().weightedErrorPower).toBeGreaterThan(0);
    // A silent input that is passed exactly: no error, no signal.
    const lossless = new ChannelMeter({ quantizer: q, rate: RATE, weighting: true });
    lossless.add(new Float64Array(1000), new Float64Array(1000));
    expect(lossless.snapshot().weightedErrorPower).toBe(0);
    expect(lossless.snapshot().weightedSnrDb).toBeNull();
    expect(lossless.snapshot().snrDb).toBeNull();
  });
});

describe('a signal spectrum shared by the channels at one rate', () => {
  it('is reported by every meter as if it were its own, and neither fed nor reset by them', () => {
    // Source: channels at one rate quantize the same input (the channel path's Reference), so
    // one spectrum of it serves them all (common practice, no source).
    const x = new Float64Array(3 * RATE);
    fillGaussian(new Xoshiro128(5), x, 0.1);
    const mu = createQuantizer('g711-mu');
    const a = createQuantizer('g711-a');
    const yMu = new Float64Array(x.length);
    const yA = new Float64Array(x.length);
    mu.quantizeBlock(x, yMu);
    a.quantizeBlock(x, yA);
    const shared = new PowerSpectrum(RATE);
    const m1 = new ChannelMeter({ quantizer: mu, rate: RATE, signalSpectrum: shared });
    const m2 = new ChannelMeter({ quantizer: a, rate: RATE, signalSpectrum: shared });
    const own = new ChannelMeter({ quantizer: mu, rate: RATE });
    expect(m1.ownsSignalSpectrum).toBe(false);
    expect(own.ownsSignalSpectrum).toBe(true);
    for (let i = 0; i < x.length; i += 160) {
      shared.add(x, i, 160);
      m1.add(x, yMu, undefined, undefined, i, i + 160);
      m2.add(x, yA, undefined, undefined, i, i + 160);
      own.add(x, yMu, undefined, undefined, i, i + 160);
    }
    // Fed once per chunk by its owner, not once per meter: the frame count is that of one stream.
    expect(shared.frameCount).toBe(Math.floor(x.length / 256));
    expect(m1.snapshot()).toEqual(own.snapshot());
    expect(m2.snapshot().signalSpectrum).toEqual(own.snapshot().signalSpectrum);
    m1.reset();
    expect(m1.snapshot().signalSpectrum.frames).toBe(shared.frameCount);
    expect(m1.snapshot().errorSpectrum.frames).toBe(0);
    shared.reset();
    expect(m2.snapshot().signalSpectrum.frames).toBe(0);
  });

  it('must match the meter in rate and size', () => {
    const q = createQuantizer('g711-mu');
    expect(
      () => new ChannelMeter({ quantizer: q, rate: RATE, signalSpectrum: new PowerSpectrum(16000) }),
    ).toThrow(RangeError);
    expect(
      () =>
        new ChannelMeter({
          quantizer: q,
          rate: RATE,
          spectrumSize: 512,
          signalSpectrum: new PowerSpectrum(RATE),
        }),
    ).toThrow(RangeError);
    // Without a size of its own the meter takes the shared spectrum's.
    const m = new ChannelMeter({ quantizer: q, rate: RATE, signalSpectrum: new PowerSpectrum(RATE, 128) });
    expect(m.errorSpectrum.size).toBe(128);
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
