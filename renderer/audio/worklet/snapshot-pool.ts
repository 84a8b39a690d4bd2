// Snapshot envelopes for the audio thread. Each envelope is built once (when an
// analyzer is built, in a message handler, never in process()), posted with its
// typed arrays in the transfer list, and comes back from the main thread once
// read. process() only fills a free envelope and posts it: no object is created
// per snapshot. The transfer lists are kept beside the envelopes for the same reason.
import type { Analyzer } from '../../../core/analysis/analyzer';
import type { SnapshotEnvelope } from './messages';

/** Every distinct ArrayBuffer under a value (typed arrays anywhere in the tree). */
export function buffersOf(
  value: unknown,
  into: ArrayBuffer[] = [],
  seen = new Set<unknown>(),
): ArrayBuffer[] {
  if (value === null || typeof value !== 'object' || seen.has(value)) return into;
  seen.add(value);
  if (ArrayBuffer.isView(value)) {
    const buffer = value.buffer;
    if (buffer instanceof ArrayBuffer && !seen.has(buffer)) {
      seen.add(buffer);
      into.push(buffer);
    }
    return into;
  }
  for (const key of Object.keys(value)) buffersOf((value as Record<string, unknown>)[key], into, seen);
  return into;
}

export class SnapshotPool {
  private readonly free: SnapshotEnvelope[] = [];
  /** The envelope last known in each slot (the same object comes back when nothing cloned it). */
  private readonly bySlot: SnapshotEnvelope[] = [];
  private readonly transfers: ArrayBuffer[][] = [];
  private freeCount = 0;

  constructor(
    readonly generation: number,
    analyzer: Analyzer,
    size: number,
  ) {
    for (let slot = 0; slot < size; slot++) {
      this.free.push({
        type: 'snapshot',
        generation,
        slot,
        frame: 0,
        analysis: analyzer.createSnapshot(),
        howl: { howling: false, frequencyHz: null },
        outputPeak: 0,
        limiterDb: 0,
      });
      this.transfers.push([]);
    }
    for (let slot = 0; slot < size; slot++) {
      this.transfers[slot] = buffersOf(this.free[slot]);
      this.bySlot.push(this.free[slot]);
    }
    this.freeCount = size;
  }

  get available(): number {
    return this.freeCount;
  }

  /** A free envelope, or null when every one is still with the main thread. */
  take(): SnapshotEnvelope | null {
    if (this.freeCount === 0) return null;
    this.freeCount--;
    return this.free[this.freeCount];
  }

  transferOf(envelope: SnapshotEnvelope): ArrayBuffer[] {
    return this.transfers[envelope.slot];
  }

  /** An envelope handed back (a fresh object from the message): it replaces its slot. */
  release(envelope: SnapshotEnvelope): boolean {
    if (envelope.generation !== this.generation || this.freeCount >= this.free.length) return false;
    const slot = envelope.slot;
    if (!(slot >= 0 && slot < this.bySlot.length)) return false;
    if (this.bySlot[slot] !== envelope) {
      this.transfers[slot] = buffersOf(envelope);
      this.bySlot[slot] = envelope;
    }
    this.free[this.freeCount++] = envelope;
    return true;
  }
}
