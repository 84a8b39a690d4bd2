// The built-in demo talker: a seeded synthetic speech-like signal with a talker's level range.
import FFT from 'fft.js';
import { describe, expect, it } from 'vitest';
import { ActiveLevelMeter } from '../../core/measure/active-level';
import { DemoTalker, renderDemoTalker } from '../../core/signals/demo-talker';

const RATE = 48000;
const SEEDS = [1, 2, 3];
const talks = new Map(SEEDS.map((s) => [s, renderDemoTalker(RATE, 30, s)]));

function frameLevels(x: Float32Array, frame: number): number[] {
  const out: number[] = [];
  for (let i = 0; i + frame <= x.length; i += frame) {
    let s = 0;
    for (let j = 0; j < frame; j++) s += x[i + j] * x[i + j];
    out.push(10 * Math.log10(s / frame + 1e-30));
  }
  return out;
}

describe('demo talker', () => {
  it('is deterministic per seed and differs between seeds', () => {
    // Seeded, reproducible demo data (house rules; common practice, no source).
    expect(renderDemoTalker(RATE, 2, 1)).toEqual(talks.get(1)!.subarray(0, 2 * RATE));
    expect(renderDemoTalker(RATE, 2, 2)).not.toEqual(renderDemoTalker(RATE, 2, 1));
  });

  it('streams the same samples as the block form however the stream is cut', () => {
    // Block-size invariance: 128-sample render quanta live, any block offline (DEVELOPERS.md).
    const whole = talks.get(2)!.subarray(0, 3 * RATE);
    const src = new DemoTalker(RATE, 2);
    const cut = new Float32Array(whole.length);
    for (let i = 0, k = 1; i < cut.length; i += k, k = (k * 13 + 7) % 509)
      src.fill(cut, i, Math.min(cut.length, i + k));
    expect(cut).toEqual(whole);
  });

  it('sits at an active level of -30..-22 dBov with 40-80 % activity (ITU-T P.56 method B)', () => {
    // Codec tests align speech to -26 dBov active level (common practice, no source); speech
    // activity of conversational talk is roughly half the time (common practice, no source).
    for (const seed of SEEDS) {
      const m = new ActiveLevelMeter({ rate: RATE });
      m.add(talks.get(seed)!);
      const r = m.longTerm();
      expect(r.activeLevelDbov).not.toBeNull();
      expect(r.activeLevelDbov!).toBeGreaterThan(-30);
      expect(r.activeLevelDbov!).toBeLessThan(-22);
      expect(r.activityFactor!).toBeGreaterThan(0.4);
      expect(r.activityFactor!).toBeLessThan(0.8);
    }
  });

  it('spans at least 35 dB of 20 ms frame levels and never reaches the overload point', () => {
    // A talker's level varies by about 40 dB (common practice, no source). Frames counted are
    // those 10 dB or more above the talker's room noise (about -80 dBov), i.e. above -70 dBov.
    for (const seed of SEEDS) {
      const x = talks.get(seed)!;
      const levels = frameLevels(x, 0.02 * RATE)
        .filter((v) => v > -70)
        .sort((p, q) => p - q);
      const pct = (q: number) => levels[Math.floor(q * (levels.length - 1))];
      expect(pct(0.95) - pct(0.05)).toBeGreaterThanOrEqual(35);
      let peak = 0;
      for (const v of x) peak = Math.max(peak, Math.abs(v));
      // Peak below 0 dBov on both G.711 laws: mu-law's overload point 8159*4/32768 = 0.99597
      // (ITU-T G.711, from memory) is the lower of the two.
      expect(peak).toBeLessThan(0.99597);
      // Loud bursts reach within 10 dB of the overload point at least once in 30 s.
      expect(20 * Math.log10(peak)).toBeGreaterThan(-10);
    }
  });

  it('keeps most of its energy in the voice band, 200-3400 Hz', () => {
    // Telephone voice band 300-3400 Hz (ITU-T G.712, from memory); speech energy lies mostly
    // within it (common practice, no source). Spectrum by the npm package fft.js.
    const n = 4096;
    const fft = new FFT(n);
    const out = fft.createComplexArray() as number[];
    const frame = new Float64Array(n);
    for (const seed of SEEDS) {
      const x = talks.get(seed)!;
      let total = 0;
      let band = 0;
      for (let i = 0; i + n <= x.length; i += n) {
        for (let j = 0; j < n; j++) frame[j] = x[i + j] * (0.5 - 0.5 * Math.cos((2 * Math.PI * j) / n));
        fft.realTransform(out, frame);
        for (let k = 1; k < n / 2; k++) {
          const p = out[2 * k] ** 2 + out[2 * k + 1] ** 2;
          const f = (k * RATE) / n;
          total += p;
          if (f >= 200 && f <= 3400) band += p;
        }
      }
      expect(band / total).toBeGreaterThan(0.8);
    }
  });
});
