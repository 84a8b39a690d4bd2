// The talker's active frames gathered from successive snapshots: each snapshot carries
// only a ring of recent frames, so a session-long record keeps its own histogram and
// takes from each ring only the frames it has not seen (by frame index).
//
// One binning for every histogram of frame levels (the page's record, the command
// line's, frameLevelHistogram): 0.25 dB bins from -120 to +20 dBov, levels beyond
// either end in the end bins. A frame's RMS cannot pass +3.01 dBov (a square wave
// clipped at the overload point) unless the input exceeds full scale (float files,
// gain), so +20 leaves room; below -120 dBov no talker is active.
import { FRAME_LOSSLESS, FRAME_MEASURED, type SegmentalSnapshot } from '../measure/segmental';
import type { FrameLevels } from './recommend';

export const FRAME_LEVEL_BIN_DB = 0.25;
export const FRAME_LEVEL_MIN_DBOV = -120;
export const FRAME_LEVEL_MAX_DBOV = 20;
export const FRAME_LEVEL_BINS = Math.round(
  (FRAME_LEVEL_MAX_DBOV - FRAME_LEVEL_MIN_DBOV) / FRAME_LEVEL_BIN_DB,
);

/** The bin of a frame level, dBov (end bins take what lies beyond). */
export function frameLevelBin(levelDbov: number): number {
  const k = Math.floor((levelDbov - FRAME_LEVEL_MIN_DBOV) / FRAME_LEVEL_BIN_DB);
  return k < 0 ? 0 : k >= FRAME_LEVEL_BINS ? FRAME_LEVEL_BINS - 1 : k;
}

/** The centre of bin k, dBov: exact in binary, so a centre falls back into its own bin. */
export function frameLevelCentre(k: number): number {
  return FRAME_LEVEL_MIN_DBOV + (k + 0.5) * FRAME_LEVEL_BIN_DB;
}

/** Bin centres and counts of the bins that hold frames. */
function levelsOf(counts: Float64Array): { levelsDbov: number[]; weights: number[] } {
  const levelsDbov: number[] = [];
  const weights: number[] = [];
  for (let k = 0; k < counts.length; k++) {
    if (counts[k] > 0) {
      levelsDbov.push(frameLevelCentre(k));
      weights.push(counts[k]);
    }
  }
  return { levelsDbov, weights };
}

export class FrameLevelTally {
  private readonly counts = new Float64Array(FRAME_LEVEL_BINS);
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

  /** A different overload point shifts every level, so the record starts afresh. */
  private referTo(overloadPoint: number): void {
    if (this.overloadPoint !== null && this.overloadPoint !== overloadPoint) this.reset();
    this.overloadPoint = overloadPoint;
  }

  /**
   * Adds the frames of a trace not yet seen: those that carried signal (measured or
   * lossless; silent frames are not the talker's). A new analyzer (channel change)
   * restarts the frame index. Frames that left the ring between two calls are missed:
   * call at least once per `traceFrames` frames.
   */
  add(s: SegmentalSnapshot, overloadPoint: number): void {
    this.referTo(overloadPoint);
    if (s.traceLastFrame < this.lastFrame) this.lastFrame = -1;
    const fresh = Math.min(s.traceLength, s.traceLastFrame - this.lastFrame);
    for (let i = s.traceLength - fresh; i < s.traceLength; i++) {
      const flag = s.traceFlags[i];
      if (flag !== FRAME_MEASURED && flag !== FRAME_LOSSLESS) continue;
      this.counts[frameLevelBin(s.traceLevelDbov[i])]++;
      this.total++;
    }
    this.lastFrame = Math.max(this.lastFrame, s.traceLastFrame);
  }

  /** Adds another record's frames (for example one per file), each level into its own bin. */
  merge(other: FrameLevels): void {
    this.referTo(other.overloadPoint ?? 1);
    const w = other.weights;
    other.levelsDbov.forEach((db, i) => {
      const n = w === undefined ? 1 : w[i];
      this.counts[frameLevelBin(db)] += n;
      this.total += n;
    });
  }

  /** Bin centres and counts of the frames so far, or null before the first active frame. */
  levels(): FrameLevels | null {
    if (this.total === 0 || this.overloadPoint === null) return null;
    return { ...levelsOf(this.counts), overloadPoint: this.overloadPoint };
  }
}

/** Frame levels binned as the talker record bins them (non-finite levels left out). */
export function frameLevelHistogram(levelsDbov: ArrayLike<number>): FrameLevels {
  const counts = new Float64Array(FRAME_LEVEL_BINS);
  for (let i = 0; i < levelsDbov.length; i++) {
    const l = levelsDbov[i];
    if (Number.isFinite(l)) counts[frameLevelBin(l)]++;
  }
  return levelsOf(counts);
}
