// Writing WAV files: 16-bit PCM as a plain PCM WAVE, G.711 in the RIFF form
// for non-PCM formats: a WAVEFORMATEX fmt chunk (18 bytes, cbSize 0) and a
// fact chunk with the sample count before the data (Microsoft RIFF
// specification and its 1994 update, from memory). Mono only: the command
// line writes one channel.

import { WavFormatError } from './wav-errors';
import {
  MAX_SAMPLE_RATE,
  MIN_SAMPLE_RATE,
  RAW_G711_RATE,
  WAVE_FORMAT_ALAW,
  WAVE_FORMAT_MULAW,
  WAVE_FORMAT_PCM,
} from './wav-layout';

export type WavOutputEncoding = 'pcm16' | 'mulaw' | 'alaw';

/** The largest data chunk whose RIFF size still fits 32 bits, with room for the header. */
export const MAX_WAV_DATA_BYTES = 0xffffffff - 64;

/** Bytes before the first sample: 44 for PCM, 58 for G.711 (fmt 18 + fact 12). */
export function wavHeaderLength(encoding: WavOutputEncoding): number {
  return encoding === 'pcm16' ? 44 : 58;
}

function putId(view: DataView, at: number, id: string): void {
  for (let i = 0; i < 4; i++) view.setUint8(at + i, id.charCodeAt(i));
}

/**
 * The header of a mono file of `frames` samples. A data chunk of odd length
 * (G.711, odd count) needs one pad byte after it, counted in the RIFF size;
 * the caller writes that byte (see wavPadLength).
 */
export function wavHeader(encoding: WavOutputEncoding, sampleRate: number, frames: number): Uint8Array {
  if (!Number.isInteger(sampleRate) || sampleRate < MIN_SAMPLE_RATE || sampleRate > MAX_SAMPLE_RATE) {
    throw new WavFormatError(`cannot write a sample rate of ${sampleRate} Hz`);
  }
  if (encoding !== 'pcm16' && sampleRate !== RAW_G711_RATE) {
    throw new WavFormatError(`G.711 is written at ${RAW_G711_RATE} Hz, not ${sampleRate} Hz`);
  }
  const width = encoding === 'pcm16' ? 2 : 1;
  const dataBytes = frames * width;
  if (!Number.isInteger(frames) || frames < 0 || dataBytes > MAX_WAV_DATA_BYTES) {
    throw new WavFormatError(`${frames} samples do not fit a WAV file (4 GiB at most)`);
  }
  const header = new Uint8Array(wavHeaderLength(encoding));
  const v = new DataView(header.buffer);
  const pad = dataBytes & 1;
  putId(v, 0, 'RIFF');
  v.setUint32(4, header.length - 8 + dataBytes + pad, true);
  putId(v, 8, 'WAVE');
  putId(v, 12, 'fmt ');
  const fmtSize = encoding === 'pcm16' ? 16 : 18;
  v.setUint32(16, fmtSize, true);
  const tag =
    encoding === 'pcm16' ? WAVE_FORMAT_PCM : encoding === 'mulaw' ? WAVE_FORMAT_MULAW : WAVE_FORMAT_ALAW;
  v.setUint16(20, tag, true);
  v.setUint16(22, 1, true); // channels
  v.setUint32(24, sampleRate, true);
  v.setUint32(28, sampleRate * width, true); // bytes per second
  v.setUint16(32, width, true); // block align
  v.setUint16(34, width * 8, true); // bits per sample
  let at = 36;
  if (fmtSize === 18) {
    v.setUint16(36, 0, true); // cbSize: no extra format bytes
    putId(v, 38, 'fact');
    v.setUint32(42, 4, true);
    v.setUint32(46, frames, true);
    at = 50;
  }
  putId(v, at, 'data');
  v.setUint32(at + 4, dataBytes, true);
  return header;
}

/** Pad bytes after the data chunk (RIFF word alignment). */
export const wavPadLength = (encoding: WavOutputEncoding, frames: number): number =>
  encoding === 'pcm16' ? 0 : frames & 1;

/** Little-endian bytes of 16-bit samples. */
export function pcm16Bytes(
  samples: Int16Array,
  out: Uint8Array = new Uint8Array(samples.length * 2),
): Uint8Array {
  const n = samples.length;
  for (let i = 0, p = 0; i < n; i++, p += 2) {
    const s = samples[i];
    out[p] = s & 0xff;
    out[p + 1] = (s >> 8) & 0xff;
  }
  return out;
}

/** A whole mono WAV file in memory. */
export function wavFileBytes(
  encoding: WavOutputEncoding,
  sampleRate: number,
  body: Int16Array | Uint8Array,
): Uint8Array {
  if ((encoding === 'pcm16') !== body instanceof Int16Array) {
    throw new WavFormatError(
      encoding === 'pcm16'
        ? '16-bit PCM is written from Int16Array samples'
        : 'G.711 is written from Uint8Array codes',
    );
  }
  const frames = body.length;
  const header = wavHeader(encoding, sampleRate, frames);
  const data = body instanceof Int16Array ? pcm16Bytes(body) : body;
  const file = new Uint8Array(header.length + data.length + wavPadLength(encoding, frames));
  file.set(header, 0);
  file.set(data, header.length);
  return file;
}
