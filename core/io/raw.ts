// Headerless G.711 files: one 8-bit line character per sample, mono, 8 kHz.

import { WavFormatError } from './wav-errors';
import { RAW_G711_RATE, type AudioLayout } from './wav-layout';

export type RawLaw = 'mu' | 'a';

export function rawG711Layout(fileSize: number, law: RawLaw): AudioLayout {
  if (fileSize === 0) throw new WavFormatError('contains no samples (0 bytes)');
  return {
    container: 'raw',
    formatTag: 0,
    encoding: law === 'mu' ? 'mulaw' : 'alaw',
    bitsPerSample: 8,
    validBitsPerSample: 8,
    channels: 1,
    sampleRate: RAW_G711_RATE,
    blockAlign: 1,
    dataOffset: 0,
    dataBytes: fileSize,
    frames: fileSize,
  };
}
