// The channel path: input (48 kHz normally) -> input gain -> voice-band lowpass and
// decimation to each channel's rate -> the channel's quantizer(s) -> interpolation
// back to the input rate for listening. One class, shared by the AudioWorklet, the
// offline file analysis and the command line, so they agree to the last bit.
//
//   const path = new ChannelPath({ inputRate: 48000, channels: ['g711-mu', 'g711-a@16k'], maxBlock: 128 });
//   path.process(block, n);                 // Float32Array | Float64Array, n <= maxBlock
//   const a = path.atRate[0];               // channel 0 at its own rate, a.length samples this block:
//   a.reference, a.output                   //   quantizer input (the Reference) and output, Float64Array
//   a.codes, a.segments                     //   first stage's codes (Int32Array) and segments (Uint8Array)
//   a.overloads                             //   first stage's overloaded samples this block
//   path.reference48, path.output48[i]      // n samples at the input rate, all aligned (path.latency)
//
// Buffers are allocated once by the constructor and reused by every block: read
// them after process() and before the next call; `length` says how many samples
// are valid (it varies by block: 128 inputs give 21 or 22 samples at 8 kHz).
// Channel-rate buffers are never shorter than `capacity`, and a.first counts the
// channel-rate samples delivered before this block (since construction or reset).
//
// Sharing: channels at the same rate share one decimation pass and one Reference
// (atRate[i].reference is the same array for them) and one interpolated Reference;
// each distinct rate gets its own pass. `native`, and any rate equal to the input
// rate, runs the quantizer on the (gained) input samples themselves: no filter, no
// resampling, zero latency at the channel rate (its 48 kHz outputs are still
// delayed to line up with the others).
//
// Tandem channels (several stages) run the stages in series at the channel rate:
// a.output is the last stage's output, a.stageOutputs[s] / stageCodes[s] /
// stageSegments[s] / stageOverloads[s] hold every stage; a.codes and a.segments are
// the first stage's, the coder that meets the talker's levels.
//
// Latency, in input samples: a channel-rate sample m (taken at input index
// factor * m) shows the band-limited input of index factor * m - a.latency. Every
// input-rate output (reference48, references48[i], output48[i]) is the input delayed
// by path.latency, the largest round trip of any rate; faster rates get a delay line.
//
// Time convention of the filters: see polyphase.ts. Filter design: rate-plan.ts.
import { createQuantizer } from '../quantizers/index';
import type { Quantizer } from '../quantizers/types';
import { formatChannel } from '../spec/format';
import { parseChannel } from '../spec/parse';
import type { ChannelSpec } from '../spec/types';
import { DelayLine } from './delay-line';
import { createDecimator, createInterpolator, type Decimator, type Interpolator } from './polyphase';
import { planRate, type RatePlan } from './rate-plan';

export interface ChannelPathOptions {
  /** Input sample rate, Hz (a whole multiple of every channel rate). */
  inputRate: number;
  /** Channel specifications or their text form (`g711-mu`, `uniform:12@16k`, `mu:255:8>a:87.6:8`). */
  channels: readonly (ChannelSpec | string)[];
  /** Largest block process() will be given. */
  maxBlock: number;
  /** Gain applied to the input before anything else, dB (default 0). */
  gainDb?: number;
  /** Interpolate back to the input rate for listening (default true); analysis may skip it. */
  listen?: boolean;
}

/** Views of the first k samples of one buffer, made once per length and then reused. */
class LengthViews {
  private readonly views: (Float64Array | undefined)[];

  constructor(private readonly buffer: Float64Array) {
    this.views = new Array<Float64Array | undefined>(buffer.length + 1);
    // Small buffers (the worklet's) get every view now, so no block ever allocates;
    // large offline buffers make each view the first time its length occurs.
    if (buffer.length <= PREBUILT_VIEWS) for (let k = 0; k <= buffer.length; k++) this.get(k);
  }

  get(k: number): Float64Array {
    let v = this.views[k];
    if (v === undefined) {
      v = this.buffer.subarray(0, k);
      this.views[k] = v;
    }
    return v;
  }
}

const PREBUILT_VIEWS = 4096;

/** One channel's samples at its own rate, refreshed by every process() call. */
export class ChannelAtRate {
  readonly index: number;
  readonly spec: ChannelSpec;
  /** Canonical text form of the channel. */
  readonly label: string;
  readonly rateHz: number;
  /** inputRate / rateHz. */
  readonly factor: number;
  readonly quantizers: readonly Quantizer[];
  /** Buffer size: the most channel-rate samples one block can give. */
  readonly capacity: number;
  /** Quantizer input: the band-limited, decimated, gained input (shared by channels at this rate). */
  readonly reference: Float64Array;
  /** Last stage's output. */
  readonly output: Float64Array;
  readonly codes: Int32Array;
  readonly segments: Uint8Array;
  readonly stageOutputs: readonly Float64Array[];
  readonly stageCodes: readonly Int32Array[];
  readonly stageSegments: readonly Uint8Array[];
  readonly stageOverloads: Int32Array;
  /** Decimation delay in input samples (0 at the input rate). */
  readonly latency: number;
  /** Valid samples in the buffers after the last process(). */
  length = 0;
  /** Channel-rate index of reference[0] counted from construction or reset. */
  first = 0;
  /** Overloaded samples at the first stage this block. */
  overloads = 0;
  private readonly stageViews: LengthViews[];

  constructor(index: number, spec: ChannelSpec, group: RateGroup) {
    this.index = index;
    this.spec = spec;
    this.label = formatChannel(spec);
    this.rateHz = group.rateHz;
    this.factor = group.factor;
    this.quantizers = spec.stages.map((s) => createQuantizer(s));
    this.capacity = group.capacity;
    this.reference = group.reference;
    const n = spec.stages.length;
    const outs: Float64Array[] = [];
    const codes: Int32Array[] = [];
    const segs: Uint8Array[] = [];
    for (let s = 0; s < n; s++) {
      outs.push(new Float64Array(this.capacity));
      codes.push(new Int32Array(this.capacity));
      segs.push(new Uint8Array(this.capacity));
    }
    this.stageOutputs = outs;
    this.stageCodes = codes;
    this.stageSegments = segs;
    this.stageOverloads = new Int32Array(n);
    // Only a stage that feeds another needs views of its output.
    this.stageViews = outs.slice(0, n - 1).map((b) => new LengthViews(b));
    this.output = outs[n - 1];
    this.codes = codes[0];
    this.segments = segs[0];
    this.latency = group.plan.decimationLatency;
  }

  /** Runs the stages on the first `input.length` samples of the Reference. */
  quantize(input: Float64Array, first: number): void {
    const q = this.quantizers;
    let src = input;
    for (let s = 0; s < q.length; s++) {
      this.stageOverloads[s] = q[s].quantizeBlock(
        src,
        this.stageOutputs[s],
        this.stageCodes[s],
        this.stageSegments[s],
      );
      if (s + 1 < q.length) src = this.stageViews[s].get(input.length);
    }
    this.length = input.length;
    this.first = first;
    this.overloads = this.stageOverloads[0];
  }
}

/** From channel rate back to the input rate, then onto the common latency. */
class UpChain {
  private readonly interps: Interpolator[];
  private readonly pending: Float64Array;
  /** Samples made ahead of the input (fewer than the factor), kept for the next block. */
  private have = 0;
  private readonly delay: DelayLine;

  constructor(plan: RatePlan, capacity: number, addedDelay: number) {
    const up = [...plan.stages].reverse();
    this.interps = [];
    let size = capacity;
    for (let j = 0; j < up.length; j++) {
      this.interps.push(createInterpolator(up[j].design.taps, up[j].factor, size));
      size *= up[j].factor;
    }
    this.pending = new Float64Array(capacity * plan.factor + plan.factor);
    this.delay = new DelayLine(addedDelay);
  }

  reset(): void {
    for (let j = 0; j < this.interps.length; j++) this.interps[j].reset();
    this.have = 0;
    this.delay.reset();
  }

  /** Takes k channel-rate samples and writes n input-rate samples to `out`. */
  run(input: Float64Array, k: number, n: number, out: Float64Array): void {
    const interps = this.interps;
    if (interps.length === 0) {
      this.delay.process(input, n, out);
      return;
    }
    // Each stage writes straight into the next one's inlet, so nothing is copied between.
    let src = input;
    let count = k;
    const last = interps.length - 1;
    for (let j = 0; j < last; j++) {
      const dst = interps[j + 1].inlet;
      interps[j].process(src, 0, count, dst, 0);
      count *= interps[j].factor;
      src = dst;
    }
    const pending = this.pending;
    interps[last].process(src, 0, count, pending, this.have);
    const have = this.have + count * interps[last].factor;
    // By the time convention, channel sample m yields input-rate samples factor*m ..
    // factor*(m+1) - 1, so the samples made always cover the block.
    if (have < n) throw new Error(`channel path: interpolation fell behind (${have} < ${n})`);
    this.delay.process(pending, n, out);
    pending.copyWithin(0, n, have);
    this.have = have - n;
  }
}

/** Everything shared by the channels at one rate. */
export class RateGroup {
  readonly rateHz: number;
  readonly factor: number;
  readonly plan: RatePlan;
  readonly capacity: number;
  readonly reference: Float64Array;
  /** Interpolated Reference, delayed onto the path's latency (empty when not listening). */
  readonly reference48: Float64Array;
  /** Delay added after the round trip to line up with the slowest rate, input samples. */
  addedDelay = 0;
  readonly channels: ChannelAtRate[] = [];
  /** Listening outputs of the channels, same order as `channels`. */
  readonly outputs48: Float64Array[] = [];
  length = 0;
  first = 0;
  private readonly decimators: Decimator[];
  private readonly views: LengthViews;
  private refUp: UpChain | undefined;
  private readonly outUps: UpChain[] = [];

  constructor(inputRate: number, rateHz: number, maxBlock: number, listen: boolean) {
    this.rateHz = rateHz;
    this.plan = planRate(inputRate, rateHz);
    this.factor = this.plan.factor;
    this.capacity = Math.ceil(maxBlock / this.factor);
    this.decimators = [];
    let reach = 1;
    for (const st of this.plan.stages) {
      this.decimators.push(createDecimator(st.design.taps, st.factor, Math.ceil(maxBlock / reach)));
      reach *= st.factor;
    }
    this.reference = new Float64Array(this.capacity);
    this.views = new LengthViews(this.reference);
    this.reference48 = new Float64Array(listen ? maxBlock : 0);
  }

  /** Called once the path knows its common latency. */
  startListening(latency: number): void {
    this.addedDelay = latency - this.plan.roundTripLatency;
    this.refUp = new UpChain(this.plan, this.capacity, this.addedDelay);
    for (let c = 0; c < this.channels.length; c++) {
      this.outUps.push(new UpChain(this.plan, this.capacity, this.addedDelay));
    }
  }

  reset(): void {
    for (let s = 0; s < this.decimators.length; s++) this.decimators[s].reset();
    this.refUp?.reset();
    for (let c = 0; c < this.outUps.length; c++) this.outUps[c].reset();
    this.length = 0;
    this.first = 0;
    for (let c = 0; c < this.channels.length; c++) {
      const ch = this.channels[c];
      ch.length = 0;
      ch.first = 0;
      ch.overloads = 0;
    }
  }

  process(x: Float64Array, n: number): void {
    const first = this.first + this.length;
    const dec = this.decimators;
    let k: number;
    if (dec.length === 0) {
      const ref = this.reference;
      for (let i = 0; i < n; i++) ref[i] = x[i];
      k = n;
    } else {
      // Each stage writes straight into the next one's inlet, so nothing is copied between.
      let src: Float64Array = x;
      k = n;
      for (let s = 0; s < dec.length; s++) {
        const dst = s === dec.length - 1 ? this.reference : dec[s + 1].inlet;
        k = dec[s].process(src, 0, k, dst, 0);
        src = dst;
      }
    }
    this.length = k;
    this.first = first;
    const view = this.views.get(k);
    const chans = this.channels;
    for (let c = 0; c < chans.length; c++) chans[c].quantize(view, first);
    const refUp = this.refUp;
    if (refUp === undefined) return;
    refUp.run(this.reference, k, n, this.reference48);
    for (let c = 0; c < chans.length; c++) this.outUps[c].run(chans[c].output, k, n, this.outputs48[c]);
  }
}

export class ChannelPath {
  readonly inputRate: number;
  readonly maxBlock: number;
  readonly listen: boolean;
  /** One per channel, in the order given. */
  readonly atRate: readonly ChannelAtRate[];
  /** One per distinct channel rate, in order of first appearance. */
  readonly groups: readonly RateGroup[];
  /** The input after the gain, n samples of the last block. */
  readonly input48: Float64Array;
  /** The first channel's Reference at the input rate (the Ref monitor). */
  readonly reference48: Float64Array;
  /** Each channel's own Reference at the input rate (shared by channels at one rate). */
  readonly references48: readonly Float64Array[];
  readonly output48: readonly Float64Array[];
  /** Delay of every input-rate output against the input, input samples. */
  readonly latency: number;
  private gain = 1;
  private gainDbValue = 0;

  constructor(options: ChannelPathOptions) {
    const { inputRate, maxBlock } = options;
    if (!(Number.isInteger(maxBlock) && maxBlock >= 1))
      throw new RangeError(`maxBlock must be a whole number >= 1 (got ${maxBlock})`);
    if (options.channels.length === 0) throw new RangeError('a channel path needs at least one channel');
    this.inputRate = inputRate;
    this.maxBlock = maxBlock;
    this.listen = options.listen ?? true;
    this.gainDb = options.gainDb ?? 0;
    this.input48 = new Float64Array(maxBlock);
    const groups: RateGroup[] = [];
    const atRate: ChannelAtRate[] = [];
    const groupOf: RateGroup[] = [];
    options.channels.forEach((c, i) => {
      const spec = typeof c === 'string' ? parseChannel(c) : c;
      if (spec.stages.length === 0) throw new RangeError(`channel ${i} has no stage`);
      const rate = spec.rate === 'native' ? inputRate : spec.rate;
      let g = groups.find((gr) => gr.rateHz === rate);
      if (g === undefined) {
        g = new RateGroup(inputRate, rate, maxBlock, this.listen);
        groups.push(g);
      }
      const ch = new ChannelAtRate(i, spec, g);
      g.channels.push(ch);
      atRate.push(ch);
      groupOf.push(g);
    });
    this.groups = groups;
    this.atRate = atRate;
    this.latency = Math.max(...groups.map((g) => g.plan.roundTripLatency));
    const outputs48: Float64Array[] = [];
    for (let i = 0; i < atRate.length; i++) {
      const o = new Float64Array(this.listen ? maxBlock : 0);
      outputs48.push(o);
      groupOf[i].outputs48.push(o);
    }
    if (this.listen) for (const g of groups) g.startListening(this.latency);
    this.output48 = outputs48;
    this.references48 = groupOf.map((g) => g.reference48);
    this.reference48 = this.references48[0];
  }

  get gainDb(): number {
    return this.gainDbValue;
  }

  set gainDb(db: number) {
    if (!Number.isFinite(db)) throw new RangeError(`gain must be a finite number of dB (got ${db})`);
    this.gainDbValue = db;
    this.gain = Math.pow(10, db / 20);
  }

  /** Runs one block of input samples [0, n) through every channel. */
  process(input: ArrayLike<number>, n: number = input.length): void {
    if (!(Number.isInteger(n) && n >= 0 && n <= this.maxBlock && n <= input.length)) {
      throw new RangeError(
        `block of ${n} samples: need 0 <= n <= maxBlock (${this.maxBlock}) and input length`,
      );
    }
    const g = this.gain;
    const x = this.input48;
    if (n === input.length && (input instanceof Float32Array || input instanceof Float64Array)) {
      // A whole typed block: a native copy, then the gain in place (x * 1 is x, so 0 dB skips it).
      x.set(input);
      if (g !== 1) for (let i = 0; i < n; i++) x[i] *= g;
    } else for (let i = 0; i < n; i++) x[i] = input[i] * g;
    const groups = this.groups;
    for (let j = 0; j < groups.length; j++) groups[j].process(x, n);
  }

  /** Clears every filter, delay and counter, as if newly built. */
  reset(): void {
    for (let j = 0; j < this.groups.length; j++) this.groups[j].reset();
  }
}
