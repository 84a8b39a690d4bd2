// The live audio engine: an AudioContext at 48 kHz, the channel worklet (core's
// Analyzer for the Reference, A and B), one source at a time, and a typed state the
// page and the tests read. Output starts muted; the worklet holds the volume cap and
// the -1 dBFS ceiling, so nothing here can make the output louder than that.
//
// No method throws: every failure becomes state.fault (code and message), and the
// engine stays usable, so capture can resume by choosing a source again.
//
// Two routes out, kept apart: the state (settings and status) goes to onChange listeners
// when it changes, never per snapshot; snapshots go to subscribe() readers, each snapshot
// once to every reader, which copy what they keep before the envelope goes back to the
// worklet with its buffers.
import { parseChannel } from '../../core/spec/parse';
import { formatChannel } from '../../core/spec/format';
import { dbm0FromDbov } from '../../core/units/levels';
import { dbfsFromRms, localCalibrationStore, type CalibrationStore } from './calibration';
import { fault, microphoneFault, type EngineFault } from './faults';
import {
  bufferOf,
  decodeFile,
  DEFAULT_TEST_SIGNAL,
  renderBuiltIn,
  type SourceKind,
  type TestSignalSettings,
} from './sources';
import {
  DEFAULT_CHANNEL_A,
  DEFAULT_CHANNEL_B,
  OUTPUT_CAP_DB,
  OUTPUT_MIN_DB,
  OUTPUT_START_DB,
  PROCESSOR_NAME,
  clampVolumeDb,
  type ChannelSlot,
  type FromWorklet,
  type MonitorChoice,
  type RecordPayload,
  type SnapshotEnvelope,
  type ToWorklet,
  type WorkletStartOptions,
} from './worklet/messages';
import { buffersOf } from './worklet/snapshot-pool';

export { OUTPUT_CAP_DB, OUTPUT_MIN_DB, OUTPUT_START_DB, clampVolumeDb };
export type { SourceKind, TestSignalSettings };

/** The engine's context rate (the channel path's input rate). */
export const ENGINE_RATE = 48000;
/** Target of the alignment action: -26 dBov active speech level (common practice, no source). */
export const ALIGN_TARGET_DBOV = -26;
const INPUT_GAIN_LIMIT_DB = 60;

export type EnginePhase = 'stopped' | 'starting' | 'running' | 'suspended';

/** Quanta between scheduling a buffer source and its first sample: room for the reset message to arrive. */
const START_LEAD_QUANTA = 12;
const QUANTUM = 128;

/** A snapshot reader: copies what it keeps; the envelope's arrays go back to the worklet after it returns. */
export type SnapshotReader = (envelope: SnapshotEnvelope) => void;

export interface HiddenDraw {
  /** Trial number of the draw now in force (1 for the first). */
  draw: number;
  /** Set by Reveal: the channel the draw hides, the seed of the draws and the draw's number. */
  revealed: { slot: ChannelSlot; seed: number; draw: number } | null;
}

export interface InputDevice {
  deviceId: string;
  label: string;
}

export interface EngineState {
  phase: EnginePhase;
  running: boolean;
  /** The last failure, cleared by the next success. */
  fault: EngineFault | null;
  /** A passing remark (not a failure), e.g. why the alignment could not act. */
  notice: string | null;
  source: {
    kind: SourceKind;
    label: string;
    /** The microphone in use, or null. */
    deviceId: string | null;
    inputChannel: number;
    channelCount: number;
    /** A buffer source's length in context frames (one pass of the loop), else null. */
    lengthFrames: number | null;
    /** Whether the figures restarted exactly at the buffer's first sample (null until known). */
    aligned: boolean | null;
  };
  testSignal: TestSignalSettings;
  /** The channels asked for (canonical text); the worklet builds them and crossfades to them. */
  channels: { a: string; b: string };
  /** The channels the worklet runs now. */
  inUse: { a: string; b: string };
  monitor: MonitorChoice;
  errorOf: ChannelSlot;
  errorGainDb: number;
  /** The Hidden draw: its number always, which channel only after Reveal. */
  hidden: HiddenDraw;
  muted: boolean;
  volumeDb: number;
  inputGainDb: number;
  sampleRate: number | null;
  latency: {
    pathSamples: number | null;
    pathMs: number | null;
    baseMs: number | null;
    outputMs: number | null;
  };
  /** The talker's active level at channel A's quantizer (P.56 over the sliding window), after the gain. */
  alignment: { activeDbov: number | null; activeDbm0: number | null; targetDbov: number };
  calibration: {
    device: string;
    offsetDb: number | null;
    inputDbfs: number | null;
    inputDbm0: number | null;
  };
  howl: { howling: boolean; frequencyHz: number | null };
  /**
   * Figures refreshed by every snapshot without telling the listeners (they are the
   * snapshot route's business): read them with state() when needed.
   */
  snr: { a: number | null; b: number | null };
  snapshots: number;
}

const ms = (seconds: number | undefined) =>
  seconds === undefined || !Number.isFinite(seconds) ? null : seconds * 1000;
const message = (err: unknown) => (err instanceof Error ? err.message : String(err));

function initialState(): EngineState {
  return {
    phase: 'stopped',
    running: false,
    fault: null,
    notice: null,
    source: {
      kind: 'demo',
      label: 'demo talker',
      deviceId: null,
      inputChannel: 0,
      channelCount: 1,
      lengthFrames: null,
      aligned: null,
    },
    testSignal: { ...DEFAULT_TEST_SIGNAL },
    channels: { a: DEFAULT_CHANNEL_A, b: DEFAULT_CHANNEL_B },
    inUse: { a: DEFAULT_CHANNEL_A, b: DEFAULT_CHANNEL_B },
    monitor: 'a',
    errorOf: 'a',
    errorGainDb: 0,
    hidden: { draw: 1, revealed: null },
    muted: true,
    volumeDb: OUTPUT_START_DB,
    inputGainDb: 0,
    sampleRate: null,
    latency: { pathSamples: null, pathMs: null, baseMs: null, outputMs: null },
    alignment: { activeDbov: null, activeDbm0: null, targetDbov: ALIGN_TARGET_DBOV },
    calibration: { device: 'source:demo', offsetDb: null, inputDbfs: null, inputDbm0: null },
    howl: { howling: false, frequencyHz: null },
    snr: { a: null, b: null },
    snapshots: 0,
  };
}

export class AudioEngine {
  private ctx: AudioContext | null = null;
  private node: AudioWorkletNode | null = null;
  private sourceNode: AudioNode | null = null;
  private stream: MediaStream | null = null;
  private track: MediaStreamTrack | null = null;
  private suspending = false;
  /** The buffer source playing, to play again from its start. */
  private looping: { buffer: AudioBuffer; kind: SourceKind; label: string } | null = null;
  private readonly listeners = new Set<(s: EngineState) => void>();
  private readonly readers = new Set<SnapshotReader>();
  private recordWaiters: ((r: RecordPayload) => void)[] = [];
  private readonly s: EngineState = initialState();

  constructor(
    private readonly workletUrl: string,
    private readonly calibrations: CalibrationStore = localCalibrationStore(),
    private readonly recordSeconds = 0,
  ) {}

  /** A deep copy of the state, for views and tests. */
  state(): EngineState {
    return structuredClone(this.s);
  }

  onChange(listener: (s: EngineState) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  /** Hands every snapshot to `reader` (in the order readers came), until the returned function is called. */
  subscribe(reader: SnapshotReader): () => void {
    this.readers.add(reader);
    return () => this.readers.delete(reader);
  }

  /** The context, for tests and the views' analysers. */
  get context(): AudioContext | null {
    return this.ctx;
  }

  /** The microphone track in use (tests dispatch its 'ended' event). */
  inputTrack(): MediaStreamTrack | null {
    return this.track;
  }

  private emit(): void {
    const copy = this.state();
    for (const l of this.listeners) l(copy);
  }

  private setFault(f: EngineFault | null): void {
    this.s.fault = f;
    this.emit();
  }

  /** Builds the graph and starts the demo talker (the default source). Resolves true once running. */
  async start(): Promise<boolean> {
    if (this.ctx) return this.s.running;
    this.s.phase = 'starting';
    this.emit();
    try {
      const ctx = new AudioContext({ latencyHint: 'interactive', sampleRate: ENGINE_RATE });
      this.ctx = ctx;
      ctx.onstatechange = () => this.contextState();
      await ctx.audioWorklet.addModule(this.workletUrl);
      const node = new AudioWorkletNode(ctx, PROCESSOR_NAME, {
        numberOfInputs: 1,
        numberOfOutputs: 1,
        outputChannelCount: [2],
        channelCount: 2,
        channelCountMode: 'explicit',
        channelInterpretation: 'discrete',
        processorOptions: {
          a: this.s.channels.a,
          b: this.s.channels.b,
          muted: true,
          volumeDb: this.s.volumeDb,
          gainDb: this.s.inputGainDb,
          monitor: this.s.monitor,
          // No seed: the audio thread picks its own, so Hidden cannot be known here before Reveal.
          recordSeconds: this.recordSeconds,
        } satisfies WorkletStartOptions,
      });
      node.port.onmessage = (e: MessageEvent<FromWorklet>) => this.receive(e.data);
      node.connect(ctx.destination);
      this.node = node;
      await this.playBuiltIn('demo');
      await ctx.resume();
      this.s.latency.baseMs = ms(ctx.baseLatency);
      this.s.latency.outputMs = ms(ctx.outputLatency);
      this.s.phase = ctx.state === 'running' ? 'running' : 'suspended';
      this.emit();
      return true;
    } catch (err) {
      this.s.phase = 'stopped';
      this.setFault(fault('audio-unavailable', message(err)));
      return false;
    }
  }

  private contextState(): void {
    const ctx = this.ctx;
    if (!ctx) return;
    const state = ctx.state as string;
    if (state === 'running') {
      this.s.phase = 'running';
      if (this.s.fault?.code === 'context-suspended') this.s.fault = null;
    } else if (state === 'suspended' || state === 'interrupted') {
      this.s.phase = 'suspended';
      if (!this.suspending) this.s.fault = fault('context-suspended');
    }
    this.emit();
  }

  /** Resumes after the system suspended audio. */
  async resume(): Promise<boolean> {
    if (!this.ctx) return this.start();
    try {
      this.suspending = false;
      await this.ctx.resume();
      return this.ctx.state === 'running';
    } catch (err) {
      this.setFault(fault('context-suspended', message(err)));
      return false;
    }
  }

  private send(m: ToWorklet): void {
    this.node?.port.postMessage(m);
  }

  private receive(m: FromWorklet): void {
    switch (m.type) {
      case 'ready':
        this.s.running = true;
        this.s.sampleRate = m.sampleRate;
        this.s.channels = { a: m.a, b: m.b };
        this.s.inUse = { a: m.a, b: m.b };
        this.s.latency.pathSamples = m.latency;
        this.s.latency.pathMs = (m.latency / m.sampleRate) * 1000;
        break;
      case 'channels':
        this.s.inUse = { a: m.a, b: m.b };
        this.s.latency.pathSamples = m.latency;
        this.s.latency.pathMs = this.s.sampleRate ? (m.latency / this.s.sampleRate) * 1000 : null;
        break;
      case 'monitor':
        this.s.monitor = m.choice;
        this.s.errorOf = m.errorOf;
        break;
      case 'draw':
        this.s.hidden = { draw: m.draw, revealed: null };
        break;
      case 'revealed':
        this.s.hidden = { draw: m.draw, revealed: { slot: m.hidden, seed: m.seed, draw: m.draw } };
        break;
      case 'reset-done':
        if (this.s.source.lengthFrames !== null) this.s.source.aligned = m.aligned;
        break;
      case 'muted':
        // The worklet's own state is the truth for what reaches the output.
        this.s.muted = m.muted;
        break;
      case 'error':
        // A refused channel leaves the one in use: the text asked for goes back to it.
        this.s.channels = { ...this.s.inUse };
        this.s.fault = fault('channel-invalid', m.message);
        break;
      case 'record': {
        const waiters = this.recordWaiters;
        this.recordWaiters = [];
        for (const w of waiters) w(m);
        return;
      }
      case 'snapshot':
        this.takeSnapshot(m);
        return;
      default:
        return;
    }
    this.emit();
  }

  private takeSnapshot(envelope: SnapshotEnvelope): void {
    const a = envelope.analysis;
    this.s.snapshots++;
    const chA = a.channels[0];
    const talker = a.talkers[chA.talker];
    const active = talker.activeWindow.activeLevelDbov;
    this.s.alignment.activeDbov = active;
    this.s.alignment.activeDbm0 = active === null ? null : dbm0FromDbov(active, talker.loadCapacityDbm0);
    this.s.snr.a = chA.meter.snrDb;
    this.s.snr.b = a.channels[1].meter.snrDb;
    const dbfs = dbfsFromRms(a.input.rms);
    this.s.calibration.inputDbfs = dbfs;
    const offset = this.s.calibration.offsetDb;
    this.s.calibration.inputDbm0 = dbfs === null || offset === null ? null : dbfs + offset;
    if (this.ctx) this.s.latency.outputMs = ms(this.ctx.outputLatency);
    const howlChanged =
      envelope.howl.howling !== this.s.howl.howling ||
      (envelope.howl.howling && envelope.howl.frequencyHz !== this.s.howl.frequencyHz);
    this.s.howl = { howling: envelope.howl.howling, frequencyHz: envelope.howl.frequencyHz };
    for (const read of this.readers) {
      try {
        read(envelope);
      } catch (err) {
        // One faulty view must not keep the envelope from going back.
        console.error(err);
      }
    }
    // Hand the envelope back with its arrays, so the worklet never needs another.
    this.node?.port.postMessage({ type: 'release', envelope } satisfies ToWorklet, buffersOf(envelope));
    if (howlChanged) this.emit();
  }

  // ---- sources ----

  private detachSource(): void {
    if (this.sourceNode) {
      try {
        this.sourceNode.disconnect();
        if (this.sourceNode instanceof AudioBufferSourceNode) this.sourceNode.stop();
      } catch {
        // Already stopped or disconnected.
      }
    }
    this.sourceNode = null;
    this.looping = null;
    if (this.track) this.track.onended = null;
    this.stream?.getTracks().forEach((t) => t.stop());
    this.stream = null;
    this.track = null;
  }

  private useDevice(
    kind: SourceKind,
    label: string,
    deviceId: string | null,
    channelCount: number,
    buffer: { lengthFrames: number; startFrame: number } | null = null,
  ): void {
    this.s.source = {
      kind,
      label,
      deviceId,
      inputChannel: 0,
      channelCount,
      lengthFrames: buffer?.lengthFrames ?? null,
      aligned: null,
    };
    this.s.calibration.device = deviceId !== null ? `mic:${deviceId}` : `source:${kind}`;
    this.s.calibration.offsetDb = this.calibrations.get(this.s.calibration.device);
    this.s.calibration.inputDbfs = null;
    this.s.calibration.inputDbm0 = null;
    this.s.alignment.activeDbov = null;
    this.s.alignment.activeDbm0 = null;
    this.s.howl = { howling: false, frequencyHz: null };
    this.send({ type: 'input-channel', channel: 0 });
    this.send({ type: 'live', live: kind === 'microphone' });
    this.send(buffer ? { type: 'reset', atFrame: buffer.startFrame } : { type: 'reset' });
  }

  /**
   * Loops a buffer, its first sample scheduled on a render-quantum boundary a little ahead,
   * with the figures restarting at that very frame: one pass of the loop is then exactly
   * the file as the command line reads it, from fresh filters.
   */
  private playBuffer(buffer: AudioBuffer, kind: SourceKind, label: string): void {
    const ctx = this.ctx!;
    this.detachSource();
    const src = new AudioBufferSourceNode(ctx, { buffer, loop: true });
    src.connect(this.node!);
    const now = Math.ceil((ctx.currentTime * ctx.sampleRate) / QUANTUM);
    const startFrame = (now + START_LEAD_QUANTA) * QUANTUM;
    src.start(startFrame / ctx.sampleRate);
    this.sourceNode = src;
    this.looping = { buffer, kind, label };
    this.useDevice(kind, label, null, buffer.numberOfChannels, { lengthFrames: buffer.length, startFrame });
  }

  /** Plays the looping source again from its first sample, the figures restarting with it. */
  async rewind(): Promise<boolean> {
    const l = this.looping;
    if (!l || !this.ctx || !this.node) return false;
    this.playBuffer(l.buffer, l.kind, l.label);
    this.emit();
    return true;
  }

  private async playBuiltIn(kind: 'demo' | 'tone' | 'noise' | 'sweep'): Promise<void> {
    const ctx = this.ctx!;
    const samples = renderBuiltIn(kind, ctx.sampleRate, this.s.channels.a, this.s.testSignal);
    const labels = { demo: 'demo talker', tone: 'test tone', noise: 'Gaussian noise', sweep: 'level sweep' };
    this.playBuffer(bufferOf(ctx, samples), kind, labels[kind]);
  }

  /** The demo talker or a calibrated test signal (levels at channel A's quantizer). */
  async useBuiltIn(
    kind: 'demo' | 'tone' | 'noise' | 'sweep',
    settings?: Partial<TestSignalSettings>,
  ): Promise<boolean> {
    if (!(await this.ensureStarted())) return false;
    if (settings) this.s.testSignal = { ...this.s.testSignal, ...settings };
    try {
      await this.playBuiltIn(kind);
      this.s.fault = null;
      this.emit();
      return true;
    } catch (err) {
      this.setFault(fault('audio-unavailable', message(err)));
      return false;
    }
  }

  /** An audio file (WAV or anything Chromium decodes), looped. */
  async useFile(file: Blob, name = file instanceof File ? file.name : 'file'): Promise<boolean> {
    if (!(await this.ensureStarted())) return false;
    const bytes = await file.arrayBuffer();
    const decoded = await decodeFile(this.ctx!, bytes, name);
    if (!decoded.ok) {
      this.setFault(decoded.fault);
      return false;
    }
    this.playBuffer(decoded.buffer, 'file', name);
    this.s.fault = null;
    this.emit();
    return true;
  }

  /** Audio inputs the browser lists (labels appear once the microphone was allowed). */
  async listInputs(): Promise<InputDevice[]> {
    try {
      const all = await navigator.mediaDevices.enumerateDevices();
      return all
        .filter((d) => d.kind === 'audioinput')
        .map((d, i) => ({ deviceId: d.deviceId, label: d.label || `input ${i + 1}` }));
    } catch {
      return [];
    }
  }

  /** The microphone, with every voice processing off: the channel must see the talker as picked up. */
  async useMicrophone(deviceId?: string): Promise<boolean> {
    if (!(await this.ensureStarted())) return false;
    let stream: MediaStream;
    try {
      if (!navigator.mediaDevices?.getUserMedia)
        throw Object.assign(new Error('no media devices'), { name: 'NotFoundError' });
      stream = await navigator.mediaDevices.getUserMedia({
        audio: {
          echoCancellation: false,
          noiseSuppression: false,
          autoGainControl: false,
          channelCount: { ideal: 2 },
          ...(deviceId ? { deviceId: { exact: deviceId } } : {}),
        },
      });
    } catch (err) {
      this.setFault(microphoneFault(err));
      return false;
    }
    const track = stream.getAudioTracks()[0];
    if (!track) {
      stream.getTracks().forEach((t) => t.stop());
      this.setFault(fault('no-input-device', 'the stream has no audio track'));
      return false;
    }
    this.detachSource();
    this.stream = stream;
    this.track = track;
    track.onended = () => this.deviceEnded(track);
    const node = new MediaStreamAudioSourceNode(this.ctx!, { mediaStream: stream });
    node.connect(this.node!);
    this.sourceNode = node;
    const settings = track.getSettings();
    this.useDevice(
      'microphone',
      track.label || 'microphone',
      settings.deviceId ?? deviceId ?? 'default',
      settings.channelCount ?? 1,
    );
    this.s.fault = null;
    this.emit();
    return true;
  }

  private deviceEnded(track: MediaStreamTrack): void {
    if (track !== this.track) return;
    this.detachSource();
    this.send({ type: 'live', live: false });
    this.setFault(fault('device-ended', track.label || undefined));
  }

  setInputChannel(channel: number): void {
    const c = Math.max(0, Math.min(this.s.source.channelCount - 1, Math.floor(channel)));
    this.s.source.inputChannel = c;
    this.send({ type: 'input-channel', channel: c });
    this.emit();
  }

  setTestSignal(settings: Partial<TestSignalSettings>): Promise<boolean> {
    const kind = this.s.source.kind;
    this.s.testSignal = { ...this.s.testSignal, ...settings };
    if (kind === 'tone' || kind === 'noise' || kind === 'sweep') return this.useBuiltIn(kind);
    this.emit();
    return Promise.resolve(true);
  }

  private async ensureStarted(): Promise<boolean> {
    if (this.ctx && this.node) return true;
    return this.start();
  }

  // ---- channel, monitor, output ----

  /**
   * Checks the texts here (for an immediate message) and in the worklet, which builds the
   * path. They must be whole: a stored table's levels are filled in before they get here.
   */
  setChannels(a: string, b: string): boolean {
    try {
      const ca = formatChannel(parseChannel(a));
      const cb = formatChannel(parseChannel(b));
      if (ca === this.s.channels.a && cb === this.s.channels.b) return true;
      this.send({ type: 'channels', a: ca, b: cb });
      this.s.channels = { a: ca, b: cb };
      if (!this.node) this.s.inUse = { a: ca, b: cb };
      this.s.fault = this.s.fault?.code === 'channel-invalid' ? null : this.s.fault;
      this.emit();
      return true;
    } catch (err) {
      this.setFault(fault('channel-invalid', message(err)));
      return false;
    }
  }

  setMonitor(choice: MonitorChoice): void {
    this.s.monitor = choice;
    this.send({ type: 'monitor', choice });
    this.emit();
  }

  setErrorOf(slot: ChannelSlot): void {
    this.s.errorOf = slot;
    this.send({ type: 'error-of', slot });
    this.emit();
  }

  setErrorGainDb(db: number): void {
    if (!Number.isFinite(db)) return;
    this.s.errorGainDb = Math.max(-40, Math.min(40, db));
    this.send({ type: 'error-gain', db: this.s.errorGainDb });
    this.emit();
  }

  /** The next blind trial: the audio thread draws again which channel Hidden plays. */
  newDraw(): void {
    this.send({ type: 'new-draw' });
  }

  /** Asks the audio thread which channel the current draw hides (answered as state.hidden.revealed). */
  reveal(): void {
    this.send({ type: 'reveal' });
  }

  setMuted(muted: boolean): void {
    this.s.muted = muted;
    this.send({ type: 'mute', muted });
    this.emit();
  }

  setVolumeDb(db: number): void {
    this.s.volumeDb = clampVolumeDb(db);
    this.send({ type: 'volume', db: this.s.volumeDb });
    this.emit();
  }

  setInputGainDb(db: number): void {
    if (!Number.isFinite(db)) return;
    this.s.inputGainDb = Math.max(-INPUT_GAIN_LIMIT_DB, Math.min(INPUT_GAIN_LIMIT_DB, db));
    this.send({ type: 'gain', db: this.s.inputGainDb });
    this.emit();
  }

  /** The active level the alignment aims at, dBov at channel A's quantizer. */
  setAlignTarget(targetDbov: number): void {
    if (!Number.isFinite(targetDbov)) return;
    this.s.alignment.targetDbov = Math.max(-60, Math.min(0, targetDbov));
    this.emit();
  }

  /** Sets the input gain so the talker's active level reaches the target (dBov at channel A). */
  alignToTarget(targetDbov: number = this.s.alignment.targetDbov): boolean {
    this.s.alignment.targetDbov = targetDbov;
    const active = this.s.alignment.activeDbov;
    if (active === null) {
      this.s.notice = 'No speech measured yet: the alignment needs the talker active for a moment.';
      this.emit();
      return false;
    }
    this.s.notice = null;
    this.setInputGainDb(this.s.inputGainDb + (targetDbov - active));
    return true;
  }

  /** With a tone of known level at the input, records the input's dBFS-to-dBm0 offset for this device. */
  calibrate(knownDbm0: number): boolean {
    const dbfs = this.s.calibration.inputDbfs;
    if (dbfs === null || !Number.isFinite(knownDbm0)) {
      this.s.notice = 'No input level measured yet: play the calibration tone first.';
      this.emit();
      return false;
    }
    const offset = knownDbm0 - dbfs;
    this.s.calibration.offsetDb = offset;
    this.s.calibration.inputDbm0 = dbfs + offset;
    this.calibrations.set(this.s.calibration.device, offset);
    this.s.notice = null;
    this.emit();
    return true;
  }

  /** Restarts every figure from now. */
  resetFigures(): void {
    this.send({ type: 'reset' });
  }

  /** The worklet's recording (input received, A and B outputs) and the figures at the same block. */
  fetchRecord(): Promise<RecordPayload> {
    return new Promise((resolve) => {
      this.recordWaiters.push(resolve);
      this.send({ type: 'fetch-record' });
    });
  }

  async stop(): Promise<void> {
    this.detachSource();
    const ctx = this.ctx;
    this.ctx = null;
    this.node = null;
    this.s.running = false;
    this.s.phase = 'stopped';
    if (ctx) {
      ctx.onstatechange = null;
      await ctx.close().catch(() => undefined);
    }
    this.emit();
  }
}
