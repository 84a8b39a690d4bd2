// The channel engine on the audio thread: core's Analyzer runs the Reference and
// channels A and B on every render quantum, feeds every accumulator, and the monitor
// mix (with its crossfades), volume and hard ceiling make the output. Snapshots go
// out ~25 times a second in pooled envelopes. process() allocates nothing: analyzers,
// envelopes and rings are all built in the constructor or in message handlers.
//
// A channel change builds the new analyzer in the message handler and runs it beside
// the old one until its filters have filled; the monitor then crossfades from the old
// mix to the new one, so a change never clicks.
//
// Hidden plays A or B by a seeded draw that stays here: one draw per trial, kept until
// the page asks for a new one, and told to the page only on Reveal. Nothing else the
// page receives depends on it (the output figures read the louder of A and B meanwhile).
import { Analyzer } from '../../../core/analysis/analyzer';
import { Xoshiro128 } from '../../../core/signals/random';
import { HowlWatch } from './howl-watch';
import {
  DEFAULT_CHANNEL_A,
  DEFAULT_CHANNEL_B,
  MONITOR_FADE_S,
  OUTPUT_CEILING_DBFS,
  OUTPUT_START_DB,
  PROCESSOR_NAME,
  SNAPSHOTS_PER_SECOND,
  clampVolumeDb,
  type ChannelSlot,
  type FromWorklet,
  type MonitorChoice,
  type SnapshotEnvelope,
  type ToWorklet,
  type WorkletStartOptions,
} from './messages';
import { MonitorMix, SOURCE_A, SOURCE_B, SOURCE_ERROR_A, SOURCE_ERROR_B, SOURCE_REF } from './monitor-mix';
import { OutputStage } from './output-stage';
import { RecordRing } from './record-ring';
import { SnapshotPool } from './snapshot-pool';

// The AudioWorkletGlobalScope names we use; TypeScript ships no lib for this scope.
declare const sampleRate: number;
declare const currentFrame: number;
declare class AudioWorkletProcessor {
  readonly port: {
    postMessage(message: FromWorklet, transfer?: ArrayBuffer[]): void;
    onmessage: ((event: { data: ToWorklet }) => void) | null;
  };
}
declare function registerProcessor(
  name: string,
  ctor: new (options?: { processorOptions?: WorkletStartOptions }) => AudioWorkletProcessor,
): void;

/** The render quantum of Web Audio (Web Audio API, 1.0: 128 frames). */
const QUANTUM = 128;
const DEFAULT_POOL = 4;

interface Stage {
  analyzer: Analyzer;
  pool: SnapshotPool;
  a: string;
  b: string;
}

export class ChannelProcessor extends AudioWorkletProcessor {
  private readonly rate: number;
  private stage: Stage;
  private next: Stage | null = null;
  /** Frames the next stage has run, and how many it runs before (and while) the monitor crossfades to it. */
  private nextFrames = 0;
  private nextWarm = 0;
  private generation = 0;
  private readonly poolSize: number;
  private readonly mix: MonitorMix;
  private readonly output: OutputStage;
  private readonly mixBuffer = new Float64Array(QUANTUM);
  private readonly nextBuffer = new Float64Array(QUANTUM);
  private readonly silence = new Float32Array(QUANTUM);
  private readonly record: RecordRing;
  private readonly howl: HowlWatch;
  private readonly coin: Xoshiro128;
  private readonly seed: number;
  /** Trial number of the current Hidden draw (1 for the first). */
  private draw = 0;
  private revealed = false;
  /** Hidden plays and is not revealed: output figures must not tell A from B. */
  private masked = false;
  /** Louder of A and B after the volume, this period (read while masked). */
  private readonly maskedPeak = new Float64Array(1);
  /** Context frame of a scheduled reset, or -1. */
  private resetAt = -1;
  private readonly fadeLength: number;
  private readonly snapshotEvery: number;
  private readonly finishAt: number;
  private finished = false;
  private frame = 0;
  private sinceSnapshot = 0;
  private inputChannel = 0;
  private live = false;
  private choice: MonitorChoice = 'ref';
  private hidden: ChannelSlot = 'a';
  private errorOf: ChannelSlot = 'a';
  private gainDb = 0;
  private readonly finalHowl = { howling: false, frequencyHz: null as number | null };

  constructor(options?: { processorOptions?: WorkletStartOptions }) {
    super();
    const o = options?.processorOptions ?? {};
    this.rate = sampleRate;
    this.poolSize = Math.max(1, Math.floor(o.poolSize ?? DEFAULT_POOL));
    this.gainDb = Number.isFinite(o.gainDb) ? (o.gainDb as number) : 0;
    this.stage = this.build(o.a ?? DEFAULT_CHANNEL_A, o.b ?? DEFAULT_CHANNEL_B);
    this.fadeLength = Math.max(1, Math.round(MONITOR_FADE_S * this.rate));
    this.mix = new MonitorMix(this.fadeLength, QUANTUM);
    this.output = new OutputStage(
      this.rate,
      OUTPUT_CEILING_DBFS,
      clampVolumeDb(o.volumeDb ?? OUTPUT_START_DB),
    );
    this.output.muted = o.muted !== false;
    this.record = new RecordRing(Math.max(0, Math.round((o.recordSeconds ?? 0) * this.rate)));
    this.howl = new HowlWatch(this.rate);
    // Math.random here, in the constructor, never in process(); a given seed repeats a run.
    this.seed =
      o.seed !== undefined && Number.isFinite(o.seed)
        ? Math.floor(o.seed) >>> 0
        : Math.floor(Math.random() * 0x7fffffff) + 1;
    this.coin = new Xoshiro128(this.seed);
    this.nextDraw();
    this.snapshotEvery = Math.round(this.rate / SNAPSHOTS_PER_SECOND);
    this.finishAt = o.finishAtFrame !== undefined && o.finishAtFrame >= 0 ? Math.floor(o.finishAtFrame) : -1;
    this.port.onmessage = (event) => this.receive(event.data);
    if (o.monitor !== undefined) this.setMonitor(o.monitor, true);
    this.live = o.live === true;
    this.port.postMessage({
      type: 'ready',
      sampleRate: this.rate,
      latency: this.stage.analyzer.path.latency,
      a: this.stage.a,
      b: this.stage.b,
    });
  }

  private build(a: string, b: string): Stage {
    const analyzer = new Analyzer({
      inputRate: this.rate,
      channels: [a, b],
      maxBlock: QUANTUM,
      listen: true,
      gainDb: this.gainDb,
    });
    const generation = ++this.generation;
    const pool = new SnapshotPool(generation, analyzer, this.poolSize);
    const texts = analyzer.createSnapshot().channels;
    return { analyzer, pool, a: texts[0].text, b: texts[1].text };
  }

  private receive(m: ToWorklet): void {
    try {
      this.handle(m);
    } catch (err) {
      this.port.postMessage({ type: 'error', message: err instanceof Error ? err.message : String(err) });
    }
  }

  private handle(m: ToWorklet): void {
    switch (m.type) {
      case 'channels': {
        this.next = this.build(m.a, m.b);
        this.nextFrames = 0;
        // Filled filters (the path's delay, twice, for the onset transient) then the fade.
        this.nextWarm = 2 * this.next.analyzer.path.latency + this.fadeLength;
        return;
      }
      case 'monitor':
        this.setMonitor(m.choice, false);
        return;
      case 'error-of':
        this.errorOf = m.slot;
        if (this.choice === 'error') this.mix.request(this.sourceOf('error'));
        this.announceMonitor();
        return;
      case 'error-gain':
        if (Number.isFinite(m.db)) this.mix.errorGain = Math.pow(10, Math.min(40, Math.max(-40, m.db)) / 20);
        return;
      case 'new-draw':
        this.nextDraw();
        if (this.choice === 'hidden') this.mix.request(this.sourceOf('hidden'));
        this.masked = this.choice === 'hidden';
        this.port.postMessage({ type: 'draw', draw: this.draw });
        return;
      case 'reveal':
        this.revealed = true;
        this.masked = false;
        this.port.postMessage({ type: 'revealed', hidden: this.hidden, seed: this.seed, draw: this.draw });
        return;
      case 'mute':
        this.output.muted = m.muted;
        this.port.postMessage({ type: 'muted', muted: this.output.muted });
        return;
      case 'volume':
        this.output.setVolumeDb(clampVolumeDb(m.db));
        return;
      case 'gain':
        if (!Number.isFinite(m.db))
          throw new RangeError(`input gain must be a finite number of dB (got ${m.db})`);
        this.gainDb = m.db;
        this.stage.analyzer.gainDb = m.db;
        if (this.next) this.next.analyzer.gainDb = m.db;
        return;
      case 'input-channel':
        this.inputChannel = Math.max(0, Math.floor(m.channel));
        return;
      case 'live':
        this.live = m.live;
        if (!m.live) this.howl.reset();
        return;
      case 'reset':
        if (m.atFrame !== undefined && Number.isFinite(m.atFrame) && m.atFrame > currentFrame) {
          this.resetAt = Math.floor(m.atFrame);
          return;
        }
        this.resetAt = -1;
        this.resetFigures();
        if (m.atFrame !== undefined)
          this.port.postMessage({ type: 'reset-done', frame: currentFrame, aligned: false });
        return;
      case 'release':
        this.stage.pool.release(m.envelope);
        return;
      case 'fetch-record':
        this.port.postMessage({
          type: 'record',
          frames: this.frame,
          input: this.record.read(this.record.input),
          outA: this.record.read(this.record.outA),
          outB: this.record.read(this.record.outB),
          analysis: this.stage.analyzer.snapshot(),
        });
        return;
    }
  }

  private resetFigures(): void {
    this.stage.analyzer.reset();
    this.record.reset();
    this.howl.reset();
    this.frame = 0;
    this.sinceSnapshot = 0;
    this.finished = false;
  }

  /** The next trial's draw: which of A and B Hidden plays, by the seeded generator. */
  private nextDraw(): void {
    this.hidden = (this.coin.nextUint32() & 1) === 0 ? 'a' : 'b';
    this.draw++;
    this.revealed = false;
  }

  private sourceOf(choice: MonitorChoice): number {
    switch (choice) {
      case 'a':
        return SOURCE_A;
      case 'b':
        return SOURCE_B;
      case 'hidden':
        return this.hidden === 'a' ? SOURCE_A : SOURCE_B;
      case 'error':
        return this.errorOf === 'a' ? SOURCE_ERROR_A : SOURCE_ERROR_B;
      default:
        return SOURCE_REF;
    }
  }

  private setMonitor(choice: MonitorChoice, immediate: boolean): void {
    // Picking Hidden again plays the same draw: a new one comes only when asked for.
    this.choice = choice;
    this.masked = choice === 'hidden' && !this.revealed;
    const source = this.sourceOf(choice);
    if (immediate) {
      this.mix.current = source;
      this.mix.target = source;
    } else this.mix.request(source);
    this.announceMonitor();
  }

  private announceMonitor(): void {
    this.port.postMessage({ type: 'monitor', choice: this.choice, errorOf: this.errorOf });
  }

  process(inputs: Float32Array[][], outputs: Float32Array[][]): boolean {
    // A reset scheduled for this quantum's first frame (or one that arrived late).
    if (this.resetAt >= 0 && currentFrame >= this.resetAt) {
      const aligned = currentFrame === this.resetAt;
      this.resetAt = -1;
      this.resetFigures();
      this.port.postMessage({ type: 'reset-done', frame: currentFrame, aligned });
    }
    const input = inputs.length > 0 ? inputs[0] : null;
    const outs = outputs[0];
    const n = outs.length > 0 ? outs[0].length : QUANTUM;
    let block: Float32Array = this.silence;
    if (input !== null && input.length > 0)
      block = input.length > this.inputChannel ? input[this.inputChannel] : input[0];

    // Offline: measure exactly finishAt frames, whatever the quantum's padding.
    let measured = n;
    if (this.finishAt >= 0) measured = this.finished ? 0 : Math.min(n, this.finishAt - this.frame);

    const stage = this.stage;
    const path = stage.analyzer.path;
    const mixBuffer = this.mixBuffer;
    if (measured > 0) {
      stage.analyzer.processBlock(block, measured);
      this.record.write(block, path.output48[0], path.output48[1], measured);
      if (this.live) this.howl.add(block, measured);
    }
    this.mix.prepare(measured);
    for (let i = 0; i < n; i++) mixBuffer[i] = 0;
    const next = this.next;
    if (next !== null && measured > 0) {
      next.analyzer.processBlock(block, measured);
      const fadeStart = this.nextWarm - this.fadeLength;
      const nb = this.nextBuffer;
      for (let i = 0; i < measured; i++) nb[i] = 0;
      this.mix.mixInto(path, mixBuffer, measured);
      this.mix.mixInto(next.analyzer.path, nb, measured);
      const len = this.fadeLength;
      for (let i = 0; i < measured; i++) {
        const f = this.nextFrames + i + 1 - fadeStart;
        const w = f <= 0 ? 0 : f >= len ? 1 : f / len;
        mixBuffer[i] = (1 - w) * mixBuffer[i] + w * nb[i];
      }
      this.nextFrames += measured;
      if (this.nextFrames >= this.nextWarm) this.swap(next);
    } else if (measured > 0) this.mix.mixInto(path, mixBuffer, measured);

    if (outs.length > 0) {
      this.output.run(mixBuffer, outs[0], n);
      for (let c = 1; c < outs.length; c++) outs[c].set(outs[0]);
    }
    if (this.masked && measured > 0) {
      const a = path.output48[0];
      const b = path.output48[1];
      const g = this.output.gain;
      let peak = this.maskedPeak[0];
      for (let i = 0; i < measured; i++) {
        const x = Math.abs(a[i]) > Math.abs(b[i]) ? Math.abs(a[i]) * g : Math.abs(b[i]) * g;
        if (x > peak) peak = x;
      }
      this.maskedPeak[0] = peak;
    }

    this.frame += measured;
    this.sinceSnapshot += measured;
    if (this.finishAt >= 0 && !this.finished && this.frame >= this.finishAt) this.finish();
    else if (this.sinceSnapshot >= this.snapshotEvery) {
      const envelope = this.fillSnapshot();
      // The output figures are written here, not in fillSnapshot(): that runs 25 times a
      // second and may never be optimised, and there every double would be boxed.
      if (envelope !== null) {
        if (this.masked) {
          const peak = this.maskedPeak[0];
          const ceiling = this.output.ceiling;
          envelope.outputPeak = peak;
          envelope.limiterDb = peak > ceiling ? 20 * Math.log10(ceiling / peak) : 0;
        } else {
          envelope.outputPeak = this.output.periodPeak;
          envelope.limiterDb = 20 * Math.log10(this.output.periodMinGain);
        }
        this.maskedPeak[0] = 0;
        this.output.resetPeriod();
        this.port.postMessage(envelope, this.stage.pool.transferOf(envelope));
      }
    }
    return true;
  }

  private swap(next: Stage): void {
    this.stage = next;
    this.next = null;
    this.frame = this.nextFrames;
    this.record.reset();
    this.port.postMessage({ type: 'channels', a: next.a, b: next.b, latency: next.analyzer.path.latency });
  }

  /** A pooled envelope with the analysis and howl readout of this period, or null to skip it. */
  private fillSnapshot(): SnapshotEnvelope | null {
    this.sinceSnapshot = 0;
    // The howl watch is read every period, posted or not, so 'ever' misses nothing.
    this.howl.read(this.finalHowl);
    const envelope: SnapshotEnvelope | null = this.stage.pool.take();
    // Every envelope still with the main thread: skip this one rather than allocate.
    if (envelope === null) return null;
    envelope.frame = this.frame;
    this.stage.analyzer.snapshot(envelope.analysis);
    envelope.howl.howling = this.finalHowl.howling;
    envelope.howl.frequencyHz = this.finalHowl.frequencyHz;
    return envelope;
  }

  private finish(): void {
    this.finished = true;
    this.stage.analyzer.finish();
    this.howl.read(this.finalHowl);
    // Once, at the end of an offline render: a plain message is fine here.
    this.port.postMessage({
      type: 'final',
      analysis: this.stage.analyzer.snapshot(),
      frames: this.frame,
      input: this.record.read(this.record.input),
      outA: this.record.read(this.record.outA),
      outB: this.record.read(this.record.outB),
      howlEver: this.howl.ever,
    });
  }
}

registerProcessor(PROCESSOR_NAME, ChannelProcessor);
