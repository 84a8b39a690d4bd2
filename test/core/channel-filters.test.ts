import { describe, expect, it } from 'vitest';
import {
  besselI0,
  designLowpass,
  kaiserBeta,
  kaiserOrder,
  kaiserWindow,
} from '../../core/channel/fir-design';
import { FirInterpolator } from '../../core/channel/polyphase';
import { planRate } from '../../core/channel/rate-plan';

// Magnitude of the DFT of the taps at f Hz (direct sum, written here, not taken from the code under test).
function magnitude(taps: ArrayLike<number>, fHz: number, rateHz: number): number {
  let re = 0;
  let im = 0;
  const w = (2 * Math.PI * fHz) / rateHz;
  for (let n = 0; n < taps.length; n++) {
    re += taps[n] * Math.cos(w * n);
    im -= taps[n] * Math.sin(w * n);
  }
  return Math.hypot(re, im);
}

const db = (g: number): number => 20 * Math.log10(g);

/** Max and min of `gain(f)` in dB over [lo, hi], sampled at `points` + 1 frequencies. */
function rangeDb(
  gain: (f: number) => number,
  lo: number,
  hi: number,
  points = 3000,
): { max: number; min: number } {
  let max = -Infinity;
  let min = Infinity;
  for (let i = 0; i <= points; i++) {
    const g = db(gain(lo + ((hi - lo) * i) / points));
    if (g > max) max = g;
    if (g < min) min = g;
  }
  return { max, min };
}

describe('Kaiser window design', () => {
  it('I0 matches tabulated values (Abramowitz and Stegun 1964, Table 9.8, from memory)', () => {
    expect(besselI0(0)).toBe(1);
    expect(besselI0(1)).toBeCloseTo(1.266065878, 8);
    expect(besselI0(2)).toBeCloseTo(2.279585302, 8);
    expect(besselI0(5) / 27.23987182).toBeCloseTo(1, 8);
  });

  it('beta and order follow the Kaiser formulas (J. F. Kaiser 1974; Oppenheim and Schafer, from memory)', () => {
    // beta = 0.1102 (A - 8.7) above 50 dB; 0.5842 (A - 21)^0.4 + 0.07886 (A - 21) from 21 to 50 dB; 0 below.
    expect(kaiserBeta(60)).toBeCloseTo(5.65326, 5);
    expect(kaiserBeta(40)).toBeCloseTo(0.5842 * 19 ** 0.4 + 0.07886 * 19, 10);
    expect(kaiserBeta(20)).toBe(0);
    // M = (A - 8) / (2.285 * 2 pi * width): 60 dB over 0.05 of the rate gives 72.4, so 74 (even order).
    expect(kaiserOrder(60, 0.05)).toBe(74);
    expect(kaiserOrder(40, 0.1)).toBe(24);
  });

  it('the window is symmetric, 1 at the centre and 1/I0(beta) at the ends (Kaiser 1974, from memory)', () => {
    const w = kaiserWindow(21, 6);
    expect(w[10]).toBe(1);
    expect(w[0]).toBeCloseTo(1 / besselI0(6), 14);
    for (let n = 0; n < 21; n++) expect(w[n]).toBeCloseTo(w[20 - n], 14);
  });

  it('reaches the asked attenuation within 1.5 dB, with equal ripple in the passband (Kaiser 1974, from memory)', () => {
    for (const a of [40, 60, 80]) {
      for (const width of [0.01, 0.05]) {
        const d = designLowpass({ rateHz: 1, passHz: 0.2, stopHz: 0.2 + width, attenuationDb: a });
        expect(d.taps.length % 2).toBe(1);
        const stop = rangeDb((f) => magnitude(d.taps, f, 1), d.stopHz, 0.5, 4000);
        expect(-stop.max).toBeGreaterThan(a - 1.5);
        expect(-stop.max).toBeLessThan(a + 1.5);
        // The window method's passband deviation is about the stopband's delta = 10^(-A/20).
        const pass = rangeDb((f) => magnitude(d.taps, f, 1), 0, d.passHz, 1000);
        const delta = 10 ** (-a / 20);
        expect(10 ** (pass.max / 20) - 1).toBeLessThan(2 * delta);
        expect(1 - 10 ** (pass.min / 20)).toBeLessThan(2 * delta);
      }
    }
  });

  it('taps are linear phase (symmetric), so the group delay is (length - 1) / 2 (common practice, no source)', () => {
    const d = designLowpass({ rateHz: 48000, passHz: 3400, stopHz: 12000, attenuationDb: 64 });
    const n = d.taps.length;
    for (let i = 0; i < n; i++) expect(d.taps[i]).toBe(d.taps[n - 1 - i]);
    expect(d.delay).toBe((n - 1) / 2);
  });
});

describe('voice-channel filters meet issue 3 (stopband >= 60 dB; 8 kHz ripple <= 0.5 dB over 300-3400 Hz)', () => {
  // Ripple: max minus min of the gain in dB over the band (peak to peak); the requirement
  // in issue 3, checked over 0-3400 Hz, which contains 300-3400 Hz.
  const p8 = planRate(48000, 8000);
  const p16 = planRate(48000, 16000);

  it('48 kHz -> 8 kHz runs by 3 then by 2; 48 kHz -> 16 kHz by 3', () => {
    expect(p8.stages.map((s) => s.factor)).toEqual([3, 2]);
    expect(p16.stages.map((s) => s.factor)).toEqual([3]);
  });

  it('every stage meets its own passband and stopband (issue 3 figures)', () => {
    for (const plan of [p8, p16]) {
      for (const s of plan.stages) {
        const d = s.design;
        const pass = rangeDb((f) => magnitude(d.taps, f, d.rateHz), 0, d.passHz);
        expect(pass.max - pass.min).toBeLessThan(0.5);
        const stop = rangeDb((f) => magnitude(d.taps, f, d.rateHz), d.stopHz, d.rateHz / 2, 6000);
        expect(stop.max).toBeLessThan(-60);
      }
    }
  });

  it('8 kHz decimation chain: nothing from 4000-24000 Hz lands in 0-4000 Hz above -60 dB; ripple of chain and round trip < 0.5 dB', () => {
    const [s1, s2] = p8.stages;
    expect(s2.design.stopHz).toBe(4000);
    // The second stage runs at 16 kHz, so its response repeats every 16 kHz of input frequency.
    const chain = (f: number) => magnitude(s1.design.taps, f, 48000) * magnitude(s2.design.taps, f, 16000);
    const alias = rangeDb(chain, 4000, 24000, 20000);
    expect(alias.max).toBeLessThan(-60);
    const pass = rangeDb(chain, 300, 3400);
    expect(pass.max - pass.min).toBeLessThan(0.5);
    // Decimation and interpolation back to 48 kHz pass the same two filters twice.
    const trip = rangeDb((f) => chain(f) ** 2, 300, 3400);
    expect(trip.max - trip.min).toBeLessThan(0.5);
  });

  it('16 kHz path: passband to 7000 Hz, stopband from 8000 Hz at 60 dB or more (issue 3 figures)', () => {
    const d = p16.stages[0].design;
    expect([d.passHz, d.stopHz]).toEqual([7000, 8000]);
    const alias = rangeDb((f) => magnitude(d.taps, f, 48000), 8000, 24000, 8000);
    expect(alias.max).toBeLessThan(-60);
    const pass = rangeDb((f) => magnitude(d.taps, f, 48000), 0, 7000);
    expect(pass.max - pass.min).toBeLessThan(0.5);
  });

  it('interpolators are the same filters with gain L: their impulse response is L h, so images are >= 60 dB down (issue 3)', () => {
    for (const s of [...p8.stages, ...p16.stages]) {
      const taps = s.design.taps;
      const m = Math.ceil(taps.length / s.factor) + 2;
      const up = new FirInterpolator(taps, s.factor, m);
      const x = new Float64Array(m);
      x[0] = 1;
      const y = new Float64Array(m * s.factor);
      up.process(x, 0, m, y, 0);
      for (let t = 0; t < y.length; t++)
        expect(y[t]).toBeCloseTo(t < taps.length ? s.factor * taps[t] : 0, 14);
      const ir = Array.from(y, (v) => v / s.factor);
      // Images of the low-rate band sit above the low rate's stopband edge.
      const images = rangeDb((f) => magnitude(ir, f, s.highRateHz), s.design.stopHz, s.highRateHz / 2, 6000);
      expect(images.max).toBeLessThan(-60);
    }
  });
});
