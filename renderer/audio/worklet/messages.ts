// The worklet's message protocol. Control messages are rare; snapshots travel in
// preallocated envelopes that the main thread hands back after reading.
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';

export const PROCESSOR_NAME = 'quantiscope-channel';

/** What the monitor plays. Hidden is A or B behind a seeded coin; Error is one channel's quantization error. */
export type MonitorChoice = 'ref' | 'a' | 'b' | 'hidden' | 'error';
export type ChannelSlot = 'a' | 'b';

export const MONITOR_CHOICES: readonly MonitorChoice[] = ['ref', 'a', 'b', 'hidden', 'error'];

export type ToWorklet =
  | { type: 'channels'; a: string; b: string }
  | { type: 'monitor'; choice: MonitorChoice }
  | { type: 'error-of'; slot: ChannelSlot }
  | { type: 'error-gain'; db: number }
  | { type: 'reveal' }
  | { type: 'mute'; muted: boolean }
  | { type: 'volume'; db: number }
  | { type: 'gain'; db: number }
  | { type: 'input-channel'; channel: number }
  | { type: 'live'; live: boolean }
  /** Restart every figure (and the recording) from the next block. */
  | { type: 'reset' }
  /** Hand a snapshot envelope back to the pool. */
  | { type: 'release'; envelope: SnapshotEnvelope }
  | { type: 'fetch-record' };

export interface HowlReadout {
  howling: boolean;
  frequencyHz: number | null;
}

/** One snapshot as posted ~25 times a second; the worklet owns a fixed pool of these. */
export interface SnapshotEnvelope {
  type: 'snapshot';
  /** Analyzer generation: envelopes of an older generation are dropped on return. */
  generation: number;
  slot: number;
  /** Frames processed since the figures last restarted. */
  frame: number;
  analysis: AnalysisSnapshot;
  howl: HowlReadout;
  /** Output peak before the limiter this period, and the limiter's deepest gain reduction (dB, <= 0). */
  outputPeak: number;
  limiterDb: number;
}

export interface RecordPayload {
  type: 'record';
  /** Samples received since the figures last restarted (the recording holds the most recent). */
  frames: number;
  input: Float32Array;
  outA: Float32Array;
  outB: Float32Array;
  /** The analyzer's figures at the same block boundary. */
  analysis: AnalysisSnapshot;
}

export type FromWorklet =
  | { type: 'ready'; sampleRate: number; latency: number; a: string; b: string }
  | { type: 'channels'; a: string; b: string; latency: number }
  | { type: 'monitor'; choice: MonitorChoice; errorOf: ChannelSlot }
  | { type: 'revealed'; hidden: ChannelSlot }
  | { type: 'muted'; muted: boolean }
  | { type: 'error'; message: string }
  /** End of an offline render; the recording rides along when one was kept. */
  | {
      type: 'final';
      analysis: AnalysisSnapshot;
      frames: number;
      input: Float32Array;
      outA: Float32Array;
      outB: Float32Array;
      /** Whether the howl watch fired at any snapshot period of the run. */
      howlEver: boolean;
    }
  | SnapshotEnvelope
  | RecordPayload;

/** processorOptions of the node. Output stays muted unless `muted` is explicitly false. */
export interface WorkletStartOptions {
  a?: string;
  b?: string;
  muted?: boolean;
  volumeDb?: number;
  gainDb?: number;
  /** Seed of the Hidden coin. */
  seed?: number;
  /** Seconds of input (and A/B output) to keep for tests; 0 keeps none. */
  recordSeconds?: number;
  /** Offline: analyse exactly this many frames, then post 'final' and stop measuring. */
  finishAtFrame?: number;
  /** Snapshot envelopes in the pool (default 4). */
  poolSize?: number;
  monitor?: MonitorChoice;
  /** Run the howl watch from the start, as for a live microphone. */
  live?: boolean;
}

export const DEFAULT_CHANNEL_A = 'g711-mu';
export const DEFAULT_CHANNEL_B = 'g711-a';
/** Highest master volume, dB (a hearing safeguard, not a level setting). */
export const OUTPUT_CAP_DB = -12;
export const OUTPUT_START_DB = -36;
export const OUTPUT_MIN_DB = -60;
/** The hard output ceiling, dBFS (the figure). */
export const OUTPUT_CEILING_DBFS = -1;
/** Crossfade between monitor choices, seconds (the issue allows at most 20 ms). */
export const MONITOR_FADE_S = 0.01;
/** Snapshots per second (the issue: about 25). */
export const SNAPSHOTS_PER_SECOND = 25;

export function clampVolumeDb(db: number): number {
  if (!Number.isFinite(db)) return OUTPUT_MIN_DB;
  return Math.min(OUTPUT_CAP_DB, Math.max(OUTPUT_MIN_DB, db));
}
