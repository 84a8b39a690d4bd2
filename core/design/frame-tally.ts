// The talker's active frames gathered from successive snapshots: each snapshot carries
// only a ring of recent frames, so a session-long record keeps its own histogram and
// takes from each ring only the frames it has not seen (by frame index).
import type { SegmentalSnapshot } from '../measure/segmental';
import type { FrameLevels } from './recommend';

/** 0.25 dB bins from -120 to +20 dBov: the recommender's own binning (frameLevelHistogram). */
const BIN_DB = 0.25;
const LO_DBOV = -120;
const BINS = Math.round(140 / BIN_DB);
/** Trace flag of a frame that carried signal (segmental.ts FRAME_MEASURED). */
const MEASURED = 1;
/** Lossless frames carry signal too (FRAME_LOSSLESS). */
const LOSSLESS = 2;

export class FrameLevelTally {
  private readonly counts = new Float64Array(BINS);
  private lastFrame = -1;
  private total = 0;
  private overloadPoint: number | null = null;

  get frames(): number {
    return this.total;
  }

  reset(): void {
    this.counts.fill(0);
    this.total = 0;
    this.lastFrame = -1;
    this.overloadPoint = null;
  }

  /**
   * Adds the frames of a trace not yet seen. A new analyzer (channel change) restarts
   * the frame index; a different overload point shifts every level, so it starts afresh.
   */
  add(s: SegmentalSnapshot, overloadPoint: number): void {
    if (this.overloadPoint !== null && this.overloadPoint !== overloadPoint) this.reset();
    this.overloadPoint = overloadPoint;
    if (s.traceLastFrame < this.lastFrame) this.lastFrame = -1;
    const fresh = Math.min(s.traceLength, s.traceLastFrame - this.lastFrame);
    for (let i = s.traceLength - fresh; i < s.traceLength; i++) {
      const flag = s.traceFlags[i];
      if (flag !== MEASURED && flag !== LOSSLESS) continue;
      const k = Math.floor((s.traceLevelDbov[i] - LO_DBOV) / BIN_DB);
      this.counts[k < 0 ? 0 : k >= BINS ? BINS - 1 : k]++;
      this.total++;
    }
    this.lastFrame = Math.max(this.lastFrame, s.traceLastFrame);
  }

  /** Bin centres and counts of the frames so far, or null before the first active frame. */
  levels(): FrameLevels | null {
    if (this.total === 0 || this.overloadPoint === null) return null;
    const levelsDbov: number[] = [];
    const weights: number[] = [];
    for (let k = 0; k < BINS; k++) {
      if (this.counts[k] > 0) {
        levelsDbov.push(LO_DBOV + (k + 0.5) * BIN_DB);
        weights.push(this.counts[k]);
      }
    }
    return { levelsDbov, weights, overloadPoint: this.overloadPoint };
  }
}
