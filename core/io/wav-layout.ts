// What a WAV (or headerless G.711) file holds, once its header has been read.

/** Sample encodings the readers decode; 'float' is IEEE 754. */
export type SampleEncoding = 'pcm' | 'float' | 'mulaw' | 'alaw';

/** Format tags of the fmt chunk (Microsoft RIFF / mmreg.h registrations, from memory). */
export const WAVE_FORMAT_PCM = 0x0001;
export const WAVE_FORMAT_IEEE_FLOAT = 0x0003;
export const WAVE_FORMAT_ALAW = 0x0006;
export const WAVE_FORMAT_MULAW = 0x0007;
export const WAVE_FORMAT_EXTENSIBLE = 0xfffe;

/** Sample rates accepted on input: the voice band at its narrowest to studio rates. */
export const MIN_SAMPLE_RATE = 8000;
export const MAX_SAMPLE_RATE = 192000;

/** Headerless G.711 files carry no rate; 8 kHz is the rate G.711 is defined at. */
export const RAW_G711_RATE = 8000;

/** How the samples of one frame are laid out; enough to decode them. */
export interface SampleLayout {
  encoding: SampleEncoding;
  /** Container size per sample: 8, 16, 24, 32 or 64 bits. */
  bitsPerSample: number;
  channels: number;
}

export interface AudioLayout extends SampleLayout {
  container: 'wav' | 'raw';
  /** The fmt chunk's tag as found (0xFFFE for extensible); 0 for raw files. */
  formatTag: number;
  /** Significant bits (WAVE_FORMAT_EXTENSIBLE may hold fewer than the container). */
  validBitsPerSample: number;
  sampleRate: number;
  /** Bytes per frame (all channels). */
  blockAlign: number;
  /** Byte offset of the first sample in the file. */
  dataOffset: number;
  dataBytes: number;
  frames: number;
}

/** Bytes per sample of a layout's container. */
export const bytesPerSample = (layout: SampleLayout): number => layout.bitsPerSample >> 3;
