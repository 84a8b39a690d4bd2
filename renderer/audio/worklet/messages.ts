// The worklet's message protocol. Messages are rare (control changes), never per block.

export const PROCESSOR_NAME = 'quantiscope-channel';

/** 'channel' carries the channel text form, which core parses inside the worklet. */
export type ToWorklet = { type: 'channel'; text: string } | { type: 'mute'; muted: boolean };

export type FromWorklet =
  | { type: 'channel'; canonical: string }
  | { type: 'muted'; muted: boolean }
  | { type: 'running'; sampleRate: number }
  | { type: 'error'; message: string };

/** processorOptions of the node. Output stays muted unless `muted` is explicitly false. */
export interface WorkletStartOptions {
  channel?: string;
  muted?: boolean;
}
