// Audio file formats: WAV header parsing, sample decoding, WAV writing (pure; the
// file system side is main/cli/audio-file.ts).
export * from './wav-layout';
export * from './wav-errors';
export { fourCC, parseWavBytes, wavHeaderSteps, type ByteRequest, type WavHeaderSteps } from './wav-header';
export { decodeChannel } from './wav-samples';
export { rawG711Layout, type RawLaw } from './raw';
export {
  MAX_WAV_DATA_BYTES,
  pcm16Bytes,
  wavFileBytes,
  wavHeader,
  wavHeaderLength,
  wavPadLength,
  type WavOutputEncoding,
} from './wav-write';
