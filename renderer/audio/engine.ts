// The monitor's audio graph for the first page: a test tone through the channel
// worklet to the output. Muted at start; the volume can never exceed OUTPUT_CAP_DB.
import {
  PROCESSOR_NAME,
  type FromWorklet,
  type ToWorklet,
  type WorkletStartOptions,
} from './worklet/messages';

/** Highest monitor gain in dB (a hearing safeguard, not a level setting). */
export const OUTPUT_CAP_DB = -12;
/** Gain applied on the first unmute. */
export const OUTPUT_START_DB = -36;
export const OUTPUT_MIN_DB = -60;
/** G.712 reference test frequency (from memory: 1020 Hz avoids sub-multiples of 8 kHz). */
export const TEST_TONE_HZ = 1020;
/** Peak of the test tone on the float scale (-20 dB re full scale). */
export const TEST_TONE_PEAK = 0.1;

export interface EngineStatus {
  running: boolean;
  muted: boolean;
  volumeDb: number;
  channel: string | null;
  sampleRate: number | null;
  error: string | null;
}

export function clampVolumeDb(db: number): number {
  if (!Number.isFinite(db)) return OUTPUT_MIN_DB;
  return Math.min(OUTPUT_CAP_DB, Math.max(OUTPUT_MIN_DB, db));
}

const dbToGain = (db: number) => Math.pow(10, db / 20);

export class MonitorEngine {
  private ctx: AudioContext | null = null;
  private node: AudioWorkletNode | null = null;
  private out: GainNode | null = null;
  readonly status: EngineStatus = {
    running: false,
    muted: true,
    volumeDb: OUTPUT_START_DB,
    channel: null,
    sampleRate: null,
    error: null,
  };

  constructor(
    private readonly workletUrl: string,
    private readonly onChange: (status: EngineStatus) => void,
  ) {}

  async start(channelText: string): Promise<void> {
    if (this.ctx) return;
    const ctx = new AudioContext({ latencyHint: 'interactive' });
    this.ctx = ctx;
    await ctx.audioWorklet.addModule(this.workletUrl);
    const node = new AudioWorkletNode(ctx, PROCESSOR_NAME, {
      numberOfInputs: 1,
      numberOfOutputs: 1,
      outputChannelCount: [1],
      processorOptions: { channel: channelText, muted: true } satisfies WorkletStartOptions,
    });
    node.port.onmessage = (e: MessageEvent<FromWorklet>) => this.receive(e.data);
    const tone = new OscillatorNode(ctx, { frequency: TEST_TONE_HZ });
    const toneLevel = new GainNode(ctx, { gain: TEST_TONE_PEAK });
    const out = new GainNode(ctx, { gain: 0 });
    tone.connect(toneLevel).connect(node).connect(out).connect(ctx.destination);
    tone.start();
    this.node = node;
    this.out = out;
    await ctx.resume();
  }

  setChannel(text: string): void {
    this.send({ type: 'channel', text });
  }

  setMuted(muted: boolean): void {
    this.status.muted = muted;
    this.send({ type: 'mute', muted });
    this.applyGain();
    this.onChange(this.status);
  }

  setVolumeDb(db: number): void {
    this.status.volumeDb = clampVolumeDb(db);
    this.applyGain();
    this.onChange(this.status);
  }

  private applyGain(): void {
    if (!this.ctx || !this.out) return;
    const target = this.status.muted ? 0 : dbToGain(this.status.volumeDb);
    this.out.gain.setTargetAtTime(target, this.ctx.currentTime, 0.02);
  }

  private send(message: ToWorklet): void {
    this.node?.port.postMessage(message);
  }

  private receive(message: FromWorklet): void {
    switch (message.type) {
      case 'running':
        this.status.running = true;
        this.status.sampleRate = message.sampleRate;
        break;
      case 'channel':
        this.status.channel = message.canonical;
        this.status.error = null;
        break;
      case 'muted':
        // The worklet's own state is the truth for what reaches the output.
        this.status.muted = message.muted;
        break;
      case 'error':
        this.status.error = message.message;
        break;
    }
    this.onChange(this.status);
  }
}
