// Child-process run for worklet-heap.test.ts (node --expose-gc): the processor under
// the shim for 10,000 render quanta with snapshots handed back as the main thread
// would, a channel change completing and monitor fades inside the measured run.
// Prints one JSON line: heap before/after and the garbage collections observed.
import { PerformanceObserver } from 'node:perf_hooks';
import v8 from 'node:v8';
import { installWorkletShim, lastQueue, registered, type ShimProcessor } from './worklet-shim';
import { PROCESSOR_NAME, type SnapshotEnvelope, type ToWorklet } from '../../renderer/audio/worklet/messages';
import { Analyzer } from '../../core/analysis/analyzer';

installWorkletShim(48000);
await import('../../renderer/audio/worklet/processor');

const gc = (globalThis as { gc?: () => void }).gc;
if (!gc) throw new Error('run with --expose-gc');

const Processor = registered.get(PROCESSOR_NAME)!;
const proc: ShimProcessor = new Processor({
  processorOptions: { a: 'g711-mu', b: 'g711-a', recordSeconds: 1 },
});
const queue = lastQueue;
const QUANTUM = 128;
const input = new Float32Array(QUANTUM);
const inputs = [[input, input]];
const out = [new Float32Array(QUANTUM), new Float32Array(QUANTUM)];
const outputs = [out];
const release: { data: ToWorklet } = {
  data: { type: 'release', envelope: null as unknown as SnapshotEnvelope },
};
let snapshots = 0;
// Phase in a typed array: a module-level double would box on every store.
const phase = new Float64Array(1);

function send(m: ToWorklet): void {
  proc.port.onmessage!({ data: m });
}

/** A 440 Hz tone whose level swells and fades (speech-like enough for every meter). */
function fill(block: number): void {
  for (let i = 0; i < QUANTUM; i++) {
    const n = block * QUANTUM + i;
    const env = 0.05 + 0.3 * Math.abs(Math.sin((2 * Math.PI * n) / 96000));
    let p = phase[0] + (2 * Math.PI * 440) / 48000;
    if (p > 2 * Math.PI) p -= 2 * Math.PI;
    phase[0] = p;
    input[i] = env * Math.sin(p);
  }
}

function drain(): void {
  const items = queue.items;
  for (let k = 0; k < queue.count; k++) {
    const m = items[k];
    if (m !== null && m.type === 'snapshot') {
      snapshots++;
      (release.data as { envelope: SnapshotEnvelope }).envelope = m;
      proc.port.onmessage!(release);
    }
  }
  queue.clear();
}

function run(from: number, blocks: number, fades: boolean): void {
  // Monitor fades by calling the mix directly: a control message would allocate in its handler, which is allowed.
  const mix = (proc as unknown as { mix: { request(s: number): void } }).mix;
  for (let b = from; b < from + blocks; b++) {
    fill(b);
    proc.process(inputs, outputs);
    if (fades && b % 50 === 0) mix.request((b / 50) % 5);
    drain();
  }
}

send({ type: 'mute', muted: false });
send({ type: 'volume', db: -20 });
send({ type: 'monitor', choice: 'a' });
send({ type: 'live', live: true });
run(0, 1000, true);
// A channel change: built in the handler, swapped (with its crossfade) at a block boundary.
send({ type: 'channels', a: 'uniform:12@16k', b: 'mu:255:8' });
// Warm-up long enough for V8 to optimise what runs only at snapshot time (25 a second):
// after 2000 blocks core's snapshot code was still interpreted, boxing every double, and
// that showed as some 40 bytes per quantum in the window. A multiple of 15 blocks (one
// snapshot period) keeps the window's snapshot count.
const WARM = 12_005;
run(1000, WARM, true);
drain();
gc();
gc();
/** Bytes in use in the young generation (where a scavenge would collect). */
const young = (): number =>
  v8.getHeapSpaceStatistics().find((s) => s.space_name === 'new_space')!.space_used_size;
const youngBefore = young();
const before = v8.getHeapStatistics().used_heap_size;
const snapshotsBefore = snapshots;
let gcCount = 0;
const observer = new PerformanceObserver((list) => {
  gcCount += list.getEntries().length;
});
observer.observe({ entryTypes: ['gc'] });
run(1000 + WARM, 10_000, true);
// Let the observer deliver what it saw.
await new Promise((r) => setTimeout(r, 50));
observer.disconnect();
const afterNoGc = v8.getHeapStatistics().used_heap_size;
const youngAllocated = young() - youngBefore;
gc();
gc();
const after = v8.getHeapStatistics().used_heap_size;

// The same work by core alone (an Analyzer fed the same blocks, snapshotted as often), so
// what core itself allocates can be told apart from what the worklet adds.
const bare = new Analyzer({
  inputRate: 48000,
  channels: ['uniform:12@16k', 'mu:255:8'],
  maxBlock: 128,
  listen: true,
});
const bareSnap = bare.createSnapshot();
function runBare(from: number, blocks: number): void {
  for (let b = from; b < from + blocks; b++) {
    fill(b);
    bare.processBlock(input, QUANTUM);
    if ((b + 1) % 15 === 0) bare.snapshot(bareSnap);
  }
}
runBare(0, 1000 + WARM);
gc();
gc();
const bareBefore = young();
runBare(1000 + WARM, 10_000);
const bareAfter = young();
console.log(
  JSON.stringify({
    bareAllocated: bareAfter - bareBefore,
    youngAllocated,
    before,
    afterNoGc,
    after,
    gcCount,
    snapshots: snapshots - snapshotsBefore,
    dropped: queue.dropped,
    peak: Math.max(...out[0].map(Math.abs)),
  }),
);
