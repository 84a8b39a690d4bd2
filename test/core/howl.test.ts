// Howl (acoustic feedback) detector: fires on a build-up, never on the built-in test signals.
import { describe, expect, it } from 'vitest';
import { HowlDetector } from '../../core/measure/howl';
import { MU_LAW_LOAD_CAPACITY_DBM0, MU_LAW_OVERLOAD } from '../../core/quantizers/g711';
import { renderDemoTalker } from '../../core/signals/demo-talker';
import { renderLevelSweep, renderTestNoise, renderTestTone } from '../../core/signals/test-signals';

const RATE = 48000;
const mu = { overloadPoint: MU_LAW_OVERLOAD, loadCapacityDbm0: MU_LAW_LOAD_CAPACITY_DBM0 };

/** Feeds x in 128-sample render quanta; returns how often howling started and when it first did. */
function watch(x: Float32Array): {
  starts: number;
  first: number | null;
  last: ReturnType<HowlDetector['state']>;
} {
  const d = new HowlDetector({ rate: RATE });
  let starts = 0;
  let first: number | null = null;
  let was = false;
  for (let i = 0; i < x.length; i += 128) {
    d.add(x, i, Math.min(x.length, i + 128));
    const s = d.state();
    if (s.howling && !was) {
      starts++;
      if (first === null) first = s.sinceSeconds;
    }
    was = s.howling;
  }
  return { starts, first, last: d.state() };
}

/**
 * A feedback loop: out = 0.5 tanh((talker + g * BP(out delayed by D)) / 0.5), the band-pass a
 * zero-phase, unity-peak resonator (60 Hz wide) at f0 = 24 * 48000 / 576 = 2000 Hz so that f0
 * meets the loop's phase condition; the tanh stands for the loudspeaker and microphone
 * saturating. Loop gain 0.5 (stable) before t0, g after: g^(1/12 ms) per trip round the loop.
 */
function feedbackLoop(seed: number, g: number, t0: number, seconds: number): Float32Array {
  const x = renderDemoTalker(RATE, seconds, seed);
  const delay = 576;
  const r = Math.exp((-Math.PI * 60) / RATE);
  const theta = (2 * Math.PI * 2000) / RATE;
  const b1 = 2 * r * Math.cos(theta);
  const b2 = -r * r;
  const g0 = (1 - r * r) / 2;
  const y = new Float32Array(x.length);
  let x1 = 0;
  let x2 = 0;
  let y1 = 0;
  let y2 = 0;
  for (let i = 0; i < x.length; i++) {
    const input = i >= delay ? y[i - delay] : 0;
    const bp = g0 * (input - x2) + b1 * y1 + b2 * y2;
    x2 = x1;
    x1 = input;
    y2 = y1;
    y1 = bp;
    y[i] = 0.5 * Math.tanh((x[i] + (i >= t0 * RATE ? g : 0.5) * bp) / 0.5);
  }
  return y;
}

describe('howl detector', () => {
  it('never fires on steady test tones at any level, from -60 to +3 dBm0', () => {
    // A steady test tone is narrow-band but does not build up (acoustic feedback grows by the
    // loop gain on each trip round the loop: common practice, no source).
    for (const dbm0 of [-60, -30, -10, 0, 3]) {
      for (const frequencyHz of [300, 1020, 2800]) {
        const r = watch(renderTestTone({ ...mu, dbm0, frequencyHz, rate: RATE, seconds: 2 }));
        expect(r.starts, `${dbm0} dBm0 at ${frequencyHz} Hz`).toBe(0);
      }
    }
  });

  it('never fires on test noise or the stepped sweeps', () => {
    // Sweeps step at least 0.1 s (test-signals.ts); the ITU-T G.712 level range -60..+3 dBm0
    // is covered in 3 dB and in 1 dB steps (from memory).
    for (const dbm0 of [-50, -20, 0])
      expect(watch(renderTestNoise({ ...mu, dbm0, rate: RATE, seconds: 2 })).starts).toBe(0);
    for (const [stepDb, stepSeconds] of [
      [3, 0.5],
      [3, 0.1],
      [6, 0.1],
      [1, 0.1],
    ]) {
      const x = renderLevelSweep({ ...mu, fromDbm0: -60, toDbm0: 3, stepDb, stepSeconds, rate: RATE });
      expect(watch(x).starts, `${stepDb} dB per ${stepSeconds} s`).toBe(0);
    }
  });

  it('never fires on the demo talker', () => {
    // Speech holds no narrow band that grows smoothly for 0.4 s (the pitch moves: common practice, no source).
    for (const seed of [1, 2, 3, 4]) expect(watch(renderDemoTalker(RATE, 20, seed)).starts).toBe(0);
  });

  it('fires within 1 s on a sinusoid growing a few dB per 100 ms over the talker, and names it', () => {
    // Feedback howl grows by a few dB per 100 ms until it saturates (common practice, no source).
    for (const dbPer100ms of [2, 3, 5]) {
      const x = renderDemoTalker(RATE, 3.5, 7);
      const t0 = 1;
      for (let i = t0 * RATE; i < x.length; i++) {
        const db = Math.min(-6, -50 + (dbPer100ms * 10 * (i - t0 * RATE)) / RATE);
        x[i] += Math.SQRT2 * Math.pow(10, db / 20) * Math.sin((2 * Math.PI * 1730 * i) / RATE);
      }
      const r = watch(x);
      expect(r.first).not.toBeNull();
      expect(r.first! - t0).toBeGreaterThan(0);
      expect(r.first! - t0).toBeLessThan(1);
      // Held while it stays high: still howling at the end, at its frequency and level
      // (a sine at -6 dBov mean square, exact arithmetic; 21 ms frames: 47 Hz bins).
      expect(r.last.howling).toBe(true);
      expect(Math.abs(r.last.frequencyHz! - 1730)).toBeLessThan(10);
      expect(Math.abs(r.last.levelDbov! + 6)).toBeLessThan(1);
    }
  });

  it('fires within 1 s of a simulated feedback loop closing with loop gain above 1', () => {
    // Loop gain 1.1 per 12 ms trip: +0.83 dB per trip, about 7 dB per 100 ms (exact arithmetic).
    for (const seed of [1, 3]) {
      const r = watch(feedbackLoop(seed, 1.1, 1, 3));
      expect(r.first).not.toBeNull();
      expect(r.first! - 1).toBeGreaterThan(0);
      expect(r.first! - 1).toBeLessThan(1);
      expect(Math.abs(r.last.frequencyHz! - 2000)).toBeLessThan(25);
    }
    // The same loop kept stable (gain 0.5) never howls.
    expect(watch(feedbackLoop(1, 0.5, 1, 3)).starts).toBe(0);
  });

  it('clears after the howl stops and starts over on reset', () => {
    // A detector that latched forever would hide the next howl (common practice, no source).
    const x = renderDemoTalker(RATE, 4, 5);
    for (let i = RATE; i < 2.5 * RATE; i++) {
      const db = Math.min(-10, -50 + (40 * (i - RATE)) / RATE);
      x[i] += Math.SQRT2 * Math.pow(10, db / 20) * Math.sin((2 * Math.PI * 900 * i) / RATE);
    }
    const d = new HowlDetector({ rate: RATE });
    d.add(x, 0, 2.5 * RATE);
    expect(d.state().howling).toBe(true);
    expect(d.state().sinceSeconds!).toBeGreaterThan(1);
    d.add(x, 2.5 * RATE, x.length);
    expect(d.state()).toEqual({ howling: false, frequencyHz: null, levelDbov: null, sinceSeconds: null });
    d.reset();
    expect(d.seconds).toBe(0);
  });
});
