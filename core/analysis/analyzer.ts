// The measurement engine in one object: the channel path feeding every accumulator,
// wired where each figure belongs. Talker statistics (level spread, meters, P.56)
// are taken on the quantizer's input at the channel rate after the input gain, one
// set per distinct rate; SNR and segment figures at each channel's quantizer, its
// output against its input; a peak and clip meter on the raw input, before the gain.
// The AudioWorklet, the offline file analysis and the command line all run this, so
// their figures agree to the last bit.
//
// Bit-exactness across block sizes: the path is block-invariant already, but sums
// taken block by block round differently when the blocks differ. So the analyzer
// stages the path's output and feeds every accumulator in fixed 20 ms chunks aligned
// to the start of the signal, whatever the caller's blocks (128-sample render quanta
// live, 4096 offline). Figures therefore advance in 20 ms steps; finish() adds the
// last partial chunk at the end of a signal.
import { ChannelPath } from '../channel/path';
import { ChannelMeter, type ChannelMeterOptions } from '../measure/channel-meter';
import { SignalMeter } from '../measure/meters';
import { PowerSpectrum } from '../measure/spectrum';
import type { ChannelSnapshot, TalkerSnapshot } from '../measure/snapshot';
import type { SignalMeterSnapshot } from '../measure/meters';
import { TalkerMeter, type TalkerMeterOptions } from '../measure/talker-meter';
import type { MeteredQuantizer } from '../measure/channel-meter';
import { channelBitRate } from '../spec/bits';
import { formatChannel } from '../spec/format';
import { parseChannel } from '../spec/parse';
import type { ChannelSpec } from '../spec/types';

/** Full scale of 16-bit PCM on the float scale: where the raw input clips. */
const PCM16_CLIP = 32767 / 32768;
/** Accumulators are fed in chunks of this duration. */
const CHUNK_SECONDS = 0.02;

function chunkLength(rate: number): number {
  return Math.max(1, Math.round(rate * CHUNK_SECONDS));
}

function copy(
  from: ArrayLike<number>,
  at: number,
  to: { [i: number]: number },
  into: number,
  n: number,
): void {
  for (let i = 0; i < n; i++) to[into + i] = from[at + i];
}

/** The samples of one rate group waiting for a whole chunk. */
class Stage {
  readonly reference: Float64Array;
  readonly outputs: Float64Array[];
  readonly codes: Int32Array[];
  readonly segments: Uint8Array[];
  fill = 0;

  constructor(
    readonly size: number,
    readonly channels: readonly number[],
  ) {
    this.reference = new Float64Array(size);
    this.outputs = channels.map(() => new Float64Array(size));
    this.codes = channels.map(() => new Int32Array(size));
    this.segments = channels.map(() => new Uint8Array(size));
  }
}

export type AnalyzerMeterOptions = Omit<ChannelMeterOptions, 'quantizer' | 'rate'>;
export type AnalyzerTalkerOptions = Omit<TalkerMeterOptions, 'rate' | 'overloadPoint' | 'loadCapacityDbm0'>;

export interface AnalyzerOptions {
  inputRate: number;
  channels: readonly (ChannelSpec | string)[];
  /** Largest block process() is given at once (longer input is cut up; default 4096). */
  maxBlock?: number;
  gainDb?: number;
  /** Also interpolate back to the input rate for listening (default false offline). */
  listen?: boolean;
  meter?: AnalyzerMeterOptions;
  talker?: AnalyzerTalkerOptions;
}

export interface AnalysisChannel {
  text: string;
  rate: number;
  bitRate: number;
  /** Index into AnalysisSnapshot.talkers of the talker statistics at this channel's rate. */
  talker: number;
  meter: ChannelSnapshot;
}

export interface AnalysisSnapshot {
  inputRate: number;
  gainDb: number;
  /** Input samples analysed, and their duration in seconds. */
  inputSamples: number;
  seconds: number;
  /** Delay of the listening outputs against the input, input samples. */
  latency: number;
  input: SignalMeterSnapshot;
  talkers: TalkerSnapshot[];
  channels: AnalysisChannel[];
}

/** The first stage meets the talker: its segments and codes; the label is the whole channel. */
function meteredStage(spec: ChannelSpec, path: ChannelPath, index: number): MeteredQuantizer {
  const q = path.atRate[index].quantizers[0];
  return {
    kind: q.kind,
    label: formatChannel(spec),
    bits: q.bits,
    overloadPoint: q.overloadPoint,
    loadCapacityDbm0: q.loadCapacityDbm0,
    segmentCount: q.segmentCount,
    segmentEdges: q.segmentEdges,
    segmentOf: (x) => q.segmentOf(x),
  };
}

export class Analyzer {
  readonly path: ChannelPath;
  readonly inputRate: number;
  readonly maxBlock: number;
  readonly specs: readonly ChannelSpec[];
  readonly raw: SignalMeter;
  readonly talkers: readonly TalkerMeter[];
  /** One signal spectrum per rate group (indexed as talkers): channels at one rate share their input. */
  readonly spectra: readonly PowerSpectrum[];
  readonly meters: readonly ChannelMeter[];
  /** For each channel, the index of its talker meter. */
  readonly talkerOf: Int32Array;
  private readonly stages: Stage[];
  private readonly rawStage: Float64Array;
  private rawFill = 0;
  private inputCount = 0;

  constructor(options: AnalyzerOptions) {
    this.inputRate = options.inputRate;
    this.maxBlock = options.maxBlock ?? 4096;
    this.specs = options.channels.map((c) => (typeof c === 'string' ? parseChannel(c) : c));
    this.path = new ChannelPath({
      inputRate: options.inputRate,
      channels: this.specs,
      maxBlock: this.maxBlock,
      gainDb: options.gainDb ?? 0,
      listen: options.listen ?? false,
    });
    this.raw = new SignalMeter({ rate: options.inputRate, overloadPoint: 1, clipLevel: PCM16_CLIP });
    const talkers: TalkerMeter[] = [];
    const spectra: PowerSpectrum[] = [];
    const mo = options.meter;
    const rates: number[] = [];
    this.talkerOf = new Int32Array(this.specs.length);
    this.meters = this.specs.map((spec, i) => {
      const at = this.path.atRate[i];
      let t = rates.indexOf(at.rateHz);
      if (t < 0) {
        const q = at.quantizers[0];
        t = talkers.length;
        rates.push(at.rateHz);
        talkers.push(
          new TalkerMeter({
            ...options.talker,
            rate: at.rateHz,
            overloadPoint: q.overloadPoint,
            loadCapacityDbm0: q.loadCapacityDbm0,
          }),
        );
        spectra.push(
          new PowerSpectrum(at.rateHz, mo?.spectrumSize, mo?.spectrumRecentSeconds, mo?.spectrumOverlap),
        );
      }
      this.talkerOf[i] = t;
      return new ChannelMeter({
        ...options.meter,
        quantizer: meteredStage(spec, this.path, i),
        rate: at.rateHz,
      });
    });
    this.talkers = talkers;
    this.spectra = spectra;
    this.stages = rates.map((rate, t) => {
      const members: number[] = [];
      this.talkerOf.forEach((tt, i) => {
        if (tt === t) members.push(i);
      });
      return new Stage(chunkLength(rate), members);
    });
    this.rawStage = new Float64Array(chunkLength(options.inputRate));
  }

  get gainDb(): number {
    return this.path.gainDb;
  }

  /** Changes the input gain from the next block on. */
  set gainDb(db: number) {
    this.path.gainDb = db;
  }

  /** Analyses samples [0, n) at the input rate, in pieces of at most maxBlock. */
  process(input: Float32Array | Float64Array, n: number = input.length): void {
    for (let at = 0; at < n; at += this.maxBlock) {
      const len = Math.min(this.maxBlock, n - at);
      this.processBlock(at === 0 && len === input.length ? input : input.subarray(at, at + len), len);
    }
  }

  /** One block of at most maxBlock samples; allocation-free. */
  processBlock(block: ArrayLike<number>, n: number): void {
    this.stageRaw(block, n);
    this.path.process(block, n);
    this.inputCount += n;
    for (let t = 0; t < this.stages.length; t++) this.stageGroup(t);
  }

  /** Feeds the accumulators what is still staged: call once at the end of a signal. */
  finish(): void {
    if (this.rawFill > 0) this.raw.add(this.rawStage, 0, this.rawFill);
    this.rawFill = 0;
    for (let t = 0; t < this.stages.length; t++) this.flush(t);
  }

  // Whole chunks go to the accumulators straight from the caller's or the path's
  // buffers; only a chunk that straddles two blocks is copied into the stage.
  private stageRaw(block: ArrayLike<number>, n: number): void {
    const stage = this.rawStage;
    const size = stage.length;
    let i = 0;
    if (this.rawFill > 0) {
      const take = Math.min(size - this.rawFill, n);
      copy(block, 0, stage, this.rawFill, take);
      this.rawFill += take;
      i = take;
      if (this.rawFill < size) return;
      this.raw.add(stage, 0, size);
      this.rawFill = 0;
    }
    for (; i + size <= n; i += size) this.raw.add(block, i, i + size);
    copy(block, i, stage, 0, n - i);
    this.rawFill = n - i;
  }

  private stageGroup(t: number): void {
    const stage = this.stages[t];
    const size = stage.size;
    const members = stage.channels;
    const atRate = this.path.atRate;
    const first = atRate[members[0]];
    const len = first.length;
    let done = 0;
    if (stage.fill > 0) {
      done = Math.min(size - stage.fill, len);
      this.stageCopy(t, 0, done);
      if (stage.fill < size) return;
      this.flush(t);
    }
    for (; done + size <= len; done += size) {
      this.talkers[t].add(first.reference, done, done + size);
      this.spectra[t].add(first.reference, done, size);
      for (let m = 0; m < members.length; m++) {
        const a = atRate[members[m]];
        this.meters[members[m]].add(a.reference, a.output, a.codes, a.segments, done, done + size);
      }
    }
    this.stageCopy(t, done, len - done);
  }

  private stageCopy(t: number, from: number, n: number): void {
    const stage = this.stages[t];
    const members = stage.channels;
    const atRate = this.path.atRate;
    copy(atRate[members[0]].reference, from, stage.reference, stage.fill, n);
    for (let m = 0; m < members.length; m++) {
      const a = atRate[members[m]];
      copy(a.output, from, stage.outputs[m], stage.fill, n);
      copy(a.codes, from, stage.codes[m], stage.fill, n);
      copy(a.segments, from, stage.segments[m], stage.fill, n);
    }
    stage.fill += n;
  }

  private flush(t: number): void {
    const stage = this.stages[t];
    const n = stage.fill;
    if (n === 0) return;
    this.talkers[t].add(stage.reference, 0, n);
    this.spectra[t].add(stage.reference, 0, n);
    const members = stage.channels;
    for (let m = 0; m < members.length; m++) {
      this.meters[members[m]].add(stage.reference, stage.outputs[m], stage.codes[m], stage.segments[m], 0, n);
    }
    stage.fill = 0;
  }

  reset(): void {
    this.path.reset();
    this.raw.reset();
    for (const t of this.talkers) t.reset();
    for (const m of this.meters) m.reset();
    for (const sp of this.spectra) sp.reset();
    for (const st of this.stages) st.fill = 0;
    this.rawFill = 0;
    this.inputCount = 0;
  }

  /** A snapshot of the right shape for snapshot(into). */
  createSnapshot(): AnalysisSnapshot {
    return {
      inputRate: this.inputRate,
      gainDb: 0,
      inputSamples: 0,
      seconds: 0,
      latency: this.path.latency,
      input: this.raw.snapshot(),
      talkers: this.talkers.map((t) => t.createSnapshot()),
      channels: this.specs.map((spec, i) => ({
        text: formatChannel(spec),
        rate: this.path.atRate[i].rateHz,
        bitRate: channelBitRate(spec, this.inputRate) ?? 0,
        talker: this.talkerOf[i],
        meter: this.meters[i].createSnapshot(),
      })),
    };
  }

  /** Everything measured so far, written into `into` when given. */
  snapshot(into: AnalysisSnapshot = this.createSnapshot()): AnalysisSnapshot {
    into.gainDb = this.path.gainDb;
    into.inputSamples = this.inputCount;
    into.seconds = this.inputCount / this.inputRate;
    this.raw.snapshot(into.input);
    for (let t = 0; t < this.talkers.length; t++) this.talkers[t].snapshot(into.talkers[t]);
    for (let i = 0; i < this.meters.length; i++) this.meters[i].snapshot(into.channels[i].meter);
    return into;
  }
}

/** Analyses a whole signal at once and returns the final snapshot. */
export function analyzeSamples(
  samples: Float32Array | Float64Array,
  options: AnalyzerOptions,
): AnalysisSnapshot {
  const a = new Analyzer(options);
  a.process(samples);
  a.finish();
  return a.snapshot();
}
