// Segmental SNR, overall SNR and the segment ledger against handbook values.
import { describe, expect, it } from 'vitest';
import { ChannelMeter } from '../../core/measure/channel-meter';
import {
  distributionPercentile,
  distributionShareAtLeast,
  FRAME_LOSSLESS,
  FRAME_MEASURED,
  FRAME_SILENT,
  FRAME_SNR_BIN_COUNT,
  FRAME_SNR_BIN_DB,
  FRAME_SNR_MIN_DB,
  SEGMENTAL_CLAMP_SPEECH_CODER,
  SegmentalSnr,
} from '../../core/measure/segmental';
import { measureSnr } from '../../core/measure/snr';
import { createQuantizer } from '../../core/quantizers/index';
import { fillLaplacian } from '../../core/signals/noise';
import { Xoshiro128 } from '../../core/signals/random';
import { fillSine } from '../../core/signals/tone';

function feed(
  m: ChannelMeter,
  x: Float64Array,
  y: Float64Array,
  codes?: Uint8Array | Int32Array,
  segs?: Uint8Array,
  block = 128,
) {
  for (let i = 0; i < x.length; i += block) m.add(x, y, codes, segs, i, Math.min(x.length, i + block));
}

describe('segmental SNR of a uniform quantizer on a full-scale sine', () => {
  it('997 Hz at 48 kHz, clamp off: 6.02 N + 1.76 dB within 0.5 dB for N = 8..12', () => {
    // Source: Jayant and Noll, Digital Coding of Waveforms (1984), from memory: full-load sine on
    // a uniform (mid-rise) quantizer, SNR = 6.02 N + 1.76 dB. Frames of 20 ms at 48 kHz.
    const rate = 48000;
    const x = new Float64Array(rate * 2);
    fillSine(x, 1, 997, rate);
    const y = new Float64Array(x.length);
    const segs = new Uint8Array(x.length);
    for (let n = 8; n <= 12; n++) {
      const q = createQuantizer(`uniform:${n}:rise`);
      q.quantizeBlock(x, y, undefined, segs);
      const m = new ChannelMeter({ quantizer: q, rate, clamp: null });
      feed(m, x, y, undefined, segs, 480);
      const s = m.snapshot();
      expect(s.segmental.frameLength).toBe(960);
      expect(s.segmental.measuredFrames).toBe(100);
      expect(s.segmental.silentFrames).toBe(0);
      const seg = s.segmental.meanDb as number;
      expect(Math.abs(seg - (6.02 * n + 1.76)), `N=${n}: ${seg.toFixed(3)} dB`).toBeLessThan(0.5);
      // The overall SNR agrees with the plain block measurement (core/measure/snr.ts).
      expect(s.snrDb as number).toBeCloseTo(measureSnr(x, y).snrDb, 9);
      // Steady sine: every frame is close to the mean, so the percentiles bracket it tightly.
      expect(s.segmental.p5Db as number).toBeLessThanOrEqual(seg + 0.01);
      expect(s.segmental.p95Db as number).toBeGreaterThanOrEqual(seg - 0.01);
      expect((s.segmental.p95Db as number) - (s.segmental.p5Db as number)).toBeLessThan(1.5);
    }
  });
});

describe('segmental SNR: frames, silence and clamps', () => {
  const rate = 8000;
  const q = createQuantizer('g711-mu');

  it('silent frames are skipped: below the -60 dBov floor or all zero', () => {
    // Source: the silence rule stated in core/measure/segmental.ts (common practice, no source).
    const x = new Float64Array(rate);
    fillSine(x, 0.3, 1020, rate);
    // Frames 10..19 at -70 dBov, 20..29 exact zero.
    for (let i = 10 * 160; i < 20 * 160; i++) x[i] *= Math.pow(10, -70 / 20) / (0.3 / Math.SQRT2);
    x.fill(0, 20 * 160, 30 * 160);
    const y = new Float64Array(x.length);
    q.quantizeBlock(x, y);
    const m = new ChannelMeter({ quantizer: q, rate });
    feed(m, x, y, undefined, undefined, 100);
    const s = m.snapshot().segmental;
    expect(s.frames).toBe(50);
    expect(s.silentFrames).toBe(20);
    expect(s.measuredFrames).toBe(30);
    expect(s.traceLength).toBe(50);
    expect(Array.from(s.traceFlags.subarray(0, 50)).filter((f) => f === FRAME_SILENT).length).toBe(20);
    expect(s.traceFlags[15]).toBe(FRAME_SILENT);
    expect(s.traceFlags[40]).toBe(FRAME_MEASURED);
    // -70 dBov of full scale is -69.97 dBov of the mu-law overload point.
    expect(Math.abs(s.traceLevelDbov[15] - (-70 - 20 * Math.log10(q.overloadPoint)))).toBeLessThan(0.2);
  });

  it('clamps: a frame far beyond the range is held at the clamp; the speech-coder preset caps at 35 dB', () => {
    // Source: our per-frame clamps: default -10..+60 dB, speech-coder -10..+35 dB
    // (common practice, no source).
    const fine = createQuantizer('uniform:16');
    const x = new Float64Array(rate);
    fillSine(x, 0.5, 1020, rate);
    const y = new Float64Array(x.length);
    fine.quantizeBlock(x, y);
    const loud = (clamp?: typeof SEGMENTAL_CLAMP_SPEECH_CODER | null) => {
      const m = new ChannelMeter({ quantizer: fine, rate, clamp });
      feed(m, x, y);
      return m.snapshot().segmental;
    };
    expect(loud().meanDb).toBe(60);
    expect(loud(SEGMENTAL_CLAMP_SPEECH_CODER).meanDb).toBe(35);
    expect(loud(SEGMENTAL_CLAMP_SPEECH_CODER).p50Db).toBe(35);
    expect(loud(null).meanDb as number).toBeGreaterThan(90);
    // Output in antiphase: error = -2x, frame SNR -6 dB; a -10 floor keeps it, a higher one clamps.
    const neg = Float64Array.from(x, (v) => -v);
    const m = new ChannelMeter({ quantizer: fine, rate, clamp: { minDb: -3, maxDb: 30 } });
    feed(m, x, neg);
    expect(m.snapshot().segmental.meanDb).toBe(-3);
    const m2 = new ChannelMeter({ quantizer: fine, rate });
    feed(m2, x, neg);
    expect(m2.snapshot().segmental.meanDb as number).toBeCloseTo(-20 * Math.log10(2), 9);
  });

  it('clamp off: a lossless frame is counted apart and kept out of the mean', () => {
    // Source: a frame with no error has no finite SNR (common practice, no source).
    const s = new SegmentalSnr({ rate, clamp: null });
    const x = new Float64Array(320).fill(0.25);
    const e = new Float64Array(320);
    e.fill(0.0025, 0, 160);
    s.add(x, e, 0, 320);
    const snap = s.snapshot();
    expect(snap.measuredFrames).toBe(1);
    expect(snap.losslessFrames).toBe(1);
    expect(snap.meanDb as number).toBeCloseTo(40, 9);
    expect(snap.traceFlags[1]).toBe(FRAME_LOSSLESS);
    expect(JSON.stringify({ ...snap, distribution: 0, traceSnrDb: 0, traceLevelDbov: 0 })).not.toMatch(
      /NaN|Infinity/,
    );
  });

  it('no frame yet: nulls, never NaN', () => {
    const s = new SegmentalSnr({ rate }).snapshot();
    expect(s.meanDb).toBeNull();
    expect(s.p50Db).toBeNull();
    expect(s.traceLastFrame).toBe(-1);
  });
});

describe('frame SNR distribution', () => {
  it('percentiles and shares from the 0.25 dB histogram match the exact order statistics of the frames', () => {
    // Source: empirical quantiles of the frame SNRs themselves, computed here by sorting
    // (common practice, no source); a bin is 0.25 dB wide, so agreement within one bin.
    const rate = 8000;
    const q = createQuantizer('g711-a');
    const x = new Float64Array(rate * 30);
    const rng = new Xoshiro128(77);
    fillLaplacian(rng, x, 1);
    // A talker whose level wanders over 40 dB in 0.5 s steps (common practice, no source).
    for (let b = 0; b < 60; b++) {
      const g = Math.pow(10, (-50 + 40 * rng.nextFloat()) / 20);
      for (let i = b * 4000; i < (b + 1) * 4000; i++) x[i] *= g;
    }
    const y = new Float64Array(x.length);
    q.quantizeBlock(x, y);
    const m = new ChannelMeter({ quantizer: q, rate });
    feed(m, x, y);
    const s = m.snapshot().segmental;
    // Frame SNRs computed independently, clamped the same way.
    const snrs: number[] = [];
    let sum = 0;
    for (let f = 0; f < x.length / 160; f++) {
      let se = 0;
      let ee = 0;
      for (let i = f * 160; i < (f + 1) * 160; i++) {
        se += x[i] * x[i];
        ee += (y[i] - x[i]) ** 2;
      }
      if (se / 160 < Math.pow(10, -6)) continue;
      const v = Math.min(60, Math.max(-10, 10 * Math.log10(se / ee)));
      snrs.push(v);
      sum += v;
    }
    snrs.sort((a, b) => a - b);
    expect(s.measuredFrames).toBe(snrs.length);
    expect(s.meanDb as number).toBeCloseTo(sum / snrs.length, 9);
    const quantile = (p: number) => snrs[Math.min(snrs.length - 1, Math.floor(p * snrs.length))];
    expect(Math.abs((s.p5Db as number) - quantile(0.05))).toBeLessThan(FRAME_SNR_BIN_DB + 0.3);
    expect(Math.abs((s.p50Db as number) - quantile(0.5))).toBeLessThan(FRAME_SNR_BIN_DB + 0.3);
    expect(Math.abs((s.p95Db as number) - quantile(0.95))).toBeLessThan(FRAME_SNR_BIN_DB + 0.3);
    expect(s.distribution.length).toBe(FRAME_SNR_BIN_COUNT);
    const share = distributionShareAtLeast(s.distribution, 30) as number;
    const exact = snrs.filter((v) => v >= 30).length / snrs.length;
    expect(Math.abs(share - exact)).toBeLessThan(0.02);
    expect(distributionPercentile(new Float64Array(FRAME_SNR_BIN_COUNT), 0.5)).toBeNull();
    // The recent trace holds the last 500 frames, oldest first, ending at the newest frame.
    expect(s.traceLength).toBe(500);
    expect(s.traceLastFrame).toBe(s.frames - 1);
    expect(FRAME_SNR_MIN_DB).toBe(-40);
  });
});

describe('segment ledger', () => {
  it('G.711 mu-law: the error power in each chord is step^2/12 for a smooth input', () => {
    // Source: granular noise of a uniform step D is D^2/12 (W. R. Bennett, "Spectra of quantized
    // signals", BSTJ 1948, from memory); mu-law chord steps 2, 4, ..., 256 in 14-bit units
    // (G.711 Table 2, from memory). Within 6 % for every chord.
    const rate = 8000;
    const q = createQuantizer('g711-mu');
    const x = new Float64Array(400000);
    fillLaplacian(new Xoshiro128(3), x, 0.15);
    // Granular noise only: keep the input inside the overload point.
    for (let i = 0; i < x.length; i++) x[i] = Math.max(-0.99, Math.min(0.99, x[i]));
    const y = new Float64Array(x.length);
    const codes = new Uint8Array(x.length);
    const segs = new Uint8Array(x.length);
    q.quantizeBlock(x, y, codes, segs);
    const m = new ChannelMeter({ quantizer: q, rate });
    feed(m, x, y, codes, segs, 1000);
    const s = m.snapshot();
    for (let chord = 0; chord < 8; chord++) {
      const step = ((2 << chord) * 4) / 32768;
      const measured = s.segments.errorEnergy[chord] / s.segments.counts[chord];
      expect(s.segments.counts[chord]).toBeGreaterThan(1000);
      expect(Math.abs(measured / ((step * step) / 12) - 1), `chord ${chord}`).toBeLessThan(0.06);
      expect(s.segments.snrDb[chord]).toBeCloseTo(
        10 * Math.log10(s.segments.signalEnergy[chord] / s.segments.errorEnergy[chord]),
        12,
      );
    }
    // Energies add up to the overall figures.
    const sumE = s.segments.errorEnergy.reduce((a, b) => a + b, 0);
    expect(sumE / s.samples).toBeCloseTo(s.errorPower, 15);
    // Segment edges in dBov: the top edge is the overload point.
    expect(s.segments.edgesDbov[8]).toBe(0);
    expect(s.segments.edgesDbov[0]).toBe(-Infinity);
  });

  it('a segment without samples reads NaN in the SNR array and 0 in the occupancy', () => {
    const q = createQuantizer('g711-a');
    const m = new ChannelMeter({ quantizer: q, rate: 8000 });
    const x = new Float64Array(1000);
    fillSine(x, 0.9, 1020, 8000);
    const y = new Float64Array(x.length);
    const segs = new Uint8Array(x.length);
    q.quantizeBlock(x, y, undefined, segs);
    // Only the top chords: drop the samples that fall low.
    const s = (() => {
      const keep = Uint8Array.from(segs, (v) => (v < 6 ? 255 : v));
      m.add(x, y, undefined, keep);
      return m.snapshot();
    })();
    expect(s.segments.counts[0]).toBe(0);
    expect(Number.isNaN(s.segments.snrDb[0])).toBe(true);
    expect(s.segments.counts[7]).toBeGreaterThan(0);
  });
});
