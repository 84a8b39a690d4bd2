// The session-long record of a talker's active frames, gathered from snapshots that carry
// only a ring of recent frames: every frame counted once, silent frames left out, and each
// frame filed at its own level.
import { describe, expect, it } from 'vitest';
import { FrameLevelTally } from '../../core/design/frame-tally';
import { SegmentalSnr } from '../../core/measure/segmental';

const FRAME = 160; // 20 ms at 8 kHz (common practice, no source)

/** Frames of a square wave at amplitude 10^(dB/20): its RMS equals its amplitude (definition, common practice, no source). */
function feed(meter: SegmentalSnr, levelsDb: number[]): void {
  const signal = new Float64Array(FRAME);
  const error = new Float64Array(FRAME).fill(1e-4);
  for (const db of levelsDb) {
    const amp = db === -Infinity ? 0 : Math.pow(10, db / 20);
    for (let i = 0; i < FRAME; i++) signal[i] = i % 2 === 0 ? amp : -amp;
    meter.add(signal, error, 0, FRAME);
  }
}

describe('FrameLevelTally', () => {
  it('counts each active frame once across overlapping snapshots and skips silence', () => {
    const meter = new SegmentalSnr({ rate: 8000, traceFrames: 50 });
    const tally = new FrameLevelTally();
    const levels = Array.from({ length: 120 }, (_, i) => (i % 4 === 3 ? -Infinity : -40 + (i % 30)));
    // Snapshots after 30, 40 (overlapping the ring) and 120 frames (more than the ring held since).
    feed(meter, levels.slice(0, 30));
    tally.add(meter.snapshot(), 1);
    feed(meter, levels.slice(30, 40));
    tally.add(meter.snapshot(), 1);
    tally.add(meter.snapshot(), 1); // the same snapshot twice adds nothing
    feed(meter, levels.slice(40, 60));
    tally.add(meter.snapshot(), 1);
    // Silent frames (exact zeros, below the -60 dBov floor) are not the talker's.
    const active = levels.slice(0, 60).filter((l) => l !== -Infinity);
    expect(tally.frames).toBe(active.length);
    const got = tally.levels();
    expect(got).not.toBeNull();
    const total = got!.weights!.reduce((s, w) => s + w, 0);
    expect(total).toBe(active.length);
    // Each level sits in the 0.25 dB bin of its frame's RMS (bin centre within 0.125 dB).
    for (const l of new Set(active)) {
      const k = got!.levelsDbov.findIndex((c) => Math.abs(c - l) <= 0.125 + 1e-9);
      expect(k).toBeGreaterThanOrEqual(0);
      expect(got!.weights![k]).toBe(active.filter((x) => x === l).length);
    }
  });

  it('starts afresh when the levels refer to another overload point', () => {
    const meter = new SegmentalSnr({ rate: 8000, traceFrames: 50 });
    const tally = new FrameLevelTally();
    feed(meter, [-20, -20, -20]);
    tally.add(meter.snapshot(), 1);
    feed(meter, [-20]);
    tally.add(meter.snapshot(), 0.5);
    expect(tally.frames).toBe(4); // the whole ring is new to the fresh record
    expect(tally.levels()!.overloadPoint).toBe(0.5);
  });

  it('keeps counting when a new analyzer restarts the frame index', () => {
    const tally = new FrameLevelTally();
    const first = new SegmentalSnr({ rate: 8000, traceFrames: 50 });
    feed(first, [-30, -30, -30, -30, -30]);
    tally.add(first.snapshot(), 1);
    const second = new SegmentalSnr({ rate: 8000, traceFrames: 50 });
    feed(second, [-10, -10]);
    tally.add(second.snapshot(), 1);
    expect(tally.frames).toBe(7);
  });

  it('has nothing to offer before the first active frame', () => {
    expect(new FrameLevelTally().levels()).toBeNull();
  });
});
