// The live graph offline: samples through the channel worklet in an
// OfflineAudioContext, as fast as the machine goes, for tests and the bench.
import type { AnalysisSnapshot } from '../../core/analysis/analyzer';
import { ENGINE_RATE } from './engine';
import { bufferOf } from './sources';
import {
  DEFAULT_CHANNEL_A,
  DEFAULT_CHANNEL_B,
  PROCESSOR_NAME,
  type FromWorklet,
  type MonitorChoice,
  type WorkletStartOptions,
} from './worklet/messages';

export interface OfflineResult {
  analysis: AnalysisSnapshot;
  frames: number;
  input: Float32Array;
  outA: Float32Array;
  outB: Float32Array;
  /** Rendered seconds per wall-clock second. */
  realTimeFactor: number;
  /** Whether the howl watch (run when options.live) ever fired. */
  howlEver: boolean;
}

/**
 * The same graph offline: the samples through the channel worklet in an
 * OfflineAudioContext, as fast as the machine goes. The figures are the worklet's
 * own, taken after exactly samples.length frames.
 */
export async function renderOffline(
  workletUrl: string,
  samples: Float32Array,
  channels: { a: string; b: string } = { a: DEFAULT_CHANNEL_A, b: DEFAULT_CHANNEL_B },
  options: { record?: boolean; monitor?: MonitorChoice; worklet?: boolean; live?: boolean } = {},
): Promise<OfflineResult> {
  const n = Math.max(1, samples.length);
  const ctx = new OfflineAudioContext(1, n, ENGINE_RATE);
  const src = new AudioBufferSourceNode(ctx, { buffer: bufferOf(ctx, samples) });
  let final: Promise<Extract<FromWorklet, { type: 'final' }>> | null = null;
  if (options.worklet === false) {
    src.connect(new GainNode(ctx)).connect(ctx.destination);
  } else {
    await ctx.audioWorklet.addModule(workletUrl);
    const node = new AudioWorkletNode(ctx, PROCESSOR_NAME, {
      numberOfInputs: 1,
      numberOfOutputs: 1,
      outputChannelCount: [1],
      processorOptions: {
        a: channels.a,
        b: channels.b,
        muted: false,
        monitor: options.monitor ?? 'a',
        finishAtFrame: samples.length,
        live: options.live === true,
        recordSeconds: options.record === false ? 0 : (samples.length + 128) / ENGINE_RATE,
      } satisfies WorkletStartOptions,
    });
    final = new Promise((resolve) => {
      node.port.onmessage = (e: MessageEvent<FromWorklet>) => {
        if (e.data.type === 'final') resolve(e.data);
      };
    });
    src.connect(node).connect(ctx.destination);
  }
  src.start();
  const started = performance.now();
  await ctx.startRendering();
  const f = final ? await final : null;
  const wall = (performance.now() - started) / 1000;
  const empty = new Float32Array(0);
  return {
    analysis: f ? f.analysis : (null as unknown as AnalysisSnapshot),
    frames: f ? f.frames : samples.length,
    input: f ? f.input : empty,
    outA: f ? f.outA : empty,
    outB: f ? f.outB : empty,
    realTimeFactor: samples.length / ENGINE_RATE / Math.max(wall, 1e-6),
    howlEver: f ? f.howlEver : false,
  };
}
