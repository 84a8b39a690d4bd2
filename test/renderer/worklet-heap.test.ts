// The processor under a worklet shim for 10,000 render quanta, in a child process with
// --expose-gc: no garbage collection during the run and no heap growth after it. The
// requirement is ours (process() allocates nothing; common practice for real-time
// audio threads, no source). Collections are counted with PerformanceObserver 'gc'
// entries (Node perf_hooks documentation).
//
// Core's per-block path allocates nothing; a snapshot boxes its nullable figures
// (some 600 bytes, about 40 per render quantum at 25 snapshots a second), and the
// processor around it adds about 5 per quantum, the howl readout's nullable figures
// (measured on Node 20, after a warm-up that lets V8 optimise the snapshot code). The
// run uses Node's default young generation, so the window (about 0.5 MB) must fit in
// it with no collection, and the young-generation bytes per quantum are held under
// about twice what was measured: far below one boxed double per sample (16 B x 128).
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildSync } from 'esbuild';
import { afterAll, describe, expect, it } from 'vitest';

const here = path.dirname(fileURLToPath(import.meta.url));
const dir = mkdtempSync(path.join(tmpdir(), 'qs-worklet-heap-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

interface HeapRun {
  bareAllocated: number;
  youngAllocated: number;
  before: number;
  afterNoGc: number;
  after: number;
  gcCount: number;
  snapshots: number;
  dropped: number;
}

describe('channel processor on the audio thread', () => {
  it('runs 10,000 blocks with no garbage collection and no heap growth', () => {
    const outfile = path.join(dir, 'heap-run.mjs');
    buildSync({
      entryPoints: [path.join(here, 'worklet-heap-run.ts')],
      bundle: true,
      platform: 'node',
      format: 'esm',
      outfile,
      logLevel: 'warning',
    });
    const stdout = execFileSync(process.execPath, ['--expose-gc', outfile], {
      encoding: 'utf8',
      timeout: 60_000,
    });
    const run = JSON.parse(stdout.trim().split('\n').pop()!) as HeapRun;
    expect(run.gcCount).toBe(0);
    // Bytes allocated per render quantum during the run (no collection in between to hide them).
    expect((run.afterNoGc - run.before) / 10_000).toBeLessThan(512);
    // Of which in the young generation (what a scavenge would collect): measured 45 to 50.
    expect(run.youngAllocated / 10_000).toBeLessThan(96);
    // Retained heap after a full collection: what the run kept (JIT feedback only).
    expect(run.after - run.before).toBeLessThan(512 * 1024);
    // 10,000 x 128 frames at 48 kHz, one snapshot per 1920 frames (25 per second): 666 of them.
    expect(run.snapshots).toBe(666);
    expect(run.dropped).toBe(0);
  });
});
