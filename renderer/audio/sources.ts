// The engine's sources other than the microphone, as sample arrays at the context
// rate: the demo talker, the calibrated test signals and decoded files.
import { renderDemoTalker } from '../../core/signals/demo-talker';
import { renderLevelSweep, renderTestNoise, renderTestTone } from '../../core/signals/test-signals';
import { channelFigures } from '../../core/spec/describe';
import { fault, type EngineFault } from './faults';

export type SourceKind = 'demo' | 'microphone' | 'file' | 'tone' | 'noise' | 'sweep';
export const SOURCE_KINDS: readonly SourceKind[] = ['demo', 'microphone', 'file', 'tone', 'noise', 'sweep'];

export interface TestSignalSettings {
  /** Level of the tone or noise (and the top of the sweep), dBm0 at channel A's quantizer. */
  dbm0: number;
  frequencyHz: number;
}

/** Common test levels: -10 dBm0 tone at 1020 Hz (G.712 practice, from memory). */
export const DEFAULT_TEST_SIGNAL: TestSignalSettings = { dbm0: -10, frequencyHz: 1020 };
export const DEMO_SECONDS = 20;
export const DEMO_SEED = 1;

/** Renders a built-in source; levels refer to channel A's quantizer, so dBm0 reads true on A. */
export function renderBuiltIn(
  kind: 'demo' | 'tone' | 'noise' | 'sweep',
  rate: number,
  channelA: string,
  settings: TestSignalSettings,
): Float32Array {
  if (kind === 'demo') return renderDemoTalker(rate, DEMO_SECONDS, DEMO_SEED);
  const f = channelFigures(channelA);
  const ref = { overloadPoint: f.overloadPoint, loadCapacityDbm0: f.loadCapacityDbm0 };
  // Whole seconds at whole-number frequencies loop without a seam.
  if (kind === 'tone')
    return renderTestTone({
      ...ref,
      dbm0: settings.dbm0,
      frequencyHz: Math.round(settings.frequencyHz),
      rate,
      seconds: 1,
    });
  if (kind === 'noise') return renderTestNoise({ ...ref, dbm0: settings.dbm0, rate, seconds: 4, seed: 1 });
  return renderLevelSweep({
    ...ref,
    fromDbm0: settings.dbm0 - 50,
    toDbm0: settings.dbm0,
    stepDb: 5,
    stepSeconds: 0.5,
    frequencyHz: Math.round(settings.frequencyHz),
    rate,
  });
}

/** The length of a WAV file's data chunk, or null when the bytes are not RIFF/WAVE (RIFF layout, Microsoft 1991). */
export function wavDataBytes(bytes: ArrayBuffer): number | null {
  const v = new DataView(bytes);
  const tag = (at: number) =>
    at + 4 <= v.byteLength
      ? String.fromCharCode(v.getUint8(at), v.getUint8(at + 1), v.getUint8(at + 2), v.getUint8(at + 3))
      : '';
  if (tag(0) !== 'RIFF' || tag(8) !== 'WAVE') return null;
  let at = 12;
  while (at + 8 <= v.byteLength) {
    const size = v.getUint32(at + 4, true);
    if (tag(at) === 'data') return Math.min(size, v.byteLength - at - 8);
    at += 8 + size + (size & 1);
  }
  return 0;
}

export type Decoded = { ok: true; buffer: AudioBuffer } | { ok: false; fault: EngineFault };

/** Decodes a file at the context's rate (the browser resamples any rate it reads). */
export async function decodeFile(ctx: BaseAudioContext, bytes: ArrayBuffer, name: string): Promise<Decoded> {
  if (bytes.byteLength === 0 || wavDataBytes(bytes) === 0)
    return { ok: false, fault: fault('file-empty', name) };
  try {
    // decodeAudioData detaches its argument: keep ours intact for a retry.
    const buffer = await ctx.decodeAudioData(bytes.slice(0));
    if (buffer.length === 0) return { ok: false, fault: fault('file-empty', name) };
    return { ok: true, buffer };
  } catch (err) {
    return {
      ok: false,
      fault: fault('file-undecodable', `${name}: ${err instanceof Error ? err.message : String(err)}`),
    };
  }
}

/** A mono AudioBuffer of samples at the context's rate. */
export function bufferOf(ctx: BaseAudioContext, samples: Float32Array): AudioBuffer {
  const buffer = ctx.createBuffer(1, Math.max(1, samples.length), ctx.sampleRate);
  buffer.getChannelData(0).set(samples);
  return buffer;
}
