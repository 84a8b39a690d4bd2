export * from './types';
export { ChannelSpecError } from './errors';
export { parseChannel, parseStage, parseRate, CHANNEL_SYNTAX } from './parse';
export { formatChannel, formatStage, formatRate } from './format';
export { stageBits, channelBitRate } from './bits';
export { CHANNEL_PRESETS, type ChannelPreset } from './presets';
export { channelFigures, type ChannelFigures } from './describe';
