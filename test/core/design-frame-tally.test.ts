// The session-long record of a talker's active frames, gathered from snapshots that carry
// only a ring of recent frames: every frame counted once, silent frames left out, and each
// frame filed at its own level.
import { describe, expect, it } from 'vitest';
import {
  FrameLevelTally,
  frameLevelBin,
  frameLevelCentre,
  frameLevelHistogram,
} from '../../core/design/frame-tally';
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

describe('one binning for every record of frame levels', () => {
  it('files a level in the same bin whichever record takes it, up to +20 dBov', () => {
    // Levels across the range, a bin edge, and loud frames: +15 dBov (a float input beyond full
    // scale) once fell into a +10 dBov top bin on the command line alone.
    const levelsDb = [-59.5, -40, -26.125, -26, -3.01, 0, 6, 15, 19.9];
    const meter = new SegmentalSnr({ rate: 8000, traceFrames: 50 });
    feed(meter, levelsDb);
    const tally = new FrameLevelTally();
    tally.add(meter.snapshot(), 1);
    const fromTrace = tally.levels()!;
    const direct = frameLevelHistogram(levelsDb);
    // The trace keeps levels as 32-bit floats; each still falls in its own 0.25 dB bin.
    expect(fromTrace.levelsDbov).toEqual(direct.levelsDbov);
    expect(fromTrace.weights).toEqual(direct.weights);
    for (const l of levelsDb)
      expect(Math.abs(frameLevelCentre(frameLevelBin(l)) - l)).toBeLessThanOrEqual(0.125);
    // Beyond either end, the end bins (no frame is dropped).
    expect(frameLevelBin(40)).toBe(frameLevelBin(19.99));
    expect(frameLevelBin(-300)).toBe(0);
  });

  it('merges records of several files into the record of one session', () => {
    const a = new SegmentalSnr({ rate: 8000, traceFrames: 50 });
    const b = new SegmentalSnr({ rate: 8000, traceFrames: 50 });
    const both = new SegmentalSnr({ rate: 8000, traceFrames: 50 });
    feed(a, [-30, -20, -20]);
    feed(b, [-20, -10, -Infinity]);
    feed(both, [-30, -20, -20, -20, -10, -Infinity]);
    const ta = new FrameLevelTally();
    const tb = new FrameLevelTally();
    const tBoth = new FrameLevelTally();
    ta.add(a.snapshot(), 1);
    tb.add(b.snapshot(), 1);
    tBoth.add(both.snapshot(), 1);
    const merged = new FrameLevelTally();
    merged.merge(ta.levels()!);
    merged.merge(tb.levels()!);
    expect(merged.levels()).toEqual(tBoth.levels());
    expect(merged.frames).toBe(5);
  });
});
