// The monitor's crossfade weights: equal gain (linear, weights sum to 1) between the
// correlated choices, equal power (squares sum to 1) to and from the error, and never
// longer than 20 ms (our requirement). Equal-gain vs equal-power crossfades for correlated vs
// uncorrelated signals: common practice in audio editing, no source.
import { describe, expect, it } from 'vitest';
import {
  MonitorMix,
  SOURCE_A,
  SOURCE_B,
  SOURCE_ERROR_A,
  SOURCE_REF,
} from '../../renderer/audio/worklet/monitor-mix';
import { MONITOR_FADE_S } from '../../renderer/audio/worklet/messages';

const RATE = 48000;
const LEN = Math.round(MONITOR_FADE_S * RATE);

function fade(mix: MonitorMix): { from: number[]; to: number[] } {
  const from: number[] = [];
  const to: number[] = [];
  for (let b = 0; b < 10; b++) {
    mix.prepare(128);
    from.push(...mix.weightFrom);
    to.push(...mix.weightTo);
  }
  return { from, to };
}

describe('monitor crossfade', () => {
  it('fades within 20 ms', () => {
    expect(MONITOR_FADE_S).toBeLessThanOrEqual(0.02);
    const mix = new MonitorMix(LEN, 128, SOURCE_REF);
    mix.request(SOURCE_A);
    const { to } = fade(mix);
    expect(to.findIndex((w) => w === 1)).toBe(LEN - 1);
    expect(mix.fading).toBe(false);
  });

  it('is equal gain between Ref, A and B', () => {
    const mix = new MonitorMix(LEN, 128, SOURCE_A);
    mix.request(SOURCE_B);
    const { from, to } = fade(mix);
    for (let i = 0; i < LEN; i++) expect(from[i] + to[i]).toBeCloseTo(1, 12);
    // Linear: the weight rises by the same amount every sample.
    expect(to[1] - to[0]).toBeCloseTo(to[LEN - 1] - to[LEN - 2], 12);
  });

  it('is equal power to and from the error', () => {
    for (const [start, end] of [
      [SOURCE_A, SOURCE_ERROR_A],
      [SOURCE_ERROR_A, SOURCE_REF],
    ]) {
      const mix = new MonitorMix(LEN, 128, start);
      mix.request(end);
      const { from, to } = fade(mix);
      for (let i = 0; i < LEN; i++) expect(from[i] ** 2 + to[i] ** 2).toBeCloseTo(1, 12);
    }
  });

  it('queues a request made during a fade instead of jumping', () => {
    const mix = new MonitorMix(LEN, 128, SOURCE_REF);
    mix.request(SOURCE_A);
    mix.prepare(128);
    mix.request(SOURCE_B);
    expect(mix.target).toBe(SOURCE_A);
    expect(mix.destination).toBe(SOURCE_B);
    fade(mix);
    expect(mix.current).toBe(SOURCE_B);
  });
});
