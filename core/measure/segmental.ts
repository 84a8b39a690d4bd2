// Segmental SNR: the SNR of each 20 ms frame (at the channel rate), averaged in
// dB over the frames that carry signal, with a bounded distribution of frame SNRs
// for percentiles and a ring of recent frames for the SNR trace.
//
// Silence: a frame whose mean signal power is below a fixed floor (default
// -60 dBov) is skipped; a fixed floor keeps the decision the same for every
// channel and needs no look-ahead (common practice, no source). Each frame SNR is
// clamped, by default to -10 .. +60 dB; the speech-coder convention is
// -10 .. +35 dB (common practice, no source). With the clamp off, a frame without
// error has no finite SNR: it is counted as lossless and left out of the mean.

export interface FrameSnrClamp {
  minDb: number;
  maxDb: number;
}

/** Default per-frame clamp. */
export const SEGMENTAL_CLAMP_DEFAULT: FrameSnrClamp = Object.freeze({ minDb: -10, maxDb: 60 });
/** The speech-coder convention (common practice, no source). */
export const SEGMENTAL_CLAMP_SPEECH_CODER: FrameSnrClamp = Object.freeze({ minDb: -10, maxDb: 35 });

/** Frame SNR distribution: 0.25 dB bins from -40 to +160 dB; values beyond land in the end bins. */
export const FRAME_SNR_BIN_DB = 0.25;
export const FRAME_SNR_MIN_DB = -40;
export const FRAME_SNR_MAX_DB = 160;
export const FRAME_SNR_BIN_COUNT = Math.round((FRAME_SNR_MAX_DB - FRAME_SNR_MIN_DB) / FRAME_SNR_BIN_DB);

/** Trace flags per frame. */
export const FRAME_SILENT = 0;
export const FRAME_MEASURED = 1;
export const FRAME_LOSSLESS = 2;

/** Level stored in the trace for a frame of exact zeros, dBov. */
export const TRACE_LEVEL_FLOOR_DBOV = -200;

export interface SegmentalOptions {
  rate: number;
  overloadPoint?: number;
  /** Frame length, default 0.02 s. */
  frameSeconds?: number;
  /** Per-frame clamp, or null for none. Default SEGMENTAL_CLAMP_DEFAULT. */
  clamp?: FrameSnrClamp | null;
  /** Frames below this mean power are silent, dBov. Default -60. */
  silenceFloorDbov?: number;
  /** Frames kept for the trace, default 500 (10 s of 20 ms frames). */
  traceFrames?: number;
}

export interface SegmentalSnapshot {
  frameLength: number;
  frameSeconds: number;
  clamp: FrameSnrClamp | null;
  silenceFloorDbov: number;
  /** Frames completed, and how they were judged. */
  frames: number;
  measuredFrames: number;
  silentFrames: number;
  losslessFrames: number;
  /** Mean and standard deviation of the (clamped) frame SNRs, dB; null with no measured frame. */
  meanDb: number | null;
  stdDb: number | null;
  minDb: number | null;
  maxDb: number | null;
  /** Percentiles from the distribution, interpolated inside a bin; null with no measured frame. */
  p5Db: number | null;
  p50Db: number | null;
  p95Db: number | null;
  /** FRAME_SNR_BIN_COUNT counts of measured frames per 0.25 dB bin from FRAME_SNR_MIN_DB. */
  distribution: Float64Array;
  /** Recent frames, oldest first; traceLength of them are valid. */
  traceSnrDb: Float32Array;
  traceLevelDbov: Float32Array;
  traceFlags: Uint8Array;
  traceLength: number;
  /** Index (since reset) of the newest frame in the trace; -1 before the first. */
  traceLastFrame: number;
}

export function emptySegmentalSnapshot(traceFrames = 500): SegmentalSnapshot {
  return {
    frameLength: 0,
    frameSeconds: 0,
    clamp: null,
    silenceFloorDbov: 0,
    frames: 0,
    measuredFrames: 0,
    silentFrames: 0,
    losslessFrames: 0,
    meanDb: null,
    stdDb: null,
    minDb: null,
    maxDb: null,
    p5Db: null,
    p50Db: null,
    p95Db: null,
    distribution: new Float64Array(FRAME_SNR_BIN_COUNT),
    traceSnrDb: new Float32Array(traceFrames),
    traceLevelDbov: new Float32Array(traceFrames),
    traceFlags: new Uint8Array(traceFrames),
    traceLength: 0,
    traceLastFrame: -1,
  };
}

/**
 * The value below which a share p of the counted frames lie, from a distribution
 * in the layout above (linear inside a bin), or null for an empty distribution.
 */
export function distributionPercentile(distribution: Float64Array, p: number): number | null {
  ONE_SHARE[0] = p;
  percentilesInto(distribution, ONE_SHARE, ONE_PERCENTILE);
  const v = ONE_PERCENTILE[0];
  return Number.isNaN(v) ? null : v;
}

// Scratch for distributionPercentile (one realm, one thread: shared safely).
const ONE_SHARE = new Float64Array(1);
const ONE_PERCENTILE = new Float64Array(1);

/**
 * distributionPercentile for each share ps[j] into out[j], NaN for an empty
 * distribution. Results go to an array, not back as return values, since a double
 * returned from a call that is not inlined is boxed.
 */
function percentilesInto(distribution: Float64Array, ps: Float64Array, out: Float64Array): void {
  let total = 0;
  for (let b = 0; b < distribution.length; b++) total += distribution[b];
  for (let j = 0; j < ps.length; j++) {
    if (total <= 0) {
      out[j] = NaN;
      continue;
    }
    const rank = Math.min(1, Math.max(0, ps[j])) * total;
    let below = 0;
    // Stored in each branch rather than joined in one variable: a module constant
    // joined with a computed double makes V8 box the double.
    out[j] = FRAME_SNR_MAX_DB;
    for (let b = 0; b < distribution.length; b++) {
      const c = distribution[b];
      if (c > 0 && below + c >= rank) {
        out[j] = FRAME_SNR_MIN_DB + (b + (rank - below) / c) * FRAME_SNR_BIN_DB;
        break;
      }
      below += c;
    }
  }
}

/** The shares behind a snapshot's p5Db, p50Db and p95Db. */
const SNAPSHOT_SHARES = new Float64Array([0.05, 0.5, 0.95]);

/** Share of counted frames whose SNR is at least `db` (bin resolution, linear inside a bin); null if empty. */
export function distributionShareAtLeast(distribution: Float64Array, db: number): number | null {
  let total = 0;
  let at = 0;
  const pos = (db - FRAME_SNR_MIN_DB) / FRAME_SNR_BIN_DB;
  for (let b = 0; b < distribution.length; b++) {
    const c = distribution[b];
    total += c;
    if (b >= pos) at += c;
    else if (b + 1 > pos) at += c * (b + 1 - pos);
  }
  return total > 0 ? at / total : null;
}

export class SegmentalSnr {
  readonly rate: number;
  readonly overloadPoint: number;
  readonly frameLength: number;
  readonly clamp: FrameSnrClamp | null;
  readonly silenceFloorDbov: number;
  readonly traceFrames: number;
  private readonly silenceEnergy: number;
  // The clamp as plain numbers (+-Infinity when off): hot code reads only instance
  // fields, so V8 keeps the frame arithmetic unboxed. Given a double here, not left
  // for the constructor: ES2022 class fields start as undefined, and a field that once
  // held undefined is read as "any value", which made V8 box every clamped frame SNR.
  private readonly clampMin: number = -Infinity;
  private readonly clampMax: number = Infinity;
  private readonly traceFloor: number = TRACE_LEVEL_FLOOR_DBOV;
  private readonly binMin: number = FRAME_SNR_MIN_DB;
  private readonly binWidth: number = FRAME_SNR_BIN_DB;

  private frameFill = 0;
  private frameSignal = 0;
  private frameError = 0;
  private frames = 0;
  private measured = 0;
  private silent = 0;
  private lossless = 0;
  private sum = 0;
  private sumSq = 0;
  private min = Infinity;
  private max = -Infinity;
  private readonly distribution = new Float64Array(FRAME_SNR_BIN_COUNT);
  private readonly percentiles = new Float64Array(SNAPSHOT_SHARES.length);
  private readonly traceSnr: Float32Array;
  private readonly traceLevel: Float32Array;
  private readonly traceFlag: Uint8Array;
  private traceNext = 0;
  private traceCount = 0;

  constructor(opts: SegmentalOptions) {
    if (!(opts.rate > 0)) throw new RangeError(`rate must be > 0 (got ${opts.rate})`);
    this.rate = opts.rate;
    this.overloadPoint = opts.overloadPoint ?? 1;
    this.frameLength = Math.max(1, Math.round((opts.frameSeconds ?? 0.02) * opts.rate));
    const clamp = opts.clamp === undefined ? SEGMENTAL_CLAMP_DEFAULT : opts.clamp;
    if (clamp !== null && !(clamp.maxDb > clamp.minDb))
      throw new RangeError('segmental: clamp max must exceed min');
    this.clamp = clamp === null ? null : { minDb: clamp.minDb, maxDb: clamp.maxDb };
    this.clampMin = clamp === null ? -Infinity : clamp.minDb;
    this.clampMax = clamp === null ? Infinity : clamp.maxDb;
    this.silenceFloorDbov = opts.silenceFloorDbov ?? -60;
    const v = this.overloadPoint;
    this.silenceEnergy = this.frameLength * v * v * Math.pow(10, this.silenceFloorDbov / 10);
    this.traceFrames = Math.max(1, Math.round(opts.traceFrames ?? 500));
    this.traceSnr = new Float32Array(this.traceFrames);
    this.traceLevel = new Float32Array(this.traceFrames);
    this.traceFlag = new Uint8Array(this.traceFrames);
  }

  reset(): void {
    this.frameFill = 0;
    this.frameSignal = 0;
    this.frameError = 0;
    this.frames = 0;
    this.measured = 0;
    this.silent = 0;
    this.lossless = 0;
    this.sum = 0;
    this.sumSq = 0;
    this.min = Infinity;
    this.max = -Infinity;
    this.distribution.fill(0);
    this.traceSnr.fill(0);
    this.traceLevel.fill(0);
    this.traceFlag.fill(0);
    this.traceNext = 0;
    this.traceCount = 0;
  }

  /** Adds `length` samples of signal (quantizer input) and error (output - input) from index `from`. */
  add(signal: ArrayLike<number>, error: ArrayLike<number>, from: number, length: number): void {
    const end = from + length;
    let i = from;
    while (i < end) {
      const stop = Math.min(end, i + this.frameLength - this.frameFill);
      let s = 0;
      let e = 0;
      const len = stop - i;
      for (; i < stop; i++) {
        const x = signal[i];
        const d = error[i];
        s += x * x;
        e += d * d;
      }
      this.frameSignal += s;
      this.frameError += e;
      this.frameFill += len;
      if (this.frameFill >= this.frameLength) this.closeFrame();
    }
  }

  /** Samples still missing from the frame being filled. */
  get room(): number {
    return this.frameLength - this.frameFill;
  }

  /**
   * Adds the signal and error energies (energies[0], energies[1]) of `length` samples
   * summed by the caller, who keeps each call within one frame (length <= room); for
   * callers that take the sums anyway in a pass of their own. The sums come in an
   * array because doubles passed to a call that is not inlined are boxed.
   */
  addEnergy(energies: Float64Array, length: number): void {
    if (length > this.frameLength - this.frameFill) {
      throw new RangeError(`segmental: ${length} samples do not fit the ${this.room} left in the frame`);
    }
    this.frameSignal += energies[0];
    this.frameError += energies[1];
    this.frameFill += length;
    if (this.frameFill >= this.frameLength) this.closeFrame();
  }

  private closeFrame(): void {
    const s = this.frameSignal;
    const e = this.frameError;
    const v = this.overloadPoint;
    const slot = this.traceNext;
    let level = this.traceFloor;
    if (s > 0) level = 10 * Math.log10(s / (this.frameLength * v * v));
    this.traceLevel[slot] = level;
    let flag = FRAME_SILENT;
    let snr = 0;
    if (!(s >= this.silenceEnergy) || s === 0) {
      this.silent++;
    } else if (e === 0 && this.clampMax === Infinity) {
      this.lossless++;
      flag = FRAME_LOSSLESS;
    } else {
      snr = e === 0 ? this.clampMax : 10 * Math.log10(s / e);
      if (snr < this.clampMin) snr = this.clampMin;
      else if (snr > this.clampMax) snr = this.clampMax;
      flag = FRAME_MEASURED;
      this.measured++;
      this.sum += snr;
      this.sumSq += snr * snr;
      if (snr < this.min) this.min = snr;
      if (snr > this.max) this.max = snr;
      let b = Math.floor((snr - this.binMin) / this.binWidth);
      if (b < 0) b = 0;
      else if (b >= FRAME_SNR_BIN_COUNT) b = FRAME_SNR_BIN_COUNT - 1;
      this.distribution[b]++;
    }
    this.traceSnr[slot] = snr;
    this.traceFlag[slot] = flag;
    this.traceNext = slot + 1 === this.traceFrames ? 0 : slot + 1;
    if (this.traceCount < this.traceFrames) this.traceCount++;
    this.frames++;
    this.frameFill = 0;
    this.frameSignal = 0;
    this.frameError = 0;
  }

  /** Mean of the measured frame SNRs, dB, or null. */
  get meanDb(): number | null {
    return this.measured > 0 ? this.sum / this.measured : null;
  }

  snapshot(into: SegmentalSnapshot = emptySegmentalSnapshot(this.traceFrames)): SegmentalSnapshot {
    if (into.traceSnrDb.length !== this.traceFrames || into.distribution.length !== FRAME_SNR_BIN_COUNT) {
      throw new RangeError('segmental snapshot: buffers do not match this meter');
    }
    const m = this.measured;
    into.frameLength = this.frameLength;
    into.frameSeconds = this.frameLength / this.rate;
    if (this.clamp === null) into.clamp = null;
    else if (into.clamp === null) into.clamp = { ...this.clamp };
    else {
      into.clamp.minDb = this.clamp.minDb;
      into.clamp.maxDb = this.clamp.maxDb;
    }
    into.silenceFloorDbov = this.silenceFloorDbov;
    into.frames = this.frames;
    into.measuredFrames = m;
    into.silentFrames = this.silent;
    into.losslessFrames = this.lossless;
    into.distribution.set(this.distribution);
    if (m > 0) {
      const mean = this.sum / m;
      into.meanDb = mean;
      into.stdDb = Math.sqrt(Math.max(0, this.sumSq / m - mean * mean));
      // Stored only when they move: a double where null may also go is boxed per store.
      if (into.minDb !== this.min) into.minDb = this.min;
      if (into.maxDb !== this.max) into.maxDb = this.max;
      // Measured frames are all in the distribution, so none of these is NaN.
      const pc = this.percentiles;
      percentilesInto(this.distribution, SNAPSHOT_SHARES, pc);
      into.p5Db = Math.min(this.max, Math.max(this.min, pc[0]));
      into.p50Db = Math.min(this.max, Math.max(this.min, pc[1]));
      into.p95Db = Math.min(this.max, Math.max(this.min, pc[2]));
    } else {
      into.meanDb = null;
      into.stdDb = null;
      into.minDb = null;
      into.maxDb = null;
      into.p5Db = null;
      into.p50Db = null;
      into.p95Db = null;
    }
    // Unroll the ring, oldest first.
    const n = this.traceCount;
    const first = (this.traceNext - n + this.traceFrames) % this.traceFrames;
    for (let j = 0; j < n; j++) {
      const src = (first + j) % this.traceFrames;
      into.traceSnrDb[j] = this.traceSnr[src];
      into.traceLevelDbov[j] = this.traceLevel[src];
      into.traceFlags[j] = this.traceFlag[src];
    }
    for (let j = n; j < this.traceFrames; j++) {
      into.traceSnrDb[j] = 0;
      into.traceLevelDbov[j] = 0;
      into.traceFlags[j] = FRAME_SILENT;
    }
    into.traceLength = n;
    into.traceLastFrame = this.frames - 1;
    return into;
  }

  /** Percentile from the distribution, held inside the observed range. */
  percentile(p: number): number | null {
    const v = distributionPercentile(this.distribution, p);
    if (v === null) return null;
    return Math.min(this.max, Math.max(this.min, v));
  }
}
