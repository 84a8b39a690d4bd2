// Acoustic feedback (howl) detector for a monitored live microphone.
//
// The rule. Every hop (half of a ~21 ms Hann frame; 512 samples at 48 kHz) the detector
// takes the short-time power spectrum over 100 Hz .. 10 kHz and finds its strongest bin.
// The narrow-band level of a bin is the power of it and its two neighbours. A howl is
// declared when, at the strongest bin,
//   1. dominance: that narrow band holds at least HOWL_DOMINANCE_SHARE of the band's power;
//   2. build-up: over the last 0.43 s (HOWL_GROWTH_BLOCKS blocks of four hops), its narrow-band
//      level rose by at least HOWL_MIN_HOP_RISE_DB in at least HOWL_MIN_RISING_HOPS of the hops, its
//      block means rose by at least HOWL_MIN_BLOCK_RISE_DB from each block to the next (one
//      block may miss), and it rose by at least HOWL_MIN_TOTAL_RISE_DB in all;
//   3. it is audible: its level is at least HOWL_MIN_LEVEL_DBOV.
// Once declared, the howl holds while a narrow band within two bins of it keeps at least
// HOWL_HOLD_SHARE of the power and stays within HOWL_HOLD_DROP_DB of its loudest; it clears after
// HOWL_RELEASE_SECONDS without that.
//
// Why steady tones never fire: feedback grows from the room's own sound by a roughly fixed
// number of dB per trip round the loop, so its level climbs smoothly and keeps climbing
// until something saturates. A test tone switched on jumps to its level within one frame
// and then holds it: its hops stop rising at once (rule 2 fails however loud the tone). A
// stepped sweep climbs, but in treads: each level holds for at least 0.1 s (the shortest
// step test-signals.ts accepts), about nine hops of which the window smears only three, so
// at most about 40 % of its hops rise, short of HOWL_MIN_RISING_HOPS. Noise and speech fail rule 1, or rule 2
// since no syllable grows smoothly for 0.43 s at one frequency (the pitch moves). The cost:
// a howl that is already saturated when monitoring starts is not reported until it builds
// again; and the detector should see the microphone before the input gain, so that the
// engineer moving the gain on a steady tone cannot look like a build-up.
import FFT from 'fft.js';

export const HOWL_DOMINANCE_SHARE = 0.3;
export const HOWL_HOLD_SHARE = 0.2;
export const HOWL_MIN_BLOCK_RISE_DB = 0.25;
export const HOWL_MIN_HOP_RISE_DB = 0.05;
export const HOWL_MIN_RISING_HOPS = 0.8;
export const HOWL_MIN_TOTAL_RISE_DB = 6;
export const HOWL_MIN_LEVEL_DBOV = -60;
export const HOWL_HOLD_DROP_DB = 20;
export const HOWL_RELEASE_SECONDS = 0.3;
export const HOWL_GROWTH_BLOCKS = 10;
const BLOCK_SECONDS = 0.043;
const LOW_HZ = 100;
const HIGH_HZ = 10_000;
const TINY = 1e-30;

export interface HowlState {
  howling: boolean;
  /** Frequency of the howl, Hz (interpolated between bins); null when not howling. */
  frequencyHz: number | null;
  /** Power of the narrow-band component, dBov (mean square against the overload point). */
  levelDbov: number | null;
  /** Input time, seconds since reset, when this howl was declared. */
  sinceSeconds: number | null;
}

export function emptyHowlState(): HowlState {
  return { howling: false, frequencyHz: null, levelDbov: null, sinceSeconds: null };
}

export interface HowlOptions {
  /** Input rate, default 48000. */
  rate?: number;
  /** Level reference for levelDbov, default 1 (full scale). */
  overloadPoint?: number;
}

export class HowlDetector {
  readonly rate: number;
  readonly overloadPoint: number;
  readonly size: number;
  readonly hop: number;
  private readonly fft: FFT;
  private readonly window: Float64Array;
  private readonly scale: number;
  private readonly raw: Float64Array;
  private readonly frame: Float64Array;
  private readonly spectrum: Float64Array;
  private readonly power: Float64Array;
  private readonly lo: number;
  private readonly hi: number;
  private readonly blockHops: number;
  private readonly historyHops: number;
  /** Narrow-band level per bin per hop, dB, ring of historyHops rows. */
  private readonly history: Float32Array;
  private row = 0;
  private hops = 0;
  private fill = 0;
  private samples = 0;

  private howling = false;
  private howlBin = 0;
  private howlHz = 0;
  private howlDb = 0;
  private howlMaxDb = 0;
  private since = 0;
  private missing = 0;
  private readonly releaseHops: number;

  constructor(opts: HowlOptions = {}) {
    const rate = opts.rate ?? 48000;
    if (!(rate >= 8000) || !Number.isFinite(rate))
      throw new RangeError(`howl detector: rate must be >= 8000 (got ${rate})`);
    this.rate = rate;
    this.overloadPoint = opts.overloadPoint ?? 1;
    if (!(this.overloadPoint > 0)) throw new RangeError('howl detector: overload point must be > 0');
    this.size = 2 ** Math.round(Math.log2(rate * 0.0213));
    this.hop = this.size / 2;
    this.fft = new FFT(this.size);
    this.window = new Float64Array(this.size);
    let u = 0;
    for (let i = 0; i < this.size; i++) {
      const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / this.size);
      this.window[i] = w;
      u += w * w;
    }
    // One-sided power per bin, so a band's bins add up to its mean square.
    this.scale = 2 / (this.size * u);
    this.raw = new Float64Array(this.size);
    this.frame = new Float64Array(this.size);
    this.spectrum = new Float64Array(2 * this.size);
    const bins = this.size / 2 + 1;
    this.power = new Float64Array(bins);
    this.lo = Math.max(2, Math.ceil((LOW_HZ * this.size) / rate));
    this.hi = Math.min(bins - 3, Math.floor((Math.min(HIGH_HZ, 0.45 * rate) * this.size) / rate));
    const hopSeconds = this.hop / rate;
    this.blockHops = Math.max(1, Math.round(BLOCK_SECONDS / hopSeconds));
    this.historyHops = this.blockHops * HOWL_GROWTH_BLOCKS;
    this.history = new Float32Array(this.historyHops * bins);
    this.releaseHops = Math.max(1, Math.round(HOWL_RELEASE_SECONDS / hopSeconds));
    this.reset();
  }

  reset(): void {
    this.raw.fill(0);
    this.history.fill(-300);
    this.row = 0;
    this.hops = 0;
    this.fill = 0;
    this.samples = 0;
    this.clear();
  }

  /** Input seconds since reset. */
  get seconds(): number {
    return this.samples / this.rate;
  }

  /** Adds samples [start, end) of a block of input. */
  add(block: ArrayLike<number>, start = 0, end = block.length): void {
    const n = this.size;
    let i = start;
    while (i < end) {
      const take = Math.min(end - i, n - this.fill);
      const raw = this.raw;
      const at = this.fill;
      for (let j = 0; j < take; j++) raw[at + j] = block[i + j];
      this.fill += take;
      this.samples += take;
      i += take;
      if (this.fill === n) {
        this.analyse();
        raw.copyWithin(0, this.hop, n);
        this.fill = n - this.hop;
      }
    }
  }

  state(into: HowlState = emptyHowlState()): HowlState {
    into.howling = this.howling;
    into.frequencyHz = this.howling ? this.howlHz : null;
    into.levelDbov = this.howling ? this.howlDb : null;
    into.sinceSeconds = this.howling ? this.since : null;
    return into;
  }

  private clear(): void {
    this.howling = false;
    this.missing = 0;
  }

  private analyse(): void {
    const n = this.size;
    const f = this.frame;
    for (let j = 0; j < n; j++) f[j] = this.raw[j] * this.window[j];
    this.fft.realTransform(this.spectrum, f);
    const sp = this.spectrum;
    const p = this.power;
    const scale = this.scale;
    const lo = this.lo;
    const hi = this.hi;
    for (let k = lo - 1; k <= hi + 1; k++)
      p[k] = (sp[2 * k] * sp[2 * k] + sp[2 * k + 1] * sp[2 * k + 1]) * scale;
    let total = 0;
    let peak = lo;
    for (let k = lo; k <= hi; k++) {
      total += p[k];
      if (p[k] > p[peak]) peak = k;
    }
    const bins = n / 2 + 1;
    const rowBase = this.row * bins;
    const hist = this.history;
    const refDb = 20 * Math.log10(this.overloadPoint);
    for (let k = lo; k <= hi; k++)
      hist[rowBase + k] = 10 * Math.log10(p[k - 1] + p[k] + p[k + 1] + TINY) - refDb;
    this.hops++;
    const share = (p[peak - 1] + p[peak] + p[peak + 1]) / (total + TINY);
    const levelDb = hist[rowBase + peak];

    if (this.howling) {
      // Follow the strongest bin near the howl; it may drift by a bin as the loop settles.
      let best = this.howlBin;
      for (let k = Math.max(lo, this.howlBin - 2); k <= Math.min(hi, this.howlBin + 2); k++)
        if (p[k] > p[best]) best = k;
      const near = (p[best - 1] + p[best] + p[best + 1]) / (total + TINY);
      const db = hist[rowBase + best];
      if (near >= HOWL_HOLD_SHARE && db >= this.howlMaxDb - HOWL_HOLD_DROP_DB) {
        this.missing = 0;
        this.howlBin = best;
        this.howlHz = this.peakHz(best);
        this.howlDb = db;
        if (db > this.howlMaxDb) this.howlMaxDb = db;
      } else if (++this.missing >= this.releaseHops) {
        this.clear();
      }
    } else if (
      this.hops >= this.historyHops &&
      share >= HOWL_DOMINANCE_SHARE &&
      levelDb >= HOWL_MIN_LEVEL_DBOV &&
      this.builtUp(peak)
    ) {
      this.howling = true;
      this.howlBin = peak;
      this.howlHz = this.peakHz(peak);
      this.howlDb = levelDb;
      this.howlMaxDb = levelDb;
      this.since = this.samples / this.rate;
      this.missing = 0;
    }
    this.row = (this.row + 1) % this.historyHops;
  }

  /**
   * Rule 2 at bin k: its narrow-band level rising from hop to hop (most hops) and from
   * block to block (all blocks but one), by HOWL_MIN_TOTAL_RISE_DB in all.
   */
  private builtUp(k: number): boolean {
    const bins = this.size / 2 + 1;
    const hist = this.history;
    const H = this.historyHops;
    const B = this.blockHops;
    // The oldest row is the one after the newest (the ring is full once hops >= H).
    const oldest = (this.row + 1) % H;
    let rising = 0;
    let last = hist[oldest * bins + k];
    for (let j = 1; j < H; j++) {
      const v = hist[((oldest + j) % H) * bins + k];
      if (v - last >= HOWL_MIN_HOP_RISE_DB) rising++;
      last = v;
    }
    if (rising < HOWL_MIN_RISING_HOPS * (H - 1)) return false;
    let prev = 0;
    let first = 0;
    let misses = 0;
    for (let b = 0; b < HOWL_GROWTH_BLOCKS; b++) {
      let sum = 0;
      for (let j = 0; j < B; j++) sum += hist[((oldest + b * B + j) % H) * bins + k];
      const mean = sum / B;
      if (b === 0) first = mean;
      else if (mean - prev < HOWL_MIN_BLOCK_RISE_DB && ++misses > 1) return false;
      prev = mean;
    }
    return prev - first >= HOWL_MIN_TOTAL_RISE_DB;
  }

  /** Peak frequency by a parabola through the log powers of the bin and its neighbours. */
  private peakHz(k: number): number {
    const p = this.power;
    const a = Math.log(p[k - 1] + TINY);
    const b = Math.log(p[k] + TINY);
    const c = Math.log(p[k + 1] + TINY);
    const d = a - 2 * b + c;
    const offset = d < 0 ? (0.5 * (a - c)) / d : 0;
    return ((k + Math.max(-0.5, Math.min(0.5, offset))) * this.rate) / this.size;
  }
}
