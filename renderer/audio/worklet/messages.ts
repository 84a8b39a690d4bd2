// The worklet's message protocol. Control messages are rare; snapshots travel in
// preallocated envelopes that the main thread hands back after reading.
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';

export const PROCESSOR_NAME = 'quantiscope-channel';

/** What the monitor plays. Hidden is A or B behind a seeded draw; Error is one channel's quantization error. */
export type MonitorChoice = 'ref' | 'a' | 'b' | 'hidden' | 'error';
export type ChannelSlot = 'a' | 'b';

export const MONITOR_CHOICES: readonly MonitorChoice[] = ['ref', 'a', 'b', 'hidden', 'error'];

export type ToWorklet =
  | { type: 'channels'; a: string; b: string }
  | { type: 'monitor'; choice: MonitorChoice }
  | { type: 'error-of'; slot: ChannelSlot }
  | { type: 'error-gain'; db: number }
  /** A new Hidden draw: the next trial of a blind comparison (kept until the next one). */
  | { type: 'new-draw' }
  | { type: 'reveal' }
  | { type: 'mute'; muted: boolean }
  | { type: 'volume'; db: number }
  | { type: 'gain'; db: number }
  | { type: 'input-channel'; channel: number }
  | { type: 'live'; live: boolean }
  /**
   * Restart every figure (and the recording): from the next block, or at the context frame
   * `atFrame` (a quantum boundary), so a buffer source scheduled to start there meets
   * freshly reset filters and accumulators at its first sample.
   */
  | { type: 'reset'; atFrame?: number }
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
  /**
   * Output peak before the limiter this period, and the limiter's deepest gain reduction (dB, <= 0).
   * While an unrevealed Hidden draw plays, both are taken from the louder of A and B, so they
   * read the same whichever channel the draw hides.
   */
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
  /** A new Hidden draw was made; which channel it hides stays on the audio thread. */
  | { type: 'draw'; draw: number }
  /** Reveal: the channel the current draw hides, with the seed and draw number for the record. */
  | { type: 'revealed'; hidden: ChannelSlot; seed: number; draw: number }
  /** A reset asked for at a frame took effect; `aligned` when exactly at that frame. */
  | { type: 'reset-done'; frame: number; aligned: boolean }
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
  /**
   * Seed of the Hidden draws. Left out, the audio thread picks its own, so the page cannot
   * work out a draw before Reveal; tests give one to repeat a run.
   */
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
/** The hard output ceiling, dBFS: 1 dB of headroom against inter-sample overs (common practice, no source). */
export const OUTPUT_CEILING_DBFS = -1;
/** Crossfade between monitor choices, seconds: short enough to compare, long enough not to click (common practice, no source). */
export const MONITOR_FADE_S = 0.01;
/** Snapshots per second: as often as a display's eye needs, far below the block rate (common practice, no source). */
export const SNAPSHOTS_PER_SECOND = 25;

export function clampVolumeDb(db: number): number {
  if (!Number.isFinite(db)) return OUTPUT_MIN_DB;
  return Math.min(OUTPUT_CAP_DB, Math.max(OUTPUT_MIN_DB, db));
}
