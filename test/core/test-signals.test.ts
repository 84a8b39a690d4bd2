// Calibrated test signals: levels tied to a quantizer's overload point and load capacity.
import { describe, expect, it } from 'vitest';
import {
  A_LAW_LOAD_CAPACITY_DBM0,
  A_LAW_OVERLOAD,
  MU_LAW_LOAD_CAPACITY_DBM0,
  MU_LAW_OVERLOAD,
} from '../../core/quantizers/g711';
import {
  LevelSweepSource,
  renderLevelSweep,
  renderTestNoise,
  renderTestTone,
  TestNoiseSource,
  TestToneSource,
} from '../../core/signals/test-signals';

const mu = { overloadPoint: MU_LAW_OVERLOAD, loadCapacityDbm0: MU_LAW_LOAD_CAPACITY_DBM0 };
const a = { overloadPoint: A_LAW_OVERLOAD, loadCapacityDbm0: A_LAW_LOAD_CAPACITY_DBM0 };

function rmsDbov(x: ArrayLike<number>, ov: number, from = 0, to = x.length): number {
  let s = 0;
  for (let i = from; i < to; i++) s += x[i] * x[i];
  return 10 * Math.log10(s / (to - from)) - 20 * Math.log10(ov);
}

describe('test tone', () => {
  it('puts 0 dBm0 on G.711 mu-law at -6.18 dBov RMS', () => {
    // Load capacity +3.17 dBm0 (ITU-T G.711 section 5, from memory): a sine peaking at the
    // overload point is +3.17 dBm0, so 0 dBm0 RMS = -3.17 - 3.01 = -6.18 dBov (exact arithmetic).
    const x = renderTestTone({ ...mu, dbm0: 0, rate: 48000, seconds: 1 });
    expect(x.length).toBe(48000);
    expect(rmsDbov(x, MU_LAW_OVERLOAD)).toBeCloseTo(-6.18, 2);
  });

  it('puts 0 dBm0 on G.711 A-law at -6.15 dBov RMS and follows the requested level', () => {
    // A-law load capacity +3.14 dBm0 (ITU-T G.711 section 5, from memory); 0 dBm0 is about
    // -6.2 dBov for both laws (common practice, no source).
    const x = renderTestTone({ ...a, dbm0: 0, rate: 8000, seconds: 1 });
    expect(rmsDbov(x, A_LAW_OVERLOAD)).toBeCloseTo(-6.15, 2);
    const y = renderTestTone({ ...a, dbm0: -30, rate: 8000, seconds: 1 });
    expect(rmsDbov(y, A_LAW_OVERLOAD)).toBeCloseTo(-36.15, 2);
  });

  it('is a 1020 Hz sine by default, the G.712 reference frequency', () => {
    // 1020 Hz reference test frequency (ITU-T O.6 / G.712, from memory): 1020 zero crossings
    // of each sign per second, counted here as rising crossings.
    const x = renderTestTone({ ...mu, dbm0: -10, rate: 48000, seconds: 1, phase: -0.1 });
    let rising = 0;
    for (let i = 1; i < x.length; i++) if (x[i - 1] < 0 && x[i] >= 0) rising++;
    expect(rising).toBe(1020);
  });

  it('streams the same samples however the stream is cut', () => {
    // Block-size invariance is the engine's contract (DEVELOPERS.md; common practice, no source).
    const whole = renderTestTone({ ...mu, dbm0: -3, frequencyHz: 697, rate: 48000, seconds: 0.1 });
    const src = TestToneSource.atDbm0(mu, -3, 48000, 697);
    const cut = new Float32Array(whole.length);
    for (let i = 0, k = 1; i < cut.length; i += k, k = (k * 7 + 3) % 200)
      src.fill(cut, i, Math.min(cut.length, i + k));
    expect(cut).toEqual(whole);
  });
});

describe('test noise', () => {
  it('is Gaussian noise whose RMS sits within 0.1 dB of the requested dBm0', () => {
    // Noise power in dBm0 is its RMS on the same scale as a sine's (ITU-T O.131 measures with
    // Gaussian noise, from memory); 1 s at 48 kHz gives a power error of sqrt(2/N) = 0.03 dB.
    for (const dbm0 of [-40, -10, 0]) {
      const x = renderTestNoise({ ...mu, dbm0, rate: 48000, seconds: 1, seed: 5 });
      expect(Math.abs(rmsDbov(x, MU_LAW_OVERLOAD) - (dbm0 - 6.18))).toBeLessThan(0.1);
    }
    // Gaussian: 68.3 % of samples within one sigma (common practice, no source).
    const x = renderTestNoise({ ...a, dbm0: -20, rate: 48000, seconds: 1, seed: 9 });
    const sigma = Math.pow(10, rmsDbov(x, 1) / 20);
    let inside = 0;
    for (const v of x) if (Math.abs(v) <= sigma) inside++;
    expect(inside / x.length).toBeCloseTo(0.683, 2);
  });

  it('repeats per seed, differs between seeds, and streams like the block form', () => {
    // Seeded, reproducible demo and test data (house rules; common practice, no source).
    const opts = { ...mu, dbm0: -20, rate: 8000, seconds: 0.5 };
    const x = renderTestNoise({ ...opts, seed: 3 });
    expect(renderTestNoise({ ...opts, seed: 3 })).toEqual(x);
    expect(renderTestNoise({ ...opts, seed: 4 })).not.toEqual(x);
    const src = TestNoiseSource.atDbm0(mu, -20, 3);
    const cut = new Float32Array(x.length);
    for (let i = 0, k = 1; i < cut.length; i += k, k = (k * 5 + 1) % 97)
      src.fill(cut, i, Math.min(cut.length, i + k));
    expect(cut).toEqual(x);
  });
});

describe('level sweep', () => {
  it('holds each step at its level in dBm0', () => {
    // Each step is a 1020 Hz tone at its level: RMS = level - 3.01 - load capacity dBov
    // (ITU-T G.711 load capacity, from memory; exact arithmetic). 0.25 s at 8 kHz is 255 whole cycles.
    const opts = { ...mu, fromDbm0: -50, toDbm0: 0, stepDb: 5, stepSeconds: 0.25, rate: 8000 };
    const x = renderLevelSweep(opts);
    expect(x.length).toBe(11 * 2000);
    for (let j = 0; j < 11; j++) {
      expect(rmsDbov(x, MU_LAW_OVERLOAD, j * 2000, (j + 1) * 2000)).toBeCloseTo(-50 + 5 * j - 6.18, 2);
    }
    const down = renderLevelSweep({ ...opts, fromDbm0: 0, toDbm0: -12, stepDb: 4 });
    expect(rmsDbov(down, MU_LAW_OVERLOAD, 3 * 2000, 4 * 2000)).toBeCloseTo(-12 - 6.18, 2);
  });

  it('loops when streamed and refuses steps too short to read', () => {
    // A stepped sweep must hold each level for several 20 ms frames (common practice, no source).
    const opts = { ...a, fromDbm0: -20, toDbm0: -10, stepDb: 10, stepSeconds: 0.1, rate: 8000 };
    const one = renderLevelSweep(opts);
    const src = new LevelSweepSource(opts);
    const two = new Float32Array(2 * one.length);
    src.fill(two, 0, 333);
    src.fill(two, 333, two.length);
    expect(two.subarray(0, one.length)).toEqual(one);
    expect(src.stepAt(one.length + 900)).toBe(1);
    expect(() => renderLevelSweep({ ...opts, stepSeconds: 0.05 })).toThrow(RangeError);
  });
});
