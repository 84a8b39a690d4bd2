// Level spread, per-code occupancy and the sample meters, against closed forms and
// independent counts.
import { alaw, mulaw } from 'alawmulaw';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ChannelMeter } from '../../core/measure/channel-meter';
import {
  CodeOccupancy,
  LEVEL_BIN_COUNT,
  LEVEL_BIN_DB,
  LEVEL_MIN_DBOV,
  LevelHistogram,
} from '../../core/measure/levels';
import { SignalMeter } from '../../core/measure/meters';
import { TalkerMeter } from '../../core/measure/talker-meter';
import { createQuantizer } from '../../core/quantizers/index';
import { fillGaussian, fillLaplacian } from '../../core/signals/noise';
import { Xoshiro128 } from '../../core/signals/random';
import { fillSine } from '../../core/signals/tone';

const RATE = 8000;

describe('level histogram', () => {
  it("a sine's level distribution follows the arcsine law bin by bin", () => {
    // Source: for x = A sin(theta), theta uniform, P(|x| <= u) = (2/pi) asin(u/A) (the arcsine
    // law, common practice, no source). The tone's frequency is 8 kHz times (3 - sqrt 5)/2, so
    // its phases never repeat and spread as evenly as any sequence can (a golden-ratio Weyl
    // sequence); each bin then holds its probability's share within binomial spread (4 sigma + 2).
    const hz = (RATE * (3 - Math.sqrt(5))) / 2;
    for (const [amp, v] of [
      [0.5, 1],
      [0.9, (8159 * 4) / 32768],
      [0.001, 1],
    ]) {
      const h = new LevelHistogram(v);
      const x = new Float64Array(10 * RATE);
      fillSine(x, amp, hz, RATE);
      for (let i = 0; i < x.length; i += 160) h.add(x, i, i + 160);
      const n = x.length;
      const cdf = (db: number) => {
        const u = v * Math.pow(10, db / 20);
        return u >= amp ? 1 : (2 / Math.PI) * Math.asin(u / amp);
      };
      for (let k = 0; k < LEVEL_BIN_COUNT; k++) {
        const lo = LEVEL_MIN_DBOV + k * LEVEL_BIN_DB;
        const p = cdf(lo + LEVEL_BIN_DB) - cdf(lo);
        const tol = 4 * Math.sqrt(n * p * (1 - p)) + 2;
        expect(Math.abs(h.counts[k] - n * p), `A=${amp}, bin ${k} (${lo} dBov)`).toBeLessThanOrEqual(tol);
      }
      const pUnder = cdf(LEVEL_MIN_DBOV);
      expect(Math.abs(h.underflow - n * pUnder)).toBeLessThanOrEqual(4 * Math.sqrt(n * pUnder) + 12);
      expect(h.overload).toBe(0);
      expect(h.total).toBe(n);
    }
  });

  it('bin edges: each sample lands in the bin its level in dB names', () => {
    // Source: our bin layout (0.5 dB bins of dBov), checked against Math.log10 (common practice, no source).
    const rng = new Xoshiro128(5);
    const v = 0.8;
    const h = new LevelHistogram(v);
    const one = new Float64Array(1);
    for (let t = 0; t < 20000; t++) {
      const db = -100 + 101 * rng.nextFloat();
      const x = (rng.nextUint32() & 1 ? -1 : 1) * v * Math.pow(10, db / 20);
      const before = Float64Array.from(h.counts);
      const under = h.underflow;
      const over = h.overload;
      one[0] = x;
      h.add(one);
      const level = 20 * Math.log10(Math.abs(x) / v);
      const k = Math.floor((level - LEVEL_MIN_DBOV) / LEVEL_BIN_DB);
      // Right on an edge, rounding in log10 may name either neighbour; away from edges, exactly one.
      const nearEdge =
        Math.abs(level - (LEVEL_MIN_DBOV + Math.round((level - LEVEL_MIN_DBOV) / 0.5) * 0.5)) < 1e-9;
      if (nearEdge) continue;
      if (Math.abs(x) > v) expect(h.overload).toBe(over + 1);
      else if (k < 0) expect(h.underflow).toBe(under + 1);
      else
        expect(h.counts[Math.min(k, LEVEL_BIN_COUNT - 1)]).toBe(before[Math.min(k, LEVEL_BIN_COUNT - 1)] + 1);
    }
    // Exact edges: |x| = V is the top bin, just above is overload, zero is underflow.
    const e = new LevelHistogram(1);
    e.add(Float64Array.of(1, -1, 1 + 1e-12, 0, -0, Math.pow(10, -96 / 20) * 1.0000001));
    expect(e.counts[LEVEL_BIN_COUNT - 1]).toBe(2);
    expect(e.overload).toBe(1);
    expect(e.underflow).toBe(2);
    expect(e.counts[0]).toBe(1);
  });

  it('the overload bin counts exactly the clipped samples', () => {
    // Source: the quantizer's own overload count (|x| beyond the overload point) and a direct count
    // (common practice, no source).
    for (const text of ['g711-mu', 'g711-a', 'uniform:8', 'mu:255:8']) {
      const q = createQuantizer(text);
      const x = new Float64Array(40000);
      fillLaplacian(new Xoshiro128(17), x, 0.4);
      const y = new Float64Array(x.length);
      const clipped = q.quantizeBlock(x, y);
      let direct = 0;
      for (const s of x) if (Math.abs(s) > q.overloadPoint) direct++;
      expect(clipped).toBe(direct);
      expect(clipped).toBeGreaterThan(100);
      const talker = new TalkerMeter({ rate: RATE, overloadPoint: q.overloadPoint });
      talker.add(x);
      const channel = new ChannelMeter({ quantizer: q, rate: RATE });
      channel.add(x, y);
      const ts = talker.snapshot();
      expect(ts.levels.overload).toBe(clipped);
      expect(ts.meter.overloadCount).toBe(clipped);
      expect(channel.snapshot().overloads).toBe(clipped);
      expect(ts.levels.total).toBe(x.length);
    }
  });
});

describe('per-code and per-segment occupancy', () => {
  // Odd int16 values are never G.711 decision values (those are multiples of 4 for mu-law and
  // of 16 for A-law on the 16-bit scale, G.711 Tables 1/2, from memory), so there the npm
  // package alawmulaw and our codec agree and alawmulaw can count codes independently.
  const pcm = new Int16Array(50000);
  const g = new Float64Array(pcm.length);
  fillGaussian(new Xoshiro128(23), g, 0.15);
  for (let i = 0; i < pcm.length; i++)
    pcm[i] = Math.max(-32767, Math.min(32767, 2 * Math.round(g[i] * 16384) + 1));
  const x = Float64Array.from(pcm, (n) => n / 32768);

  it.each([
    ['g711-mu', (p: Int16Array) => mulaw.encode(p)],
    ['g711-a', (p: Int16Array) => alaw.encode(p)],
  ])('%s: occupancy per code matches alawmulaw and sums to the sample count', (text, encode) => {
    // Source: npm package alawmulaw (independent G.711 encoder).
    const q = createQuantizer(text);
    const y = new Float64Array(x.length);
    const codes = new Uint8Array(x.length);
    const segs = new Uint8Array(x.length);
    q.quantizeBlock(x, y, codes, segs);
    const m = new ChannelMeter({ quantizer: q, rate: RATE });
    for (let i = 0; i < x.length; i += 160) m.add(x, y, codes, segs, i, Math.min(x.length, i + 160));
    const s = m.snapshot();
    expect(s.codes.length).toBe(256);
    const expected = new Float64Array(256);
    for (const c of encode(pcm)) expected[c]++;
    expect(Array.from(s.codes)).toEqual(Array.from(expected));
    expect(s.codes.reduce((a, b) => a + b, 0)).toBe(x.length);
    // Per-segment occupancy: chord = bits 4..6 of the magnitude index (G.711, from memory).
    const chords = new Float64Array(8);
    const invert = text === 'g711-mu' ? 0xff : 0x55;
    for (let c = 0; c < 256; c++) chords[((c ^ invert) >> 4) & 7] += expected[c];
    expect(Array.from(s.segments.counts)).toEqual(Array.from(chords));
  });

  it('a quantizer with more than 256 codes keeps no per-code table; segments still add up', () => {
    // Source: our requirement (per-code occupancy for G.711); sums are plain counting (no source).
    const q = createQuantizer('uniform:12');
    const y = new Float64Array(x.length);
    const segs = new Uint8Array(x.length);
    q.quantizeBlock(x, y, undefined, segs);
    const m = new ChannelMeter({ quantizer: q, rate: RATE });
    m.add(x, y, undefined, segs);
    const s = m.snapshot();
    expect(s.codes.length).toBe(0);
    expect(s.segments.counts.reduce((a, b) => a + b, 0)).toBe(x.length);
    // Without the segments block the meter asks the quantizer: same ledger.
    const m2 = new ChannelMeter({ quantizer: q, rate: RATE });
    m2.add(x, y);
    expect(Array.from(m2.snapshot().segments.counts)).toEqual(Array.from(s.segments.counts));
  });

  it('CodeOccupancy ignores codes outside its range', () => {
    const c = new CodeOccupancy(4);
    c.add(Int32Array.of(0, 1, 3, 4, -1, 3));
    expect(Array.from(c.counts)).toEqual([1, 1, 0, 2]);
  });
});

describe('signal meter', () => {
  it('sine: peak A, RMS A/sqrt 2, crest 3.01 dB, DC as added', () => {
    // Source: sine RMS and crest factor (common practice, no source).
    const m = new SignalMeter({ rate: RATE });
    const x = new Float64Array(RATE);
    fillSine(x, 0.5, 1000, RATE, Math.PI / 2);
    for (let i = 0; i < x.length; i++) x[i] += 0.01;
    for (let i = 0; i < x.length; i += 100) m.add(x, i, i + 100);
    const s = m.snapshot();
    expect(s.samples).toBe(RATE);
    expect(s.peak).toBeCloseTo(0.51, 12);
    expect(s.maxSample).toBeCloseTo(0.51, 12);
    expect(s.minSample).toBeCloseTo(-0.49, 12);
    expect(s.dc).toBeCloseTo(0.01, 12);
    expect(s.rms).toBeCloseTo(Math.sqrt(0.125 + 0.0001), 12);
    expect(s.crestDb as number).toBeCloseTo(20 * Math.log10(0.51 / Math.sqrt(0.1251)), 9);
    expect(s.rmsDbov as number).toBeCloseTo(10 * Math.log10(0.1251), 9);
    expect(s.momentaryRms).toBeCloseTo(Math.sqrt(0.1251), 9);
    expect(s.overloadCount).toBe(0);
    expect(s.clippedRuns).toBe(0);
  });

  it('clipped runs: count, longest, across block boundaries, and the shortest run that counts', () => {
    // Source: runs of consecutive samples at or over the clip level (common practice, no source).
    const x = Float64Array.of(0, 1, 1, 0.2, -1, -1.5, -1, 0, 0.99, 1, 1, 1, 1, 0);
    const one = new SignalMeter({ rate: RATE });
    for (let i = 0; i < x.length; i += 3) one.add(x, i, Math.min(x.length, i + 3));
    const s = one.snapshot();
    expect(s.clippedRuns).toBe(3);
    expect(s.longestClippedRun).toBe(4);
    expect(s.overloadCount).toBe(1); // only -1.5 is beyond the overload point
    const three = new SignalMeter({ rate: RATE, minClipRun: 3 });
    three.add(x);
    expect(three.snapshot().clippedRuns).toBe(2);
    // A run still open at the end counts.
    const open = new SignalMeter({ rate: RATE, clipLevel: 32767 / 32768 });
    open.add(Float64Array.of(0, 32767 / 32768, 32767 / 32768));
    expect(open.snapshot().clippedRuns).toBe(1);
    expect(open.snapshot().longestClippedRun).toBe(2);
  });

  it('any signal cut into any blocks: peak, extremes, overloads and clipped runs as counted directly', () => {
    // Source: the definitions in core/measure/meters.ts, counted by a plain loop over the whole
    // signal (common practice, no source). Quiet noise with bursts at and over the clip level,
    // fed in random blocks, so runs open and close across blocks and momentary intervals.
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1 << 30 }),
        fc.integer({ min: 1, max: 4 }),
        fc.array(fc.integer({ min: 1, max: 700 }), { minLength: 1, maxLength: 12 }),
        (seed, minClipRun, blocks) => {
          const rng = new Xoshiro128(seed);
          const x = new Float64Array(3000);
          fillGaussian(rng, x, 0.05);
          for (let b = 0; b < 12; b++) {
            const at = Math.floor(rng.nextFloat() * x.length);
            const len = 1 + Math.floor(rng.nextFloat() * 6);
            const v = rng.nextFloat() < 0.5 ? 1 : 1.2;
            for (let i = at; i < Math.min(x.length, at + len); i++) x[i] = rng.nextFloat() < 0.5 ? v : -v;
          }
          const m = new SignalMeter({ rate: RATE, minClipRun, intervalSeconds: 0.0125 });
          let at = 0;
          for (let k = 0; at < x.length; k++) {
            const end = Math.min(x.length, at + blocks[k % blocks.length]);
            m.add(x, at, end);
            at = end;
          }
          let peak = 0;
          let max = -Infinity;
          let min = Infinity;
          let overloads = 0;
          let runs = 0;
          let longest = 0;
          let run = 0;
          for (let i = 0; i <= x.length; i++) {
            const a = i < x.length ? Math.abs(x[i]) : 0;
            if (i < x.length) {
              peak = Math.max(peak, a);
              max = Math.max(max, x[i]);
              min = Math.min(min, x[i]);
              if (a > 1) overloads++;
            }
            if (a >= 1) run++;
            else {
              if (run >= minClipRun) runs++;
              longest = Math.max(longest, run);
              run = 0;
            }
          }
          const s = m.snapshot();
          expect(s.peak).toBe(peak);
          expect(s.maxSample).toBe(max);
          expect(s.minSample).toBe(min);
          expect(s.overloadCount).toBe(overloads);
          expect(s.clippedRuns).toBe(runs);
          expect(s.longestClippedRun).toBe(longest);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('silence: levels are null, not -Infinity', () => {
    // Source: our rule for figures without signal: null, never -Infinity (common practice, no source).
    const m = new SignalMeter({ rate: RATE });
    m.add(new Float64Array(1000));
    const s = m.snapshot();
    expect(s.peakDbov).toBeNull();
    expect(s.rmsDbov).toBeNull();
    expect(s.crestDb).toBeNull();
    expect(JSON.stringify(s)).not.toMatch(/NaN|Infinity/);
    m.reset();
    expect(m.snapshot().samples).toBe(0);
  });
});
