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
import { defaultPsophometricTaps, PsophometricFilter } from './weighting';

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
  /** ITU-T O.41 weighting of the error: off by default; true or a tap count turns it on. */
  weighting?: boolean | { taps: number };
  /** Spectrum transform length (power of two; default about 32 ms), recent-average time constant (1 s), frame overlap (0). */
  spectrumSize?: number;
  spectrumRecentSeconds?: number;
  spectrumOverlap?: 0 | 0.5;
}

/** Samples handled per inner pass: the error is formed once into scratch and shared. */
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
  readonly errorSpectrum: PowerSpectrum;
  readonly weighting: PsophometricFilter | null;
  private readonly edgesDbov: Float64Array;
  private readonly sig = new Float64Array(CHUNK);
  private readonly err = new Float64Array(CHUNK);
  private readonly seg = new Uint8Array(CHUNK);
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
    const size = opts.spectrumSize ?? defaultSpectrumSize(opts.rate);
    const overlap = opts.spectrumOverlap ?? 0;
    this.signalSpectrum = new PowerSpectrum(opts.rate, size, opts.spectrumRecentSeconds, overlap);
    this.errorSpectrum = new PowerSpectrum(opts.rate, size, opts.spectrumRecentSeconds, overlap);
    const w = opts.weighting ?? false;
    this.weighting =
      w === false
        ? null
        : new PsophometricFilter(opts.rate, w === true ? defaultPsophometricTaps(opts.rate) : w.taps);
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
    this.signalSpectrum.reset();
    this.errorSpectrum.reset();
    this.weighting?.reset();
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
    let s2 = 0;
    let e2 = 0;
    let over = 0;
    for (let at = start; at < end; at += CHUNK) {
      const len = Math.min(CHUNK, end - at);
      for (let i = 0; i < len; i++) {
        const x = input[at + i];
        const d = output[at + i] - x;
        sig[i] = x;
        err[i] = d;
        s2 += x * x;
        e2 += d * d;
        if (x > v || x < -v) over++;
      }
      if (segments !== undefined) {
        this.ledger.add(sig, err, 0, segments, at, len);
      } else {
        const seg = this.seg;
        for (let i = 0; i < len; i++) seg[i] = this.quantizer.segmentOf(sig[i]);
        this.ledger.add(sig, err, 0, seg, 0, len);
      }
      if (codes !== undefined && this.codeCount > 0) this.codes.add(codes, at, at + len);
      this.segmental.add(sig, err, 0, len);
      this.signalSpectrum.add(sig, 0, len);
      this.errorSpectrum.add(err, 0, len);
      if (this.weighting !== null) this.weighting.add(err, 0, len);
    }
    this.n += end - start;
    this.signalEnergy += s2;
    this.errorEnergy += e2;
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
    into.signalPower = n > 0 ? this.signalEnergy / n : 0;
    into.errorPower = n > 0 ? this.errorEnergy / n : 0;
    into.snrDb = snrDbOrNull(this.signalEnergy, this.errorEnergy);
    into.weighted = this.weighting !== null;
    const w = this.weighting;
    // The filter adds its energy a block at a time: its own output count is the divisor.
    into.weightedErrorPower = w !== null && w.outputs > 0 ? w.energySum / w.outputs : null;
    into.weightedSnrDb =
      w !== null && w.outputs > 0 && n > 0
        ? snrDbOrNull(this.signalEnergy / n, w.energySum / w.outputs)
        : null;
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
}
