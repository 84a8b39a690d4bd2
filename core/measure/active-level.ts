// Active speech level and activity factor, ITU-T P.56 method B, long-term and
// over a sliding window.
//
// The method as recalled (ITU-T P.56, from memory): the rectified signal passes
// two cascaded one-pole smoothers with time constant T = 0.03 s, giving the
// envelope q. For each threshold c_j of a ladder, a sample is active when q has
// reached c_j at that sample or within the hangover H = 0.2 s before it. With
// a_j active samples and signal energy E over all n samples, A_j = 10 log10(E/a_j)
// is the level of the active part as threshold j sees it, C_j = 20 log10(c_j);
// the active level is where A - C falls to the margin M = 15.9 dB, found from the
// lowest threshold up and interpolated linearly between the two thresholds that
// straddle it. The activity factor is then (E/n) over the active power.
//
// Our choices (not from the standard): the ladder spans -130 to +10 dBov in 2 dB
// steps (float samples have no LSB to anchor it), the interpolation is linear in
// dB, and a level found at the lowest threshold, below it, or on an all-zero
// signal is reported as "no speech" (null). The hangover is round(H * rate)
// samples, the smoother coefficient exp(-1 / (T * rate)).
//
// Cost per sample does not grow with the ladder: the envelope's threshold index
// k(n) moves by steps as the smooth envelope moves, and "reached within the
// hangover" is a running maximum of k over the last H seconds, kept in a
// monotone queue. Each sample adds one count to the histogram of that maximum K;
// a_j is the number of samples with K > j.

export const P56_TIME_CONSTANT_S = 0.03;
export const P56_HANGOVER_S = 0.2;
export const P56_MARGIN_DB = 15.9;

export interface ActiveLevelOptions {
  rate: number;
  /** Level reference; results are in dBov relative to it. Default 1. */
  overloadPoint?: number;
  /** Sliding window length, default 10 s. */
  windowSeconds?: number;
  /** Granularity of the sliding window, default 0.1 s. */
  intervalSeconds?: number;
  /** Ladder of thresholds, dBov: lowest, highest, step. Defaults -130, +10, 2. */
  floorDbov?: number;
  ceilingDbov?: number;
  stepDb?: number;
}

export interface ActiveLevelResult {
  /** Samples and seconds measured. */
  samples: number;
  seconds: number;
  /** Mean power of all samples, dBov; null for an all-zero signal. */
  longTermLevelDbov: number | null;
  /** Active speech level, dBov; null for "no speech". */
  activeLevelDbov: number | null;
  /** Share of active samples, 0..1; null for "no speech". */
  activityFactor: number | null;
  /** The threshold level where A - C met the margin, dBov; null for "no speech". */
  thresholdDbov: number | null;
}

export function emptyActiveLevelResult(): ActiveLevelResult {
  return {
    samples: 0,
    seconds: 0,
    longTermLevelDbov: null,
    activeLevelDbov: null,
    activityFactor: null,
    thresholdDbov: null,
  };
}

export class ActiveLevelMeter {
  readonly rate: number;
  readonly overloadPoint: number;
  /** Thresholds c_j, ascending, float scale. */
  readonly thresholds: Float64Array;
  /** 20 log10(c_j), absolute (not dBov). */
  private readonly thresholdsDb: Float64Array;
  readonly hangover: number;
  readonly intervalLength: number;
  readonly slotCount: number;
  private readonly g: number;
  private readonly levels: number; // thresholds + 1: histogram of K = 0..J

  // Envelope state.
  private p = 0;
  private q = 0;
  private k = 0;
  private n = 0; // samples since reset (also the time base of the queue)
  // Monotone queue of (sample index, k), k strictly decreasing from front to back.
  private readonly queueAt: Float64Array;
  private readonly queueK: Uint8Array;
  private head = 0;
  private tail = -1; // index of the newest entry; head when the queue holds one
  private size = 0;

  // Long-term totals of completed slots; the ring of slots holds the window.
  private readonly totalCounts: Float64Array;
  private totalSq = 0;
  private totalN = 0;
  private readonly slotCounts: Float64Array; // slotCount * levels
  private readonly slotSq: Float64Array;
  private readonly slotN: Float64Array;
  private slot = 0;
  // Scratch for results (no allocation in result()).
  private readonly scratch: Float64Array;

  constructor(opts: ActiveLevelOptions) {
    if (!(opts.rate > 0)) throw new RangeError(`rate must be > 0 (got ${opts.rate})`);
    this.rate = opts.rate;
    this.overloadPoint = opts.overloadPoint ?? 1;
    const floor = opts.floorDbov ?? -130;
    const ceiling = opts.ceilingDbov ?? 10;
    const step = opts.stepDb ?? 2;
    if (!(step > 0) || !(ceiling > floor)) throw new RangeError('active level: bad threshold ladder');
    const count = Math.floor((ceiling - floor) / step + 1e-9) + 1;
    if (count > 254) throw new RangeError('active level: at most 254 thresholds');
    this.thresholds = new Float64Array(count);
    this.thresholdsDb = new Float64Array(count);
    const refDb = 20 * Math.log10(this.overloadPoint);
    for (let j = 0; j < count; j++) {
      const db = floor + j * step;
      this.thresholds[j] = this.overloadPoint * Math.pow(10, db / 20);
      this.thresholdsDb[j] = db + refDb;
    }
    this.levels = count + 1;
    this.g = Math.exp(-1 / (P56_TIME_CONSTANT_S * opts.rate));
    this.hangover = Math.round(P56_HANGOVER_S * opts.rate);
    this.queueAt = new Float64Array(this.hangover + 2);
    this.queueK = new Uint8Array(this.hangover + 2);
    this.intervalLength = Math.max(1, Math.round((opts.intervalSeconds ?? 0.1) * opts.rate));
    const windowSamples = (opts.windowSeconds ?? 10) * opts.rate;
    this.slotCount = Math.max(1, Math.round(windowSamples / this.intervalLength));
    this.totalCounts = new Float64Array(this.levels);
    this.slotCounts = new Float64Array(this.slotCount * this.levels);
    this.slotSq = new Float64Array(this.slotCount);
    this.slotN = new Float64Array(this.slotCount);
    this.scratch = new Float64Array(this.levels);
  }

  reset(): void {
    this.p = 0;
    this.q = 0;
    this.k = 0;
    this.n = 0;
    this.head = 0;
    this.tail = -1;
    this.size = 0;
    this.totalCounts.fill(0);
    this.totalSq = 0;
    this.totalN = 0;
    this.slotCounts.fill(0);
    this.slotSq.fill(0);
    this.slotN.fill(0);
    this.slot = 0;
  }

  /** Adds samples [start, end) of a block. */
  add(x: ArrayLike<number>, start = 0, end = x.length): void {
    const g = this.g;
    const h = 1 - g;
    const c = this.thresholds;
    const top = c.length;
    const cap = this.queueAt.length;
    const at = this.queueAt;
    const qk = this.queueK;
    const hang = this.hangover;
    const levels = this.levels;
    let p = this.p;
    let q = this.q;
    let k = this.k;
    let n = this.n;
    let head = this.head;
    let tail = this.tail;
    let size = this.size;
    let i = start;
    while (i < end) {
      const slot = this.slot;
      const base = slot * levels;
      const counts = this.slotCounts;
      const stop = Math.min(end, i + this.intervalLength - this.slotN[slot]);
      const len = stop - i;
      let sq = 0;
      let runK = 0;
      let runLength = 0;
      for (; i < stop; i++) {
        const s = x[i];
        sq += s * s;
        // Math.abs, not a comparison: the sign would be a branch mispredicted half the time.
        p = g * p + h * Math.abs(s);
        q = g * q + h * p;
        while (k < top && q >= c[k]) k++;
        while (k > 0 && q < c[k - 1]) k--;
        // Running maximum of k over the hangover: drop entries it dominates, then stale ones.
        // The back entry usually holds this very k (the envelope moves slowly): then only
        // its time moves, since the entries before it all hold larger k.
        if (size > 0 && qk[tail] === k) {
          at[tail] = n;
        } else {
          while (size > 0 && qk[tail] <= k) {
            tail = tail === 0 ? cap - 1 : tail - 1;
            size--;
          }
          tail = tail + 1 === cap ? 0 : tail + 1;
          at[tail] = n;
          qk[tail] = k;
          size++;
        }
        while (at[head] < n - hang) {
          head = head + 1 === cap ? 0 : head + 1;
          size--;
        }
        // Count runs of equal K in a local, not one memory increment per sample.
        const K = qk[head];
        if (K !== runK) {
          counts[base + runK] += runLength;
          runK = K;
          runLength = 0;
        }
        runLength++;
        n++;
      }
      counts[base + runK] += runLength;
      this.slotSq[slot] += sq;
      this.slotN[slot] += len;
      if (this.slotN[slot] >= this.intervalLength) this.closeSlot();
    }
    this.p = p;
    this.q = q;
    this.k = k;
    this.n = n;
    this.head = head;
    this.tail = tail;
    this.size = size;
  }

  private closeSlot(): void {
    const levels = this.levels;
    const base = this.slot * levels;
    for (let j = 0; j < levels; j++) this.totalCounts[j] += this.slotCounts[base + j];
    this.totalSq += this.slotSq[this.slot];
    this.totalN += this.slotN[this.slot];
    this.slot = (this.slot + 1) % this.slotCount;
    const next = this.slot * levels;
    this.slotCounts.fill(0, next, next + levels);
    this.slotSq[this.slot] = 0;
    this.slotN[this.slot] = 0;
  }

  /** Long-term result since the last reset. */
  longTerm(into: ActiveLevelResult = emptyActiveLevelResult()): ActiveLevelResult {
    const levels = this.levels;
    const base = this.slot * levels;
    const counts = this.scratch;
    for (let j = 0; j < levels; j++) counts[j] = this.totalCounts[j] + this.slotCounts[base + j];
    return this.solve(
      counts,
      this.totalSq + this.slotSq[this.slot],
      this.totalN + this.slotN[this.slot],
      into,
    );
  }

  /**
   * Result over the sliding window: the slot in progress and the slotCount - 1
   * complete slots before it, so between (slotCount - 1) and slotCount intervals.
   */
  window(into: ActiveLevelResult = emptyActiveLevelResult()): ActiveLevelResult {
    const levels = this.levels;
    const counts = this.scratch;
    counts.fill(0);
    let sq = 0;
    let n = 0;
    for (let s = 0; s < this.slotCount; s++) {
      const base = s * levels;
      for (let j = 0; j < levels; j++) counts[j] += this.slotCounts[base + j];
      sq += this.slotSq[s];
      n += this.slotN[s];
    }
    return this.solve(counts, sq, n, into);
  }

  /**
   * P.56 solution from the histogram of K (counts[K] samples active for the
   * thresholds below index K), the energy and the sample count.
   */
  private solve(counts: Float64Array, energy: number, n: number, r: ActiveLevelResult): ActiveLevelResult {
    const refDb = 20 * Math.log10(this.overloadPoint);
    r.samples = n;
    r.seconds = n / this.rate;
    r.longTermLevelDbov = n > 0 && energy > 0 ? 10 * Math.log10(energy / n) - refDb : null;
    r.activeLevelDbov = null;
    r.activityFactor = null;
    r.thresholdDbov = null;
    if (!(n > 0 && energy > 0)) return r;
    // Turn counts[K] into a_j = sum over K > j, in place, from the top down.
    const top = this.thresholds.length;
    let above = 0;
    for (let K = top; K >= 1; K--) {
      above += counts[K];
      counts[K] = above; // now a_{K-1}
    }
    const eDb = 10 * Math.log10(energy);
    let prevA = 0;
    let prevD = 0;
    for (let j = 0; j < top; j++) {
      const a = counts[j + 1];
      if (a <= 0) return r; // no threshold met the margin before activity ran out
      const levelDb = eDb - 10 * Math.log10(a);
      const d = levelDb - this.thresholdsDb[j];
      if (d <= P56_MARGIN_DB) {
        if (j === 0) return r; // at or below the bottom of the ladder: no speech we can place
        const t = (prevD - P56_MARGIN_DB) / (prevD - d);
        const activeDb = prevA + t * (levelDb - prevA);
        const activity = energy / n / Math.pow(10, activeDb / 10);
        r.activeLevelDbov = activeDb - refDb;
        r.activityFactor = Math.min(1, activity);
        r.thresholdDbov = activeDb - P56_MARGIN_DB - refDb;
        return r;
      }
      prevA = levelDb;
      prevD = d;
    }
    return r;
  }
}
