// Page-side memory the snapshots do not carry: 60 s of frame SNRs (the worklet keeps
// 10 s), measured SNR binned by frame level for the whole session, and a short ring of
// whole-session level histograms whose difference is "this moment". All preallocated.
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { FRAME_MEASURED } from '../../../core/measure/segmental';
import { dbm0FromDbov } from '../../../core/units/levels';

/** 60 s of 20 ms frames. */
export const TRACE_FRAMES = 3000;

/** Level grid of the Level/SNR curve, dBm0 (1 dB steps). */
export const GRID_MIN_DBM0 = -70;
export const GRID_MAX_DBM0 = 6;
export const GRID_POINTS = GRID_MAX_DBM0 - GRID_MIN_DBM0 + 1;

export class ChannelHistory {
  readonly snr = new Float64Array(TRACE_FRAMES).fill(NaN);
  readonly level = new Float64Array(TRACE_FRAMES).fill(NaN);
  /** Next write position in the rings. */
  head = 0;
  frameSeconds = 0.02;
  readonly binSum = new Float64Array(GRID_POINTS);
  readonly binCount = new Float64Array(GRID_POINTS);
  private lastFrame = -1;
  private label = '';

  reset(): void {
    this.snr.fill(NaN);
    this.level.fill(NaN);
    this.binSum.fill(0);
    this.binCount.fill(0);
    this.head = 0;
    this.lastFrame = -1;
  }

  take(a: AnalysisSnapshot, index: number): void {
    const ch = a.channels[index];
    const seg = ch.meter.segmental;
    if (ch.text !== this.label || seg.traceLastFrame < this.lastFrame) {
      this.reset();
      this.label = ch.text;
    }
    this.frameSeconds = seg.frameSeconds || 0.02;
    const fresh = Math.min(seg.traceLastFrame - this.lastFrame, seg.traceLength);
    const lc = ch.meter.loadCapacityDbm0;
    for (let i = seg.traceLength - fresh; i < seg.traceLength; i++) {
      const measured = seg.traceFlags[i] === FRAME_MEASURED;
      const levelDbov = seg.traceLevelDbov[i];
      const snr = seg.traceSnrDb[i];
      this.snr[this.head] = measured ? snr : NaN;
      this.level[this.head] = levelDbov;
      this.head = (this.head + 1) % TRACE_FRAMES;
      if (measured) {
        const bin = Math.round(dbm0FromDbov(levelDbov, lc) - GRID_MIN_DBM0);
        if (bin >= 0 && bin < GRID_POINTS) {
          this.binSum[bin] += snr;
          this.binCount[bin]++;
        }
      }
    }
    if (fresh > 0) this.lastFrame = seg.traceLastFrame;
  }
}

/** Whole-session level counts of one talker, kept for a few seconds to difference. */
export class HistogramRing {
  private readonly ring: Float64Array[];
  private readonly totals: Float64Array;
  private head = 0;
  private filled = 0;
  private key = '';

  constructor(
    readonly bins: number,
    readonly depth: number,
  ) {
    this.ring = Array.from({ length: depth }, () => new Float64Array(bins));
    this.totals = new Float64Array(depth);
  }

  /** Stores the counts; `key` names the talker, so a change of channels starts afresh. */
  push(counts: Float64Array, total: number, key: string): void {
    const newest = this.filled > 0 ? this.totals[(this.head + this.depth - 1) % this.depth] : 0;
    if (key !== this.key || total < newest) {
      this.filled = 0;
      this.head = 0;
      this.key = key;
    }
    this.ring[this.head].set(counts);
    this.totals[this.head] = total;
    this.head = (this.head + 1) % this.depth;
    this.filled = Math.min(this.filled + 1, this.depth);
  }

  /** Counts added since the oldest kept histogram, into `out`; returns their total. */
  recent(out: Float64Array): number {
    if (this.filled === 0) {
      out.fill(0);
      return 0;
    }
    const newest = (this.head + this.depth - 1) % this.depth;
    const oldest = this.filled < this.depth ? 0 : this.head;
    const a = this.ring[newest];
    const b = this.ring[oldest];
    if (this.filled === 1) {
      out.set(a);
      return this.totals[newest];
    }
    for (let k = 0; k < this.bins; k++) out[k] = a[k] - b[k];
    return this.totals[newest] - this.totals[oldest];
  }
}
