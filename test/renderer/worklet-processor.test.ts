// The channel processor under a minimal worklet shim (Node): what reaches the output,
// the monitor's crossfades, snapshots and their pool, the recording, channel changes.
import { beforeAll, describe, expect, it } from 'vitest';
import { Analyzer } from '../../core/analysis/analyzer';
import { renderTestTone, renderTestNoise, renderLevelSweep } from '../../core/signals/test-signals';
import { renderDemoTalker } from '../../core/signals/demo-talker';
import { Xoshiro128 } from '../../core/signals/random';
import {
  OUTPUT_CAP_DB,
  PROCESSOR_NAME,
  type FromWorklet,
  type SnapshotEnvelope,
  type ToWorklet,
  type WorkletStartOptions,
} from '../../renderer/audio/worklet/messages';
import {
  installWorkletShim,
  lastQueue,
  registered,
  type MessageQueue,
  type ShimProcessor,
} from './worklet-shim';

const RATE = 48000;
const Q = 128;

beforeAll(async () => {
  installWorkletShim(RATE);
  await import('../../renderer/audio/worklet/processor');
});

class Rig {
  readonly proc: ShimProcessor;
  readonly queue: MessageQueue;
  readonly messages: FromWorklet[] = [];
  handBack = true;

  constructor(options: WorkletStartOptions) {
    this.proc = new (registered.get(PROCESSOR_NAME)!)({ processorOptions: options });
    this.queue = lastQueue;
    this.drain();
  }

  send(m: ToWorklet): void {
    this.proc.port.onmessage!({ data: m });
    this.drain();
  }

  drain(): void {
    for (let k = 0; k < this.queue.count; k++) {
      const m = this.queue.items[k]!;
      this.messages.push(m.type === 'snapshot' ? structuredClone(m) : m);
      if (m.type === 'snapshot' && this.handBack)
        this.proc.port.onmessage!({ data: { type: 'release', envelope: m } });
    }
    this.queue.clear();
  }

  /** Runs a signal through in render quanta; returns the output (channel 0). */
  run(signal: Float32Array, each?: (block: number) => void): Float32Array {
    const out = new Float32Array(signal.length);
    const o = [new Float32Array(Q)];
    for (let b = 0; b * Q < signal.length; b++) {
      each?.(b);
      const inp = new Float32Array(Q);
      inp.set(signal.subarray(b * Q, b * Q + Q));
      this.proc.process([[inp]], [o]);
      (globalThis as unknown as { currentFrame: number }).currentFrame += Q;
      out.set(o[0].subarray(0, Math.min(Q, signal.length - b * Q)), b * Q);
      this.drain();
    }
    return out;
  }

  of<T extends FromWorklet['type']>(type: T): Extract<FromWorklet, { type: T }>[] {
    return this.messages.filter((m): m is Extract<FromWorklet, { type: T }> => m.type === type);
  }
}

/** 1020 Hz tone, G.712 reference frequency (from memory), at a level in dBFS-peak. */
function tone(seconds: number, peak = 0.3, hz = 1020): Float32Array {
  const s = new Float32Array(Math.round(seconds * RATE));
  for (let i = 0; i < s.length; i++) s[i] = peak * Math.sin((2 * Math.PI * hz * i) / RATE);
  return s;
}

/** Envelope: peak |x| per 5 ms window, dB. */
function envelopeDb(x: Float32Array, from: number, to: number): number[] {
  const w = 240;
  const out: number[] = [];
  for (let i = from; i + w <= to; i += w) {
    let p = 0;
    for (let k = i; k < i + w; k++) p = Math.max(p, Math.abs(x[k]));
    out.push(20 * Math.log10(p));
  }
  return out;
}

function maxStep(x: Float32Array, from: number, to: number): number {
  let m = 0;
  for (let i = from + 1; i < to; i++) m = Math.max(m, Math.abs(x[i] - x[i - 1]));
  return m;
}

describe('output safety', () => {
  it('starts muted: exact silence until unmuted', () => {
    const rig = new Rig({});
    const out = rig.run(tone(0.2));
    expect(out.every((v) => v === 0)).toBe(true);
    rig.send({ type: 'mute', muted: false });
    const live = rig.run(tone(0.2));
    expect(Math.max(...live.map(Math.abs))).toBeGreaterThan(0);
    expect(rig.of('muted').at(-1)).toEqual({ type: 'muted', muted: false });
  });

  it('never lets a sample above the -1 dBFS ceiling, however loud the monitor', () => {
    // The ceiling: -1 dBFS (our requirement). A 4-bit channel's error monitored at +40 dB overshoots on purpose.
    const rig = new Rig({ muted: false, volumeDb: 100, monitor: 'error', a: 'uniform:4' });
    rig.send({ type: 'error-gain', db: 40 });
    const out = rig.run(tone(0.5, 0.99, 997));
    const ceiling = Math.pow(10, -1 / 20);
    expect(Math.max(...out.map(Math.abs))).toBeLessThanOrEqual(ceiling);
    expect(Math.max(...out.map(Math.abs))).toBeGreaterThan(0.9 * ceiling);
    const snaps = rig.of('snapshot');
    expect(snaps.at(-1)!.limiterDb).toBeLessThan(-1);
  });

  it('caps the master volume at the cap', () => {
    // Volume above the cap is clamped to OUTPUT_CAP_DB (hearing safeguard, common practice, no source).
    const rig = new Rig({ muted: false, volumeDb: 0, monitor: 'ref' });
    const out = rig.run(tone(0.5, 0.5));
    const peak = Math.max(...out.subarray(RATE * 0.25).map(Math.abs));
    expect(20 * Math.log10(peak / 0.5)).toBeCloseTo(OUTPUT_CAP_DB, 0);
  });
});

describe('monitor switching', () => {
  it('keeps the envelope within 0.5 dB and no step above twice the steady maximum across Ref, A, B, Hidden', () => {
    // Our requirement: envelope within 0.5 dB of its steady level; sample-to-sample step at most 2x the steady maximum.
    const rig = new Rig({ muted: false, volumeDb: -12, monitor: 'ref', a: 'g711-mu', b: 'g711-a' });
    const signal = tone(2, 0.3);
    const order: ToWorklet[] = ['a', 'b', 'hidden', 'ref', 'b', 'a', 'hidden'].map((c) => ({
      type: 'monitor',
      choice: c as 'a',
    }));
    const out = rig.run(signal, (b) => {
      if (b >= 300 && b % 60 === 0 && order.length > 0) rig.send(order.shift()!);
    });
    expect(order.length).toBe(0);
    const steadyFrom = Math.round(0.3 * RATE);
    const steady = envelopeDb(out, steadyFrom, 300 * Q);
    const level = steady.reduce((a, b) => a + b, 0) / steady.length;
    const during = envelopeDb(out, 300 * Q, out.length);
    for (const db of during) expect(Math.abs(db - level)).toBeLessThanOrEqual(0.5);
    expect(maxStep(out, 300 * Q, out.length)).toBeLessThanOrEqual(2 * maxStep(out, steadyFrom, 300 * Q));
  });

  it('fades to and from Error equal-power and plays the error alone', () => {
    const rig = new Rig({ muted: false, volumeDb: -12, monitor: 'a', a: 'uniform:8', b: 'g711-a' });
    rig.send({ type: 'monitor', choice: 'error' });
    const out = rig.run(tone(0.5, 0.3));
    // An 8-bit uniform quantizer's error on a -10 dBFS tone: about 6.02 * 8 + 1.76 - 10.5 dB below
    // (Jayant and Noll 1984, the 6 dB per bit rule), so far quieter than the tone.
    const tail = Math.max(...out.subarray(RATE * 0.25).map(Math.abs));
    const cap = 0.3 * Math.pow(10, -12 / 20);
    expect(tail).toBeGreaterThan(0);
    expect(tail).toBeLessThan(cap / 30);
    expect(rig.of('monitor').at(-1)).toEqual({ type: 'monitor', choice: 'error', errorOf: 'a' });
  });

  it('keeps one seeded draw per trial until a new one is asked for, and reveals it with its seed', () => {
    const draws = (seed: number) => {
      const rig = new Rig({ seed });
      const out: string[] = [];
      for (let i = 0; i < 16; i++) {
        // Picking Hidden again (and other choices between) plays the same draw.
        for (const choice of ['hidden', 'a', 'hidden', 'b', 'hidden'] as const)
          rig.send({ type: 'monitor', choice });
        rig.send({ type: 'reveal' });
        rig.send({ type: 'reveal' });
        const [r1, r2] = rig.of('revealed').slice(-2);
        expect(r1).toEqual(r2);
        expect(r1.draw).toBe(i + 1);
        expect(r1.seed).toBe(seed);
        out.push(r1.hidden);
        rig.send({ type: 'new-draw' });
        expect(rig.of('draw').at(-1)).toEqual({ type: 'draw', draw: i + 2 });
      }
      // Neither the monitor nor the draw message says which channel it is.
      expect(rig.of('monitor').every((m) => !('hidden' in m))).toBe(true);
      expect(rig.of('draw').every((m) => Object.keys(m).sort().join() === 'draw,type')).toBe(true);
      return out.join('');
    };
    const seq = draws(7);
    expect(draws(7)).toBe(seq);
    expect(new Set(seq.split('')).size).toBe(2);
    // The seed and draw number reproduce the draw: draw k is the k-th output of the seeded
    // generator, even for A, odd for B (our convention, stated in processor.ts).
    const g = new Xoshiro128(7);
    expect(Array.from(seq, () => ((g.nextUint32() & 1) === 0 ? 'a' : 'b')).join('')).toBe(seq);
  });

  it('tells the page nothing that differs between Hidden = A and Hidden = B before Reveal', () => {
    // Seeds whose first draw hides A, and B (found, not assumed).
    const first = (seed: number) => ((new Xoshiro128(seed).nextUint32() & 1) === 0 ? 'a' : 'b');
    const seedA = [1, 2, 3, 4, 5, 6, 7, 8].find((s) => first(s) === 'a')!;
    const seedB = [1, 2, 3, 4, 5, 6, 7, 8].find((s) => first(s) === 'b')!;
    const talker = renderDemoTalker(RATE, 1.5, 4);
    const seen = (seed: number) => {
      const rig = new Rig({ seed, a: 'g711-mu', b: 'uniform:6' });
      rig.send({ type: 'mute', muted: false });
      rig.send({ type: 'volume', db: -12 });
      rig.send({ type: 'monitor', choice: 'hidden' });
      const out = rig.run(talker);
      return { messages: rig.messages, out, rig };
    };
    const a = seen(seedA);
    const b = seen(seedB);
    // What is heard differs (uniform 6 bits is far noisier than G.711: the draw matters)...
    let diff = 0;
    for (let i = 0; i < a.out.length; i++) diff = Math.max(diff, Math.abs(a.out[i] - b.out[i]));
    expect(diff).toBeGreaterThan(1e-3);
    // ...but every message, snapshots with their output peak and limiter figures included, is the same.
    expect(a.messages.length).toBeGreaterThan(30);
    expect(b.messages).toEqual(a.messages);
    expect(
      a.messages.filter((m) => m.type === 'snapshot').some((m) => (m as SnapshotEnvelope).outputPeak > 0),
    ).toBe(true);
    // After Reveal they part: the answer names each one's channel.
    a.rig.send({ type: 'reveal' });
    b.rig.send({ type: 'reveal' });
    expect([a.rig.of('revealed')[0].hidden, b.rig.of('revealed')[0].hidden]).toEqual(['a', 'b']);
  });
});

describe('scheduled reset', () => {
  it('restarts the figures exactly at the frame asked for, or at once when that frame has passed', () => {
    const g = globalThis as unknown as { currentFrame: number };
    g.currentFrame = 0;
    const rig = new Rig({});
    rig.send({ type: 'reset', atFrame: 10 * Q });
    rig.run(tone((20 * Q) / RATE));
    expect(rig.of('reset-done')).toEqual([{ type: 'reset-done', frame: 10 * Q, aligned: true }]);
    // The record keeps what came after the reset: 10 quanta.
    rig.send({ type: 'fetch-record' });
    expect(rig.of('record').at(-1)!.frames).toBe(10 * Q);
    rig.send({ type: 'reset', atFrame: 3 * Q });
    expect(rig.of('reset-done').at(-1)).toEqual({
      type: 'reset-done',
      frame: g.currentFrame,
      aligned: false,
    });
  });
});

describe('snapshots', () => {
  it('posts about 25 a second from a fixed pool and skips rather than allocate when none is free', () => {
    const rig = new Rig({ poolSize: 3 });
    rig.run(tone(1));
    // One per 1920 frames at 48 kHz: 25 per second (our requirement: about 25 a second).
    expect(rig.of('snapshot').length).toBe(25);
    const slots = new Set(rig.of('snapshot').map((s) => s.slot));
    expect(slots.size).toBeLessThanOrEqual(3);
    rig.handBack = false;
    rig.messages.length = 0;
    rig.run(tone(1));
    expect(rig.of('snapshot').length).toBe(3);
  });

  it('equals core run offline on the samples the worklet recorded, to the last bit', () => {
    const rig = new Rig({ a: 'g711-mu', b: 'uniform:12@16k', recordSeconds: 2 });
    const talker = renderDemoTalker(RATE, 1.5, 3);
    rig.run(talker);
    rig.send({ type: 'fetch-record' });
    const rec = rig.of('record').at(-1)!;
    expect(rec.frames).toBe(Math.ceil(talker.length / Q) * Q);
    const offline = new Analyzer({
      inputRate: RATE,
      channels: ['g711-mu', 'uniform:12@16k'],
      maxBlock: Q,
      listen: true,
    });
    const outA = new Float32Array(rec.input.length);
    const outB = new Float32Array(rec.input.length);
    for (let at = 0; at < rec.input.length; at += Q) {
      offline.processBlock(rec.input.subarray(at, at + Q), Q);
      outA.set(offline.path.output48[0].subarray(0, Q), at);
      outB.set(offline.path.output48[1].subarray(0, Q), at);
    }
    expect(rec.outA).toEqual(outA);
    expect(rec.outB).toEqual(outB);
    expect(rec.analysis).toEqual(offline.snapshot());
    // And the recorded input is the signal given (the shim does not resample).
    expect(rec.input.subarray(0, talker.length)).toEqual(talker);
  });
});

describe('channel changes', () => {
  it('swap at a block boundary after the new path has filled, without a click', () => {
    const rig = new Rig({ muted: false, volumeDb: -12, monitor: 'a', a: 'g711-mu', b: 'g711-a' });
    const out = rig.run(tone(1.5, 0.3), (b) => {
      if (b === 200) rig.send({ type: 'channels', a: 'g711-a', b: 'uniform:12@16k' });
    });
    expect(rig.of('channels').at(-1)).toMatchObject({ a: 'g711-a', b: 'uniform:12@16k' });
    const steadyFrom = Math.round(0.3 * RATE);
    const steady = envelopeDb(out, steadyFrom, 200 * Q);
    const level = steady.reduce((a, b) => a + b, 0) / steady.length;
    for (const db of envelopeDb(out, 200 * Q, out.length))
      expect(Math.abs(db - level)).toBeLessThanOrEqual(0.5);
    expect(maxStep(out, 200 * Q, out.length)).toBeLessThanOrEqual(2 * maxStep(out, steadyFrom, 200 * Q));
  });

  it('refuses a bad channel text with a message and keeps running the old one', () => {
    const rig = new Rig({ a: 'g711-mu' });
    rig.send({ type: 'channels', a: 'g711-q', b: 'g711-a' });
    expect(rig.of('error').at(-1)!.message).toMatch(/g711-q/);
    rig.run(tone(0.1));
    expect(rig.of('snapshot').at(-1)!.analysis.channels[0].text).toBe('g711-mu');
  });
});

describe('howl watch', () => {
  it('never fires on the built-in test signals, monitored as if live', () => {
    // howl.ts's own claim for the built-in signals (tones hold their level, sweeps climb in treads).
    const ref = { overloadPoint: (8159 * 4) / 32768, loadCapacityDbm0: 3.17 }; // G.711 mu-law (from memory)
    const signals = [
      renderTestTone({ ...ref, dbm0: 0, rate: RATE, seconds: 2 }),
      renderTestNoise({ ...ref, dbm0: -10, rate: RATE, seconds: 2 }),
      renderLevelSweep({ ...ref, fromDbm0: -50, toDbm0: 3, stepDb: 1, stepSeconds: 0.1, rate: RATE }),
      renderDemoTalker(RATE, 4, 1),
    ];
    for (const s of signals) {
      const rig = new Rig({});
      rig.send({ type: 'live', live: true });
      rig.run(s);
      const snaps = rig.of('snapshot') as SnapshotEnvelope[];
      expect(snaps.length).toBeGreaterThan(20);
      expect(snaps.some((e) => e.howl.howling)).toBe(false);
    }
  });

  it('fires on a narrow-band component that keeps growing', () => {
    // A feedback build-up: a tone rising 20 dB per second from -60 dBFS (common practice, no source).
    const s = new Float32Array(RATE * 3);
    for (let i = 0; i < s.length; i++)
      s[i] = 0.001 * Math.pow(10, i / RATE) * Math.sin((2 * Math.PI * 2200 * i) / RATE);
    const rig = new Rig({});
    rig.send({ type: 'live', live: true });
    rig.run(s);
    expect((rig.of('snapshot') as SnapshotEnvelope[]).some((e) => e.howl.howling)).toBe(true);
  });
});
