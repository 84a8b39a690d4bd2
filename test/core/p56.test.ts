// ITU-T P.56 method B on signals with a known answer. The expected behaviour is that
// of P.56 (ITU-T P.56, from memory): envelope time constant 0.03 s, hangover 0.2 s,
// margin 15.9 dB; a steady signal's active level is its RMS, and silence stretches
// the activity factor but not the active level.
import { describe, expect, it } from 'vitest';
import { ActiveLevelMeter, type ActiveLevelResult } from '../../core/measure/active-level';
import { TalkerMeter } from '../../core/measure/talker-meter';
import { fillGaussian } from '../../core/signals/noise';
import { Xoshiro128 } from '../../core/signals/random';
import { fillSine } from '../../core/signals/tone';

const RATE = 8000;
const toneDbov = (amplitude: number) => 20 * Math.log10(amplitude / Math.SQRT2);

function run(meter: ActiveLevelMeter, parts: Float64Array[], block = 160): void {
  for (const part of parts) {
    for (let i = 0; i < part.length; i += block) meter.add(part, i, Math.min(part.length, i + block));
  }
}

function tone(seconds: number, amplitude: number, hz = 1000, rate = RATE): Float64Array {
  const x = new Float64Array(seconds * rate);
  fillSine(x, amplitude, hz, rate);
  return x;
}

function noise(seconds: number, sigma: number, seed: number, rate = RATE): Float64Array {
  const x = new Float64Array(seconds * rate);
  fillGaussian(new Xoshiro128(seed), x, sigma);
  return x;
}

const speech = (r: ActiveLevelResult): { level: number; activity: number } => {
  expect(r.activeLevelDbov).not.toBeNull();
  expect(r.activityFactor).not.toBeNull();
  return { level: r.activeLevelDbov as number, activity: r.activityFactor as number };
};

describe('P.56 method B: tone switched on and off', () => {
  it.each([
    [8000, 0.1],
    [8000, 0.7],
    [48000, 0.03],
  ])('at %i Hz, amplitude %f: activity 50..53 %%, active level = tone RMS within 0.3 dB', (rate, amp) => {
    // Source: ITU-T P.56 (from memory): 10 s on, 10 s off, twice; the 0.2 s hangover after each
    // burst counts as active, so the activity is a little above one half.
    const m = new ActiveLevelMeter({ rate });
    const on = tone(10, amp, 1000, rate);
    const off = new Float64Array(10 * rate);
    run(m, [on, off, on, off], rate / 50);
    const r = speech(m.longTerm());
    expect(r.activity).toBeGreaterThanOrEqual(0.5);
    expect(r.activity).toBeLessThanOrEqual(0.53);
    expect(Math.abs(r.level - toneDbov(amp))).toBeLessThan(0.3);
  });

  it('the hangover is what lifts the activity above one half', () => {
    // Source: ITU-T P.56 (from memory): hangover 0.2 s. Ten 1 s bursts, each followed by 1 s of
    // silence: ten hangovers in 20 s add about 10 * (0.2 s + envelope decay) of activity,
    // far more than the two of the 10 s halves.
    const m = new ActiveLevelMeter({ rate: RATE });
    const on = tone(1, 0.1);
    const off = new Float64Array(RATE);
    for (let k = 0; k < 10; k++) run(m, [on, off]);
    const r = speech(m.longTerm());
    expect(r.activity).toBeGreaterThan(0.6);
    expect(r.activity).toBeLessThan(0.68);
  });
});

describe('P.56 method B: steady noise and added silence', () => {
  it('continuous Gaussian noise: activity >= 98 %, active level = RMS within 0.3 dB', () => {
    // Source: ITU-T P.56 (from memory): a signal that never pauses is active throughout.
    for (const sigma of [0.3, 0.02, 0.001]) {
      const m = new ActiveLevelMeter({ rate: RATE });
      run(m, [noise(20, sigma, 56)]);
      const r = speech(m.longTerm());
      expect(r.activity).toBeGreaterThanOrEqual(0.98);
      expect(Math.abs(r.level - 20 * Math.log10(sigma))).toBeLessThan(0.3);
    }
  });

  it('adding silence changes the activity factor but not the active level', () => {
    // Source: ITU-T P.56 (from memory): the active level is the level of the active part.
    const burst = noise(6, 0.05, 7);
    const alone = new ActiveLevelMeter({ rate: RATE });
    run(alone, [burst]);
    const padded = new ActiveLevelMeter({ rate: RATE });
    run(padded, [new Float64Array(4 * RATE), burst, new Float64Array(8 * RATE)]);
    const a = speech(alone.longTerm());
    const b = speech(padded.longTerm());
    expect(Math.abs(a.level - b.level)).toBeLessThan(0.3);
    // 6 s of signal in 18 s: about one third, plus one hangover.
    expect(b.activity).toBeGreaterThan(0.33);
    expect(b.activity).toBeLessThan(0.36);
    expect(a.activity).toBeGreaterThan(0.98);
  });

  it('the threshold ladder does not show: a gain of g dB moves the active level by g dB (to 0.02 dB)', () => {
    // Source: ITU-T P.56 (from memory): the active level scales with the signal, and the
    // interpolation between thresholds keeps it continuous, not stepped by the ladder.
    // 3 s bursts then 3 s of silence, in 0.25 dB steps across a whole 2 dB rung and more.
    const offsets: number[] = [];
    for (let db = -41; db <= -37; db += 0.25) {
      const m = new ActiveLevelMeter({ rate: RATE });
      const amp = Math.SQRT2 * Math.pow(10, db / 20);
      run(m, [tone(3, amp), new Float64Array(3 * RATE)]);
      offsets.push(speech(m.longTerm()).level - db);
    }
    expect(Math.max(...offsets) - Math.min(...offsets)).toBeLessThan(0.02);
    // Each 3 s burst carries one hangover, so its active level sits a little under the RMS.
    for (const o of offsets) expect(o).toBeLessThan(0);
    for (const o of offsets) expect(o).toBeGreaterThan(-0.5);
  });
});

describe('P.56: no speech', () => {
  it('silence reports null, never NaN or -Infinity', () => {
    // Source: our rule for silence: null, never NaN (common practice, no source).
    const m = new ActiveLevelMeter({ rate: RATE });
    for (const r of [m.longTerm(), m.window()]) {
      expect(r.activeLevelDbov).toBeNull();
      expect(r.activityFactor).toBeNull();
      expect(r.longTermLevelDbov).toBeNull();
    }
    run(m, [new Float64Array(5 * RATE)]);
    const r = m.longTerm();
    expect(r.samples).toBe(5 * RATE);
    expect(r.activeLevelDbov).toBeNull();
    expect(r.activityFactor).toBeNull();
    expect(r.thresholdDbov).toBeNull();
    expect(r.longTermLevelDbov).toBeNull();
    expect(JSON.stringify(r)).not.toMatch(/NaN|Infinity/);
  });

  it('the sliding window forgets: speech then 12 s of silence is "no speech" in the 10 s window', () => {
    // Source: our sliding window, default 10 s (common practice, no source).
    const m = new ActiveLevelMeter({ rate: RATE });
    run(m, [noise(5, 0.1, 3), new Float64Array(12 * RATE)]);
    const w = m.window();
    expect(w.activeLevelDbov).toBeNull();
    expect(w.seconds).toBeGreaterThanOrEqual(9.9);
    expect(w.seconds).toBeLessThanOrEqual(10);
    const lt = speech(m.longTerm());
    expect(Math.abs(lt.level - 20 * Math.log10(0.1))).toBeLessThan(0.3);
  });

  it('the window tracks a level change within one window length', () => {
    // Source: ITU-T P.56 (from memory); window of 10 s (our default).
    const m = new ActiveLevelMeter({ rate: RATE, windowSeconds: 10 });
    run(m, [noise(15, 0.2, 4), noise(12, 0.02, 5)]);
    const w = speech(m.window());
    expect(Math.abs(w.level - 20 * Math.log10(0.02))).toBeLessThan(0.3);
    const lt = speech(m.longTerm());
    expect(lt.level).toBeGreaterThan(-20);
  });

  it('reset forgets everything', () => {
    const m = new ActiveLevelMeter({ rate: RATE });
    run(m, [noise(2, 0.1, 9)]);
    m.reset();
    expect(m.longTerm().samples).toBe(0);
    expect(m.longTerm().activeLevelDbov).toBeNull();
  });

  it('levels are relative to the overload point (dBov)', () => {
    // Source: the dBov definition, DEVELOPERS.md "Numbers and scales" (common practice, no source).
    const v = (8159 * 4) / 32768;
    const t = new TalkerMeter({ rate: RATE, overloadPoint: v });
    t.add(noise(5, 0.1, 11));
    const s = t.snapshot();
    const r = speech(s.activeLongTerm);
    expect(Math.abs(r.level - 20 * Math.log10(0.1 / v))).toBeLessThan(0.3);
  });
});
