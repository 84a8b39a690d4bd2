export * from './types';
export { ChannelSpecError } from './errors';
export { parseChannel, parseStage, parseRate, CHANNEL_SYNTAX, type ParseOptions } from './parse';
export {
  formatChannel,
  formatStage,
  formatRate,
  shortChannel,
  fullChannel,
  type FormatOptions,
} from './format';
export {
  TABLE_NAME,
  bitsOfLevels,
  storedAs,
  storedTable,
  tableLookup,
  type StoredLevels,
  type StoredTable,
  type TableLookup,
} from './tables';
export {
  TABLE_FILE_FORMAT,
  TABLE_FILE_VERSION,
  TableFileError,
  parseTableFile,
  tableFileText,
} from './table-file';
export { stageBits, channelBitRate } from './bits';
export { CHANNEL_PRESETS, type ChannelPreset } from './presets';
export { channelFigures, type ChannelFigures } from './describe';
