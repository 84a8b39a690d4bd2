// Snapshots: filled in place, serialisable, reset; and the meters allocate nothing
// per block once built (the house rule for hot paths, DEVELOPERS.md).
import type { HeapProfiler } from 'node:inspector';
import { Session } from 'node:inspector/promises';
import v8 from 'node:v8';
import vm from 'node:vm';
import { describe, expect, it } from 'vitest';
import { ChannelMeter } from '../../core/measure/channel-meter';
import { SignalMeter } from '../../core/measure/meters';
import { TalkerMeter } from '../../core/measure/talker-meter';
import { createQuantizer } from '../../core/quantizers/index';
import { fillLaplacian } from '../../core/signals/noise';
import { Xoshiro128 } from '../../core/signals/random';

const RATE = 8000;
const BLOCK = 160;
const BLOCKS = 8;

function scene() {
  const q = createQuantizer('g711-mu');
  const rng = new Xoshiro128(99);
  const x = new Float64Array(BLOCK * BLOCKS);
  fillLaplacian(rng, x, 0.1);
  // Pauses and loud stretches, so every accumulator has something to do.
  x.fill(0, BLOCK * 2, BLOCK * 3);
  for (let i = BLOCK * 5; i < BLOCK * 6; i++) x[i] *= 8;
  const y = new Float64Array(x.length);
  const codes = new Uint8Array(x.length);
  const segs = new Uint8Array(x.length);
  q.quantizeBlock(x, y, codes, segs);
  const raw = new Float32Array(BLOCK * 6 * BLOCKS);
  fillLaplacian(rng, raw, 0.3);
  const talker = new TalkerMeter({ rate: RATE, overloadPoint: q.overloadPoint });
  const channel = new ChannelMeter({ quantizer: q, rate: RATE, weighting: true });
  const input = new SignalMeter({ rate: 48000, clipLevel: 32767 / 32768 });
  return { q, x, y, codes, segs, raw, talker, channel, input };
}

type Scene = ReturnType<typeof scene>;

function feed(s: Scene, b: number): void {
  const k = b % BLOCKS;
  const from = k * BLOCK;
  s.talker.add(s.x, from, from + BLOCK);
  s.channel.add(s.x, s.y, s.codes, s.segs, from, from + BLOCK);
  s.input.add(s.raw, k * BLOCK * 6, (k + 1) * BLOCK * 6);
}

describe('snapshots', () => {
  it('snapshot(into) fills the same object and the same typed arrays every time', () => {
    const s = scene();
    const ts = s.talker.createSnapshot();
    const cs = s.channel.createSnapshot();
    const arraysOf = () => [
      ts.levels.counts,
      cs.codes,
      cs.segments.counts,
      cs.segments.snrDb,
      cs.segmental.distribution,
      cs.segmental.traceSnrDb,
      cs.errorSpectrum.mean,
      cs.signalSpectrum.recent,
    ];
    const arrays = arraysOf();
    for (let b = 0; b < 400; b++) {
      feed(s, b);
      if (b % 20 === 0) {
        expect(s.talker.snapshot(ts)).toBe(ts);
        expect(s.channel.snapshot(cs)).toBe(cs);
      }
    }
    arraysOf().forEach((a, i) => expect(a).toBe(arrays[i]));
    // A fresh snapshot and a refilled one agree.
    expect(s.channel.snapshot()).toEqual(s.channel.snapshot(cs));
    expect(s.talker.snapshot()).toEqual(s.talker.snapshot(ts));
  });

  it('is plain data: survives structured clone, typed arrays included', () => {
    // Source: the HTML structured clone algorithm (postMessage), as in Node (common practice).
    const s = scene();
    for (let b = 0; b < 200; b++) feed(s, b);
    const cs = s.channel.snapshot();
    const ts = s.talker.snapshot();
    const is = s.input.snapshot();
    expect(structuredClone(cs)).toEqual(cs);
    expect(structuredClone(ts)).toEqual(ts);
    expect(structuredClone(is)).toEqual(is);
    expect(structuredClone(cs).segmental.traceSnrDb).toBeInstanceOf(Float32Array);
    expect(cs.samples).toBe(200 * BLOCK);
    expect(ts.meter.samples).toBe(200 * BLOCK);
    expect(is.samples).toBe(200 * BLOCK * 6);
  });

  it('rejects a snapshot of another shape', () => {
    const s = scene();
    const other = new ChannelMeter({ quantizer: createQuantizer('uniform:12'), rate: RATE }).createSnapshot();
    expect(() => s.channel.snapshot(other)).toThrow(RangeError);
  });

  it('reset returns every figure to its empty state', () => {
    const s = scene();
    const empty = s.channel.snapshot();
    const emptyTalker = s.talker.snapshot();
    for (let b = 0; b < 100; b++) feed(s, b);
    s.channel.reset();
    s.talker.reset();
    expect(s.channel.snapshot()).toEqual(empty);
    expect(s.talker.snapshot()).toEqual(emptyTalker);
  });
});

/** Bytes allocated by code under core/measure/ while `fn` runs, from V8's sampling heap profiler (garbage included). */
async function measureAllocations(fn: () => void): Promise<{ bytes: number; sites: string[] }> {
  const session = new Session();
  session.connect();
  try {
    await session.post('HeapProfiler.enable');
    await session.post('HeapProfiler.startSampling', {
      samplingInterval: 64,
      includeObjectsCollectedByMajorGC: true,
      includeObjectsCollectedByMinorGC: true,
    });
    fn();
    const { profile } = await session.post('HeapProfiler.stopSampling');
    let bytes = 0;
    const sites: string[] = [];
    const walk = (node: HeapProfiler.SamplingHeapProfileNode) => {
      const f = node.callFrame;
      if (node.selfSize > 0 && f.url.includes('core/measure/')) {
        bytes += node.selfSize;
        sites.push(
          `${f.functionName} ${f.url.slice(f.url.indexOf('core/measure/'))}:${f.lineNumber + 1} ${node.selfSize} B`,
        );
      }
      node.children.forEach(walk);
    };
    walk(profile.head);
    return { bytes, sites };
  } finally {
    await session.post('HeapProfiler.disable');
    session.disconnect();
  }
}

describe('allocation', () => {
  // Source: the house rule (DEVELOPERS.md): hot paths allocate nothing after construction.
  const warm = (s: Scene, blocks: number, snapshots: boolean) => {
    const ts = s.talker.createSnapshot();
    const cs = s.channel.createSnapshot();
    const is = s.input.snapshot();
    return () => {
      for (let b = 0; b < blocks; b++) {
        feed(s, b);
        if (snapshots && b % 10 === 9) {
          s.talker.snapshot(ts);
          s.channel.snapshot(cs);
          s.input.snapshot(is);
        }
      }
    };
  };

  it('10,000 blocks through every meter allocate nothing (sampled by the V8 heap profiler)', async () => {
    const s = scene();
    const run = warm(s, 10000, false);
    run(); // let the JIT settle
    const { bytes, sites } = await measureAllocations(run);
    // A single allocation per block would come to 10,000 x 12 bytes or more; allow the
    // profiler's own few one-off samples.
    expect(bytes, sites.join('\n')).toBeLessThan(16 * 1024);
    expect(s.channel.samples).toBe(20000 * BLOCK);
  });

  it('with a snapshot every 10 blocks: no object or array is made, the heap stays flat', async () => {
    v8.setFlagsFromString('--expose-gc');
    const gc = vm.runInNewContext('gc') as () => void;
    const s = scene();
    const run = warm(s, 10000, true);
    run();
    gc();
    const before = process.memoryUsage().heapUsed;
    const { bytes, sites } = await measureAllocations(run);
    gc();
    const after = process.memoryUsage().heapUsed;
    // Filling a snapshot reuses every object and typed array; what V8 still allocates are the
    // boxes of the numbers stored in fields that may also hold null (about 12 bytes each). 1,000
    // rounds of three snapshots: well under 1 KB a round.
    expect(bytes / 1000, sites.join('\n')).toBeLessThan(1024);
    expect(after - before, 'heap growth after collection, bytes').toBeLessThan(256 * 1024);
  });
});
