// Sources: ITU-T G.711 (8000 samples/s, 8-bit codes: 64 kbit/s, from memory); ITU-T P.56 (the
// active level follows a gain change dB for dB, from memory). The rest checks our own wiring
// conventions (DEVELOPERS.md, "The measurement engine"): where each figure is taken, and that
// block size never changes a figure.
import { describe, expect, it } from 'vitest';
import { Analyzer, analyzeSamples } from '../../core/analysis/index';
import { ChannelPath } from '../../core/channel/path';
import { measureSnr } from '../../core/measure/snr';
import { createQuantizer } from '../../core/quantizers/index';
import { fillLaplacian } from '../../core/signals/noise';
import { Xoshiro128 } from '../../core/signals/random';

const RATE = 48000;

/** Seeded speech-like test scene: Laplacian bursts of varying level with pauses (invented). */
function scene(seconds: number, seed: number): Float32Array {
  const x = new Float32Array(Math.round(seconds * RATE));
  const rng = new Xoshiro128(seed);
  const burst = new Float32Array(RATE / 4);
  for (let at = 0; at < x.length; at += burst.length) {
    const talk = rng.nextFloat() < 0.7;
    fillLaplacian(rng, burst, talk ? 0.02 + 0.15 * rng.nextFloat() : 0);
    x.set(burst.subarray(0, Math.min(burst.length, x.length - at)), at);
  }
  for (let i = 0; i < x.length; i++) x[i] = Math.max(-1, Math.min(32767 / 32768, x[i]));
  return x;
}

describe('the analyzer wires every accumulator where it belongs', () => {
  const x = scene(6, 11);

  it('gives identical figures however the input is cut into blocks (what live and offline rely on)', () => {
    const whole = analyzeSamples(x, { inputRate: RATE, channels: ['g711-mu', 'g711-a'] });
    const live = new Analyzer({ inputRate: RATE, channels: ['g711-mu', 'g711-a'], maxBlock: 128 });
    for (let at = 0; at < x.length; at += 128)
      live.processBlock(x.subarray(at, at + 128), Math.min(128, x.length - at));
    live.finish();
    expect(live.snapshot()).toEqual(whole);
    // Irregular blocks too, fed through process().
    const odd = new Analyzer({ inputRate: RATE, channels: ['g711-mu', 'g711-a'], maxBlock: 333 });
    let at = 0;
    for (const n of [1, 7, 128, 333, 50, 2]) {
      odd.process(x.subarray(at, at + n));
      at += n;
    }
    odd.process(x.subarray(at));
    odd.finish();
    expect(odd.snapshot()).toEqual(whole);
  });

  it('measures talker statistics after the input gain and the raw meter before it', () => {
    const a = analyzeSamples(x, { inputRate: RATE, channels: ['uniform:16'] });
    const b = analyzeSamples(x, { inputRate: RATE, channels: ['uniform:16'], gainDb: -6 });
    const la = a.talkers[0].activeLongTerm.activeLevelDbov;
    const lb = b.talkers[0].activeLongTerm.activeLevelDbov;
    expect(la).not.toBeNull();
    expect(lb).not.toBeNull();
    expect((lb as number) - (la as number)).toBeCloseTo(-6, 1);
    expect(b.input.peak).toBe(a.input.peak);
    expect(b.gainDb).toBe(-6);
  });

  it("a channel's SNR is its quantizer's output against its own input at the channel rate", () => {
    const snap = analyzeSamples(x, { inputRate: RATE, channels: ['g711-mu'] });
    // Independent route: the band-limited reference from a bare path, quantized here.
    const path = new ChannelPath({
      inputRate: RATE,
      channels: ['uniform:16'],
      maxBlock: x.length,
      listen: false,
    });
    path.process(x, x.length);
    const ref = path.atRate[0].reference.slice(0, path.atRate[0].length);
    const q = createQuantizer('g711-mu');
    const out = new Float64Array(ref.length);
    q.quantizeBlock(ref, out);
    expect(snap.channels[0].meter.snrDb).toBeCloseTo(measureSnr(ref, out).snrDb, 9);
    expect(snap.channels[0].meter.samples).toBe(ref.length);
    expect(snap.channels[0].rate).toBe(8000);
    expect(snap.channels[0].bitRate).toBe(64000);
  });

  it('shares one set of talker statistics per distinct rate', () => {
    const snap = analyzeSamples(x.subarray(0, RATE), {
      inputRate: RATE,
      channels: ['g711-mu', 'g711-a', 'uniform:16@16k', 'uniform:12@native'],
    });
    expect(snap.talkers.map((t) => t.rate)).toEqual([8000, 16000, 48000]);
    expect(snap.channels.map((c) => c.talker)).toEqual([0, 0, 1, 2]);
    expect(snap.seconds).toBe(1);
    // Channels at one rate share their input, so they share one signal spectrum.
    expect(snap.channels[1].meter.signalSpectrum).toEqual(snap.channels[0].meter.signalSpectrum);
  });

  it('reports silence as "no speech" and no figure, never NaN or -Infinity', () => {
    const snap = analyzeSamples(new Float32Array(RATE), { inputRate: RATE, channels: ['g711-mu'] });
    expect(snap.talkers[0].activeLongTerm.activeLevelDbov).toBeNull();
    expect(snap.channels[0].meter.snrDb).toBeNull();
    const text = JSON.stringify(snap, (_k, v: unknown) =>
      ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : v,
    );
    expect(text).not.toMatch(/NaN|Infinity/);
  });
});
