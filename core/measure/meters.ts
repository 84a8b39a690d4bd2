// Sample meters: peak, RMS, crest factor, DC offset, overload count and clipped
// runs since the last reset, plus the peak and RMS of the last complete short
// interval for a live meter. Used on the quantizer's input (talker statistics) and
// on the raw input at the input rate (peak and clip meter).

export interface SignalMeterOptions {
  /** Samples per second of the blocks fed in. */
  rate: number;
  /** |x| above this counts as an overload (float scale); default 1. */
  overloadPoint?: number;
  /**
   * |x| at or above this counts toward a clipped run; default the overload point.
   * For a raw 16-bit input, 32767/32768 catches samples pinned at digital full scale.
   */
  clipLevel?: number;
  /** Shortest run of consecutive samples at the clip level that counts as clipped; default 1. */
  minClipRun?: number;
  /** Length of the interval behind the momentary peak and RMS; default 0.1 s. */
  intervalSeconds?: number;
}

export interface SignalMeterSnapshot {
  samples: number;
  overloadPoint: number;
  /** Largest |x| seen. */
  peak: number;
  /** Largest and smallest sample (signed), 0 before any sample. */
  maxSample: number;
  minSample: number;
  /** Root mean square, DC included. */
  rms: number;
  /** Mean of the samples. */
  dc: number;
  /** Levels relative to the overload point; null for a silent (all-zero) signal. */
  peakDbov: number | null;
  rmsDbov: number | null;
  /** 20 log10(peak / rms); null for a silent signal. */
  crestDb: number | null;
  /** Samples with |x| above the overload point. */
  overloadCount: number;
  /** Runs of at least minClipRun consecutive samples at or above the clip level (a run still open counts). */
  clippedRuns: number;
  /** Longest run of consecutive samples at or above the clip level. */
  longestClippedRun: number;
  /** Peak and RMS over the last complete interval (0 before the first one ends). */
  momentaryPeak: number;
  momentaryRms: number;
  momentaryPeakDbov: number | null;
  momentaryRmsDbov: number | null;
}

export function emptySignalMeterSnapshot(): SignalMeterSnapshot {
  return {
    samples: 0,
    overloadPoint: 1,
    peak: 0,
    maxSample: 0,
    minSample: 0,
    rms: 0,
    dc: 0,
    peakDbov: null,
    rmsDbov: null,
    crestDb: null,
    overloadCount: 0,
    clippedRuns: 0,
    longestClippedRun: 0,
    momentaryPeak: 0,
    momentaryRms: 0,
    momentaryPeakDbov: null,
    momentaryRmsDbov: null,
  };
}

const dbOrNull = (ratio: number): number | null => (ratio > 0 ? 20 * Math.log10(ratio) : null);

type SeldomMovingDb = 'peakDbov' | 'momentaryPeakDbov' | 'momentaryRmsDbov';

/** into[key] = dbOrNull(ratio), leaving an equal number in place. */
function storeDbIfMoved(into: SignalMeterSnapshot, key: SeldomMovingDb, ratio: number): void {
  if (!(ratio > 0)) {
    into[key] = null;
    return;
  }
  const db = 20 * Math.log10(ratio);
  const old = into[key];
  if (old === null || old !== db) into[key] = db;
}

export class SignalMeter {
  readonly rate: number;
  readonly overloadPoint: number;
  readonly clipLevel: number;
  readonly minClipRun: number;
  readonly intervalLength: number;

  private n = 0;
  private sum = 0;
  private sumSq = 0;
  private max = 0;
  private min = 0;
  private overloads = 0;
  private runs = 0;
  private longest = 0;
  private run = 0;
  // Momentary interval in progress, and the last complete one.
  private intervalFill = 0;
  private intervalPeak = 0;
  private intervalSumSq = 0;
  private lastPeak = 0;
  private lastMeanSq = 0;

  constructor(opts: SignalMeterOptions) {
    if (!(opts.rate > 0)) throw new RangeError(`rate must be > 0 (got ${opts.rate})`);
    this.rate = opts.rate;
    this.overloadPoint = opts.overloadPoint ?? 1;
    this.clipLevel = opts.clipLevel ?? this.overloadPoint;
    this.minClipRun = Math.max(1, Math.round(opts.minClipRun ?? 1));
    this.intervalLength = Math.max(1, Math.round((opts.intervalSeconds ?? 0.1) * opts.rate));
    if (!(this.overloadPoint > 0)) throw new RangeError(`overload point must be > 0`);
  }

  reset(): void {
    this.n = 0;
    this.sum = 0;
    this.sumSq = 0;
    this.max = 0;
    this.min = 0;
    this.overloads = 0;
    this.runs = 0;
    this.longest = 0;
    this.run = 0;
    this.intervalFill = 0;
    this.intervalPeak = 0;
    this.intervalSumSq = 0;
    this.lastPeak = 0;
    this.lastMeanSq = 0;
  }

  /** Adds samples [start, end) of a block. */
  add(x: ArrayLike<number>, start = 0, end = x.length): void {
    const over = this.overloadPoint;
    const clip = this.clipLevel;
    const rare = Math.min(over, clip);
    let sum = 0;
    let sumSq = 0;
    let max = this.n > 0 ? this.max : -Infinity;
    let min = this.n > 0 ? this.min : Infinity;
    let overloads = 0;
    let run = this.run;
    let runs = 0;
    let longest = this.longest;
    const minRun = this.minClipRun;
    let i = start;
    while (i < end) {
      // Up to the end of the momentary interval, so its figures need no per-sample branch.
      const from = i;
      const stop = Math.min(end, i + this.intervalLength - this.intervalFill);
      const len = stop - i;
      let imax = -Infinity;
      let imin = Infinity;
      let isq = 0;
      for (; i < stop; i++) {
        const s = x[i];
        sum += s;
        isq += s * s;
        if (s > imax) imax = s;
        if (s < imin) imin = s;
      }
      // Overloads and clipped runs need a second look only where some sample reached the
      // lower of the two thresholds (rarely), or to close a run left open.
      if (!(imax < rare && -imin < rare)) {
        for (let j = from; j < stop; j++) {
          const a = Math.abs(x[j]);
          if (a > over) overloads++;
          if (a >= clip) {
            run++;
          } else if (run > 0) {
            // A clipped run just ended.
            if (run >= minRun) runs++;
            if (run > longest) longest = run;
            run = 0;
          }
        }
      } else if (run > 0) {
        if (run >= minRun) runs++;
        if (run > longest) longest = run;
        run = 0;
      }
      max = Math.max(max, imax);
      min = Math.min(min, imin);
      sumSq += isq;
      const peak = Math.max(this.intervalPeak, imax, -imin);
      this.intervalFill += len;
      if (this.intervalFill >= this.intervalLength) {
        this.lastPeak = peak;
        this.lastMeanSq = (this.intervalSumSq + isq) / this.intervalLength;
        this.intervalFill = 0;
        this.intervalPeak = 0;
        this.intervalSumSq = 0;
      } else {
        this.intervalPeak = peak;
        this.intervalSumSq += isq;
      }
    }
    this.n += end - start;
    this.sum += sum;
    this.sumSq += sumSq;
    this.overloads += overloads;
    this.run = run;
    this.runs += runs;
    this.longest = longest;
    if (end > start) {
      this.max = max;
      this.min = min;
    }
  }

  get samples(): number {
    return this.n;
  }

  snapshot(into: SignalMeterSnapshot = emptySignalMeterSnapshot()): SignalMeterSnapshot {
    const n = this.n;
    const v = this.overloadPoint;
    const peak = Math.max(this.max, -this.min, 0);
    const rms = n > 0 ? Math.sqrt(this.sumSq / n) : 0;
    into.samples = n;
    into.overloadPoint = v;
    into.peak = peak;
    into.maxSample = n > 0 ? this.max : 0;
    into.minSample = n > 0 ? this.min : 0;
    into.rms = rms;
    into.dc = n > 0 ? this.sum / n : 0;
    // A double stored where null may also go is boxed, one allocation per store; the
    // figures that seldom move (the peak since reset, the momentary ones between
    // interval ends) are stored only when they change.
    storeDbIfMoved(into, 'peakDbov', peak / v);
    into.rmsDbov = dbOrNull(rms / v);
    into.crestDb = rms > 0 ? 20 * Math.log10(peak / rms) : null;
    into.overloadCount = this.overloads;
    const open = this.run;
    into.clippedRuns = this.runs + (open >= this.minClipRun ? 1 : 0);
    into.longestClippedRun = Math.max(this.longest, open);
    into.momentaryPeak = this.lastPeak;
    into.momentaryRms = Math.sqrt(this.lastMeanSq);
    storeDbIfMoved(into, 'momentaryPeakDbov', this.lastPeak / v);
    storeDbIfMoved(into, 'momentaryRmsDbov', Math.sqrt(this.lastMeanSq) / v);
    return into;
  }
}
