// Small accumulators the command line keeps beside the Analyzer, fed from the
// channel path's buffers after each block (Analyzer.path.atRate[i]).

/**
 * SNR after each stage of a tandem channel: stage s's output against the channel's
 * Reference (the first stage's input), so the loss of an added stage is the drop
 * from the figure before it.
 */
export class StageSnr {
  private signal = 0;
  readonly errors: Float64Array;

  constructor(readonly stages: number) {
    this.errors = new Float64Array(stages);
  }

  add(reference: Float64Array, outputs: readonly Float64Array[], n: number): void {
    let s2 = 0;
    for (let i = 0; i < n; i++) s2 += reference[i] * reference[i];
    this.signal += s2;
    for (let s = 0; s < this.stages; s++) {
      const out = outputs[s];
      let e2 = 0;
      for (let i = 0; i < n; i++) {
        const d = out[i] - reference[i];
        e2 += d * d;
      }
      this.errors[s] += e2;
    }
  }

  /** SNR after stage s, dB; null with no signal or no error. */
  snrDb(s: number): number | null {
    const e = this.errors[s];
    return this.signal > 0 && e > 0 ? 10 * Math.log10(this.signal / e) : null;
  }
}

/** Frame levels are binned at this width, dB, from FRAME_LEVEL_MIN_DBOV. */
export const FRAME_LEVEL_BIN_DB = 0.25;
export const FRAME_LEVEL_MIN_DBOV = -120;
export const FRAME_LEVEL_MAX_DBOV = 10;
const FRAME_LEVEL_BINS = Math.round((FRAME_LEVEL_MAX_DBOV - FRAME_LEVEL_MIN_DBOV) / FRAME_LEVEL_BIN_DB);

/**
 * Histogram of the RMS level of consecutive frames (20 ms at the channel rate), dB
 * relative to an overload point: the frame levels the recommender wants. Frames
 * of exact zeros and frames below the lowest bin are counted apart.
 */
export class FrameLevels {
  readonly counts = new Float64Array(FRAME_LEVEL_BINS);
  below = 0;
  private energy = 0;
  private fill = 0;
  private readonly scale: number;

  constructor(
    readonly frameLength: number,
    readonly overloadPoint: number,
  ) {
    this.scale = 1 / (overloadPoint * overloadPoint * frameLength);
  }

  add(x: Float64Array, n: number): void {
    const len = this.frameLength;
    let e = this.energy;
    let fill = this.fill;
    for (let i = 0; i < n; i++) {
      e += x[i] * x[i];
      if (++fill === len) {
        this.count(e);
        e = 0;
        fill = 0;
      }
    }
    this.energy = e;
    this.fill = fill;
  }

  private count(energy: number): void {
    const p = energy * this.scale;
    const db = p > 0 ? 10 * Math.log10(p) : -Infinity;
    const k = Math.floor((db - FRAME_LEVEL_MIN_DBOV) / FRAME_LEVEL_BIN_DB);
    if (!(k >= 0)) this.below++;
    else this.counts[Math.min(k, FRAME_LEVEL_BINS - 1)]++;
  }

  /** Bin centres (dB) and counts of the frames at or above `fromDbov`. */
  above(fromDbov: number): { levelsDbov: number[]; weights: number[] } {
    const levelsDbov: number[] = [];
    const weights: number[] = [];
    for (let k = 0; k < FRAME_LEVEL_BINS; k++) {
      const centre = FRAME_LEVEL_MIN_DBOV + (k + 0.5) * FRAME_LEVEL_BIN_DB;
      if (this.counts[k] > 0 && centre >= fromDbov) {
        levelsDbov.push(centre);
        weights.push(this.counts[k]);
      }
    }
    return { levelsDbov, weights };
  }
}
