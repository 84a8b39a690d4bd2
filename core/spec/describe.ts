// The figures that describe a channel, for the page, the command line and reports alike.
import { createQuantizer, segmentEdgesDbov } from '../quantizers/index';
import { PCM16_SCALE } from '../units/levels';
import { channelBitRate } from './bits';
import { formatChannel } from './format';
import { parseChannel } from './parse';
import { CHANNEL_PRESETS } from './presets';
import type { ChannelSpec } from './types';

export interface ChannelFigures {
  canonical: string;
  /** Preset title when the channel is a preset, else its canonical text. */
  title: string;
  stages: string[];
  bits: number;
  rateHz: number | null;
  bitRate: number | null;
  /** Overload point of the first stage: float scale and 16-bit PCM units. */
  overloadPoint: number;
  overloadPcm16: number;
  loadCapacityDbm0: number;
  segmentCount: number;
  /** Segment edges in dBov; the first, at zero amplitude, is -Infinity and given as null. */
  segmentEdgesDbov: (number | null)[];
}

export function channelFigures(channel: string | ChannelSpec): ChannelFigures {
  const spec = typeof channel === 'string' ? parseChannel(channel) : channel;
  const quantizers = spec.stages.map((s) => createQuantizer(s));
  const first = quantizers[0];
  const last = quantizers[quantizers.length - 1];
  const canonical = formatChannel(spec);
  return {
    canonical,
    title: CHANNEL_PRESETS.find((p) => p.text === canonical)?.title ?? canonical,
    stages: quantizers.map((q) => q.label),
    bits: last.bits,
    rateHz: spec.rate === 'native' ? null : spec.rate,
    bitRate: channelBitRate(spec),
    overloadPoint: first.overloadPoint,
    overloadPcm16: first.overloadPoint * PCM16_SCALE,
    loadCapacityDbm0: first.loadCapacityDbm0,
    segmentCount: first.segmentCount,
    segmentEdgesDbov: Array.from(segmentEdgesDbov(first), (v) => (Number.isFinite(v) ? v : null)),
  };
}
