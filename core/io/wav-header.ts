// Reading a WAV header: the RIFF chunk walk and the fmt chunk, after the
// Microsoft/IBM RIFF specification (Multimedia Programming Interface and Data
// Specifications 1.0, 1991) and the WAVE_FORMAT_EXTENSIBLE addendum, from memory.
//
// The walk is a generator that asks for byte ranges, so one parser serves an
// in-memory buffer (parseWavBytes) and a file read piece by piece
// (main/cli/audio-file.ts) without loading the body.
//
// Policies (each refusal is a WavFormatError that says what is wrong):
// - The RIFF size is not trusted beyond "at least 4": writers often get it wrong
//   and nothing depends on it. The data chunk's size is trusted: a data chunk that
//   runs past the end of the file is refused (a truncated copy, or a writer that
//   never patched its header), rather than analysing a part the header disowns.
// - A data size that is not a whole number of frames is refused.
// - nAvgBytesPerSec is ignored (derived, and wrong in some files); nBlockAlign
//   must match channels x container bytes, since the sample layout hangs on it.
// - fmt must come before data (the specification's order); the first fmt and the
//   first data chunk count. Any other chunk (fact, LIST, cue, junk...) is skipped,
//   honouring the pad byte after an odd-sized chunk.

import { WavFormatError } from './wav-errors';
import {
  MAX_SAMPLE_RATE,
  MIN_SAMPLE_RATE,
  WAVE_FORMAT_ALAW,
  WAVE_FORMAT_EXTENSIBLE,
  WAVE_FORMAT_IEEE_FLOAT,
  WAVE_FORMAT_MULAW,
  WAVE_FORMAT_PCM,
  type AudioLayout,
  type SampleEncoding,
} from './wav-layout';

/** A byte range the parser needs; the driver answers with exactly those bytes. */
export interface ByteRequest {
  offset: number;
  length: number;
}

export type WavHeaderSteps = Generator<ByteRequest, AudioLayout, Uint8Array>;

/** Names for tags people meet, so a refusal says what the file is (mmreg.h, from memory). */
const KNOWN_TAGS: Record<number, string> = {
  0x0000: 'unknown format',
  0x0002: 'Microsoft ADPCM',
  0x0011: 'IMA ADPCM',
  0x0031: 'GSM 6.10',
  0x0050: 'MPEG audio',
  0x0055: 'MPEG Layer III',
};

/** Bytes 4..15 shared by every KSDATAFORMAT_SUBTYPE GUID built on a format tag (from memory). */
const GUID_TAIL = [0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xaa, 0x00, 0x38, 0x9b, 0x71];

const u16 = (b: Uint8Array, i: number): number => b[i] | (b[i + 1] << 8);
const u32 = (b: Uint8Array, i: number): number =>
  (b[i] | (b[i + 1] << 8) | (b[i + 2] << 16) | (b[i + 3] << 24)) >>> 0;
const hex = (n: number, digits: number): string => '0x' + n.toString(16).toUpperCase().padStart(digits, '0');

/** A four-character code as text, with unprintable bytes escaped. */
export function fourCC(b: Uint8Array, i: number): string {
  let s = '';
  for (let k = i; k < i + 4 && k < b.length; k++) {
    const c = b[k];
    s += c >= 0x20 && c < 0x7f ? String.fromCharCode(c) : `\\x${c.toString(16).padStart(2, '0')}`;
  }
  return s;
}

function guidText(b: Uint8Array, i: number): string {
  const h = (k: number) => b[i + k].toString(16).padStart(2, '0');
  const le = (...ks: number[]) => ks.map(h).join('');
  return `${le(3, 2, 1, 0)}-${le(5, 4)}-${le(7, 6)}-${le(8, 9)}-${le(10, 11, 12, 13, 14, 15)}`;
}

interface FmtFields {
  formatTag: number;
  encoding: SampleEncoding;
  channels: number;
  sampleRate: number;
  blockAlign: number;
  bitsPerSample: number;
  validBitsPerSample: number;
}

function encodingOfTag(tag: number): SampleEncoding | null {
  switch (tag) {
    case WAVE_FORMAT_PCM:
      return 'pcm';
    case WAVE_FORMAT_IEEE_FLOAT:
      return 'float';
    case WAVE_FORMAT_MULAW:
      return 'mulaw';
    case WAVE_FORMAT_ALAW:
      return 'alaw';
    default:
      return null;
  }
}

/** Reads and checks a fmt chunk body of `size` bytes (b holds at least min(size, 40)). */
function parseFmt(b: Uint8Array, size: number): FmtFields {
  if (size < 16) throw new WavFormatError(`fmt chunk is ${size} bytes, shorter than the 16 of a WAVEFORMAT`);
  const formatTag = u16(b, 0);
  const channels = u16(b, 2);
  const sampleRate = u32(b, 4);
  const blockAlign = u16(b, 12);
  const bitsPerSample = u16(b, 14);
  let tag = formatTag;
  let validBitsPerSample = bitsPerSample;
  if (formatTag === WAVE_FORMAT_EXTENSIBLE) {
    if (size < 40) {
      throw new WavFormatError(`WAVE_FORMAT_EXTENSIBLE fmt chunk is ${size} bytes, it needs 40`);
    }
    const valid = u16(b, 18);
    const data1 = u32(b, 24);
    const tailMatches = GUID_TAIL.every((v, k) => b[28 + k] === v);
    if (!tailMatches || data1 > 0xffff || encodingOfTag(data1) === null) {
      throw new WavFormatError(
        `unsupported WAVE_FORMAT_EXTENSIBLE sub-format {${guidText(b, 24)}} ` +
          '(supported: PCM, IEEE float, mu-law, A-law)',
      );
    }
    tag = data1;
    if (valid > bitsPerSample) {
      throw new WavFormatError(`${valid} valid bits do not fit a ${bitsPerSample}-bit sample container`);
    }
    if (valid !== 0) validBitsPerSample = valid;
  }
  const encoding = encodingOfTag(tag);
  if (encoding === null) {
    const name = KNOWN_TAGS[tag];
    throw new WavFormatError(
      `unsupported format tag ${hex(tag, 4)}${name ? ` (${name})` : ''}; ` +
        'supported: PCM (1), IEEE float (3), A-law (6), mu-law (7), extensible (0xFFFE)',
    );
  }
  if (channels === 0) throw new WavFormatError('fmt chunk declares zero channels');
  if (sampleRate < MIN_SAMPLE_RATE || sampleRate > MAX_SAMPLE_RATE) {
    throw new WavFormatError(
      `sample rate ${sampleRate} Hz is outside the supported ${MIN_SAMPLE_RATE}..${MAX_SAMPLE_RATE} Hz`,
    );
  }
  const allowed = encoding === 'pcm' ? [8, 16, 24, 32] : encoding === 'float' ? [32, 64] : [8];
  if (!allowed.includes(bitsPerSample)) {
    const what = { pcm: 'PCM', float: 'IEEE float', mulaw: 'mu-law', alaw: 'A-law' }[encoding];
    throw new WavFormatError(
      `unsupported bit depth ${bitsPerSample} for ${what} (supported: ${allowed.join(', ')})`,
    );
  }
  const expected = channels * (bitsPerSample >> 3);
  if (blockAlign !== expected) {
    throw new WavFormatError(
      `block align ${blockAlign} does not match ${channels} channel(s) of ${bitsPerSample} bits ` +
        `(expected ${expected})`,
    );
  }
  return { formatTag, encoding, channels, sampleRate, blockAlign, bitsPerSample, validBitsPerSample };
}

/** The first 12 bytes: RIFF, size, WAVE. */
function checkRiffHeader(b: Uint8Array, fileSize: number): void {
  const id = fourCC(b, 0);
  if (fileSize < 12 && 'RIFF'.startsWith(id)) {
    throw new WavFormatError(`is truncated: ${fileSize} bytes, too short for a RIFF header`);
  }
  if (id === 'RF64') throw new WavFormatError('is an RF64 file (64-bit sizes), which is not supported');
  if (id === 'RIFX') throw new WavFormatError('is a big-endian RIFX file, which is not supported');
  if (id !== 'RIFF') throw new WavFormatError(`is not a RIFF/WAVE file (it starts with "${id}")`);
  if (fileSize < 12) throw new WavFormatError(`is truncated: ${fileSize} bytes, too short for a RIFF header`);
  const form = fourCC(b, 8);
  if (form !== 'WAVE') throw new WavFormatError(`is a RIFF file of form "${form}", not WAVE`);
  const riffSize = u32(b, 4);
  if (riffSize < 4) throw new WavFormatError(`RIFF size ${riffSize} is too small to hold the WAVE form`);
}

/**
 * Walks the chunks of a file of `fileSize` bytes up to its data chunk and
 * returns the layout; throws WavFormatError on anything it cannot read.
 * Every request lies inside the file, and each step moves forward by at least
 * 8 bytes, so a hostile header cannot make it loop.
 */
export function* wavHeaderSteps(fileSize: number): WavHeaderSteps {
  if (fileSize === 0) throw new WavFormatError('is empty (0 bytes)');
  const head = yield { offset: 0, length: Math.min(12, fileSize) };
  checkRiffHeader(head, fileSize);
  let fmt: FmtFields | null = null;
  let pos = 12;
  for (;;) {
    if (pos + 8 > fileSize) {
      if (pos < fileSize) throw new WavFormatError(`is truncated inside a chunk header at offset ${pos}`);
      throw new WavFormatError(fmt === null ? 'has no fmt chunk' : 'has no data chunk');
    }
    const ch = yield { offset: pos, length: 8 };
    const id = fourCC(ch, 0);
    const size = u32(ch, 4);
    const bodyStart = pos + 8;
    const available = fileSize - bodyStart;
    if (id === 'fmt ' && fmt === null) {
      if (size > available) {
        throw new WavFormatError(
          `fmt chunk declares ${size} bytes but only ${available} follow in the file (truncated)`,
        );
      }
      const body = yield { offset: bodyStart, length: Math.min(size, 40) };
      fmt = parseFmt(body, size);
    } else if (id === 'data') {
      if (fmt === null) throw new WavFormatError('data chunk comes before any fmt chunk');
      if (size > available) {
        throw new WavFormatError(
          `data chunk declares ${size} bytes but only ${available} follow in the file ` +
            '(truncated, or a wrong size in the header)',
        );
      }
      if (size % fmt.blockAlign !== 0) {
        throw new WavFormatError(
          `data chunk size ${size} is not a whole number of ${fmt.blockAlign}-byte frames`,
        );
      }
      const frames = size / fmt.blockAlign;
      if (frames === 0) throw new WavFormatError('contains no samples');
      return {
        container: 'wav',
        formatTag: fmt.formatTag,
        encoding: fmt.encoding,
        bitsPerSample: fmt.bitsPerSample,
        validBitsPerSample: fmt.validBitsPerSample,
        channels: fmt.channels,
        sampleRate: fmt.sampleRate,
        blockAlign: fmt.blockAlign,
        dataOffset: bodyStart,
        dataBytes: size,
        frames,
      };
    } else if (size > available) {
      throw new WavFormatError(
        `chunk "${id}" at offset ${pos} declares ${size} bytes, past the end of the file ` +
          `(${available} follow)`,
      );
    }
    pos = bodyStart + size + (size & 1);
  }
}

/** Runs the header walk over bytes in memory. */
export function parseWavBytes(bytes: Uint8Array): AudioLayout {
  const steps = wavHeaderSteps(bytes.length);
  let step = steps.next();
  while (!step.done) {
    const { offset, length } = step.value;
    step = steps.next(bytes.subarray(offset, offset + length));
  }
  return step.value;
}
