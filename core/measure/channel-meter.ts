// One object per quantizer that feeds every channel accumulator: overall and
// weighted SNR, the segment ledger, per-code occupancy, segmental SNR and the
// signal and error spectra. Fed at the channel rate with the quantizer's input,
// output, and (when the quantizer gave them) codes and segments.
import type { Quantizer } from '../quantizers/types';
import { CodeOccupancy } from './levels';
import { SegmentalSnr, type FrameSnrClamp } from './segmental';
import { SegmentLedger } from './segments';
import { emptyChannelSnapshot, snrDbOrNull, type ChannelSnapshot } from './snapshot';
import { defaultSpectrumSize, PowerSpectrum } from './spectrum';
import { psophometricBinWeights } from './weighting';

/** What the meter needs to know of its quantizer (a Quantizer has all of it). */
export type MeteredQuantizer = Pick<
  Quantizer,
  | 'kind'
  | 'label'
  | 'bits'
  | 'overloadPoint'
  | 'loadCapacityDbm0'
  | 'segmentCount'
  | 'segmentEdges'
  | 'segmentOf'
>;

export interface ChannelMeterOptions {
  quantizer: MeteredQuantizer;
  /** Channel rate, samples per second. */
  rate: number;
  /** Segmental SNR: frame length (0.02 s), clamp (-10..+60 dB; null for none), silence floor (-60 dBov), trace length. */
  frameSeconds?: number;
  clamp?: FrameSnrClamp | null;
  silenceFloorDbov?: number;
  traceFrames?: number;
  /** ITU-T O.41 weighting of the error (off by default), taken from the error spectrum (weighting.ts). */
  weighting?: boolean;
  /** Spectrum transform length (power of two; default about 32 ms), recent-average time constant (1 s), frame overlap (0). */
  spectrumSize?: number;
  spectrumRecentSeconds?: number;
  spectrumOverlap?: 0 | 0.5;
  /**
   * The signal spectrum: 'own' (default) is kept and fed by this meter; a PowerSpectrum
   * at the same rate and size is one that channels sharing the same input share. The
   * meter then neither feeds nor resets it (its owner does both) and only reports it.
   */
  signalSpectrum?: PowerSpectrum | 'own';
}

/** Samples handled per inner pass: the error is formed once into scratch for the spectra. */
const CHUNK = 256;

export class ChannelMeter {
  readonly quantizer: MeteredQuantizer;
  readonly rate: number;
  readonly codeCount: number;
  private readonly overloadPoint: number;
  readonly ledger: SegmentLedger;
  readonly codes: CodeOccupancy;
  readonly segmental: SegmentalSnr;
  readonly signalSpectrum: PowerSpectrum;
  /** Whether signalSpectrum is this meter's own (fed and reset here) or shared. */
  readonly ownsSignalSpectrum: boolean;
  readonly errorSpectrum: PowerSpectrum;
  /** O.41 power weight per error-spectrum bin, or null with the weighting off. */
  readonly weights: Float64Array | null;
  private readonly edgesDbov: Float64Array;
  private readonly sig = new Float64Array(CHUNK);
  private readonly err = new Float64Array(CHUNK);
  private readonly seg = new Uint8Array(CHUNK);
  /** A piece's signal and error energy, handed to the segmental meter. */
  private readonly energies = new Float64Array(2);
  private n = 0;
  private overloads = 0;
  private signalEnergy = 0;
  private errorEnergy = 0;

  constructor(opts: ChannelMeterOptions) {
    const q = opts.quantizer;
    if (!(opts.rate > 0)) throw new RangeError(`rate must be > 0 (got ${opts.rate})`);
    this.quantizer = q;
    this.rate = opts.rate;
    this.overloadPoint = q.overloadPoint;
    this.codeCount = q.kind === 'g711-mu' || q.kind === 'g711-a' ? 256 : q.bits <= 8 ? 2 ** q.bits : 0;
    this.ledger = new SegmentLedger(q.segmentCount);
    this.codes = new CodeOccupancy(this.codeCount);
    this.segmental = new SegmentalSnr({
      rate: opts.rate,
      overloadPoint: q.overloadPoint,
      frameSeconds: opts.frameSeconds,
      clamp: opts.clamp,
      silenceFloorDbov: opts.silenceFloorDbov,
      traceFrames: opts.traceFrames,
    });
    const shared = opts.signalSpectrum ?? 'own';
    const size = opts.spectrumSize ?? (shared === 'own' ? defaultSpectrumSize(opts.rate) : shared.size);
    const overlap = opts.spectrumOverlap ?? 0;
    this.errorSpectrum = new PowerSpectrum(opts.rate, size, opts.spectrumRecentSeconds, overlap);
    if (shared === 'own') {
      this.signalSpectrum = new PowerSpectrum(opts.rate, size, opts.spectrumRecentSeconds, overlap);
    } else if (shared.rate !== opts.rate || shared.size !== size) {
      throw new RangeError(
        `shared signal spectrum: ${shared.size} points at ${shared.rate} Hz, the meter needs ${size} at ${opts.rate} Hz`,
      );
    } else {
      this.signalSpectrum = shared;
    }
    this.ownsSignalSpectrum = shared === 'own';
    this.weights = opts.weighting === true ? psophometricBinWeights(opts.rate, size) : null;
    this.edgesDbov = new Float64Array(q.segmentCount + 1);
    for (let s = 0; s <= q.segmentCount; s++) {
      this.edgesDbov[s] = 20 * Math.log10(q.segmentEdges[s] / q.overloadPoint);
    }
  }

  reset(): void {
    this.n = 0;
    this.overloads = 0;
    this.signalEnergy = 0;
    this.errorEnergy = 0;
    this.ledger.reset();
    this.codes.reset();
    this.segmental.reset();
    if (this.ownsSignalSpectrum) this.signalSpectrum.reset();
    this.errorSpectrum.reset();
  }

  /**
   * Adds samples [start, end) of one block: the quantizer's input and output, and
   * optionally the codes and segments quantizeBlock wrote for the same samples
   * (segments are looked up from the input when not given; per-code occupancy
   * needs the codes).
   */
  add(
    input: ArrayLike<number>,
    output: ArrayLike<number>,
    codes?: ArrayLike<number>,
    segments?: ArrayLike<number>,
    start = 0,
    end = input.length,
  ): void {
    if (start < 0 || end > input.length || end > output.length || start > end) {
      throw new RangeError(`ChannelMeter.add: range [${start}, ${end}) does not fit the blocks`);
    }
    const sig = this.sig;
    const err = this.err;
    const v = this.overloadPoint;
    const ledger = this.ledger;
    const counts = ledger.counts;
    const segSignal = ledger.signalEnergy;
    const segError = ledger.errorEnergy;
    const top = ledger.segmentCount;
    const segmental = this.segmental;
    const own = this.ownsSignalSpectrum;
    let over = 0;
    let at = start;
    while (at < end) {
      // Pieces end at segmental frames too, so one pass gives the overall, per-segment
      // and per-frame sums at once.
      const len = Math.min(CHUNK, end - at, segmental.room);
      let segs: ArrayLike<number> = this.seg;
      let segAt = 0;
      if (segments !== undefined) {
        segs = segments;
        segAt = at;
      } else {
        const seg = this.seg;
        for (let i = 0; i < len; i++) seg[i] = this.quantizer.segmentOf(input[at + i]);
      }
      let s2 = 0;
      let e2 = 0;
      for (let i = 0; i < len; i++) {
        const x = input[at + i];
        const d = output[at + i] - x;
        sig[i] = x;
        err[i] = d;
        const xx = x * x;
        const dd = d * d;
        s2 += xx;
        e2 += dd;
        if (x > v || x < -v) over++;
        // Segment numbers outside the ledger are not counted.
        const g = segs[segAt + i];
        if (g < top) {
          counts[g]++;
          segSignal[g] += xx;
          segError[g] += dd;
        }
      }
      if (codes !== undefined && this.codeCount > 0) this.codes.add(codes, at, at + len);
      this.energies[0] = s2;
      this.energies[1] = e2;
      segmental.addEnergy(this.energies, len);
      if (own) this.signalSpectrum.add(sig, 0, len);
      this.errorSpectrum.add(err, 0, len);
      this.signalEnergy += s2;
      this.errorEnergy += e2;
      at += len;
    }
    this.n += end - start;
    this.overloads += over;
  }

  get samples(): number {
    return this.n;
  }

  /** A snapshot of the right shape for snapshot(into). */
  createSnapshot(): ChannelSnapshot {
    return emptyChannelSnapshot({
      segmentCount: this.quantizer.segmentCount,
      codeCount: this.codeCount,
      traceFrames: this.segmental.traceFrames,
      spectrumSize: this.signalSpectrum.size,
    });
  }

  snapshot(into: ChannelSnapshot = this.createSnapshot()): ChannelSnapshot {
    const q = this.quantizer;
    const segs = into.segments;
    if (segs.counts.length !== q.segmentCount || into.codes.length !== this.codeCount) {
      throw new RangeError('channel snapshot: buffers do not match this meter');
    }
    const n = this.n;
    into.label = q.label;
    into.quantizerKind = q.kind;
    into.bits = q.bits;
    into.rate = this.rate;
    into.overloadPoint = q.overloadPoint;
    into.loadCapacityDbm0 = q.loadCapacityDbm0;
    into.samples = n;
    into.overloads = this.overloads;
    const signalPower = n > 0 ? this.signalEnergy / n : 0;
    const errorPower = n > 0 ? this.errorEnergy / n : 0;
    into.signalPower = signalPower;
    into.errorPower = errorPower;
    into.snrDb = snrDbOrNull(this.signalEnergy, this.errorEnergy);
    into.weighted = this.weights !== null;
    const weighted = this.weightedErrorPower(errorPower);
    into.weightedErrorPower = weighted;
    into.weightedSnrDb = weighted === null ? null : snrDbOrNull(signalPower, weighted);
    segs.edgesDbov.set(this.edgesDbov);
    segs.counts.set(this.ledger.counts);
    segs.signalEnergy.set(this.ledger.signalEnergy);
    segs.errorEnergy.set(this.ledger.errorEnergy);
    this.ledger.snrDb(segs.snrDb);
    into.codes.set(this.codes.counts);
    this.segmental.snapshot(into.segmental);
    this.signalSpectrum.snapshot(into.signalSpectrum);
    this.errorSpectrum.snapshot(into.errorSpectrum);
    return into;
  }

  /**
   * O.41-weighted error power: the error spectrum's weighted share of its total
   * (weighting.ts), times the exact error power. Scaling the share rather than taking
   * the weighted bins as they are leaves a flat weight without effect and keeps the
   * window's estimate of the level out of the figure. Null with the weighting off,
   * with no samples, and while the error so far lies only in a frame not yet complete.
   */
  private weightedErrorPower(errorPower: number): number | null {
    const w = this.weights;
    if (w === null || this.n === 0) return null;
    if (this.errorEnergy === 0) return 0;
    const total = this.errorSpectrum.meanPower();
    return total > 0 ? errorPower * (this.errorSpectrum.meanPower(w) / total) : null;
  }
}
