// What a channel costs on the line.
import type { ChannelSpec, StageSpec } from './types';

export function stageBits(stage: StageSpec): number {
  switch (stage.law) {
    case 'g711-mu':
    case 'g711-a':
      return 8;
    case 'table':
      return Math.ceil(Math.log2(stage.outputs.length));
    default:
      return stage.bits;
  }
}

/** Bits per second on the line for the last stage, or null when the rate is the input's own. */
export function channelBitRate(spec: ChannelSpec, nativeRate?: number): number | null {
  const rate = spec.rate === 'native' ? nativeRate : spec.rate;
  if (rate === undefined) return null;
  return stageBits(spec.stages[spec.stages.length - 1]) * rate;
}
