// The WAV writer against the RIFF layout built by hand (test/core/wav-riff.ts,
// RIFF specification from memory), and round trips through the reader.
import { describe, expect, it } from 'vitest';
import {
  decodeChannel,
  parseWavBytes,
  pcm16Bytes,
  wavFileBytes,
  wavHeader,
  wavPadLength,
  WavFormatError,
} from '../../core/io/index';
import { A_REF, MU_REF } from './g711-reference';
import { chunk, fmt, le16, le32, riff } from './wav-riff';

const readAll = (file: Uint8Array) => {
  const layout = parseWavBytes(file);
  const out = new Float64Array(layout.frames);
  expect(decodeChannel(file, layout.dataOffset, layout.frames, layout, 0, out, 0)).toBe(-1);
  return { layout, out };
};

describe('files as the RIFF specification lays them out', () => {
  it('16-bit PCM: a plain PCM WAVE, 44-byte header', () => {
    const samples = Int16Array.from([0, 1, -1, 32767, -32768]);
    const expected = riff([
      fmt({ tag: 1, channels: 1, rate: 16000, bits: 16 }),
      chunk(
        'data',
        [...samples].flatMap((s) => le16(s & 0xffff)),
      ),
    ]);
    expect([...wavFileBytes('pcm16', 16000, samples)]).toEqual([...expected]);
  });

  it('G.711: format tag 7 / 6, cbSize 0, a fact chunk with the sample count, 8000 Hz', () => {
    // Non-PCM formats carry cbSize and a fact chunk (RIFF specification 1991 and its 1994 update, from memory).
    for (const [encoding, tag] of [
      ['mulaw', 7],
      ['alaw', 6],
    ] as const) {
      for (const n of [4, 5]) {
        const codes = Uint8Array.from({ length: n }, (_, i) => (i * 37) & 0xff);
        const expected = riff([
          fmt({ tag, channels: 1, rate: 8000, bits: 8, extra: le16(0) }),
          chunk('fact', le32(n)),
          chunk('data', [...codes]),
        ]);
        const file = wavFileBytes(encoding, 8000, codes);
        expect([...file]).toEqual([...expected]);
        // An odd data chunk ends in one pad byte, counted in the RIFF size (RIFF spec, from memory).
        expect(file.length).toBe(58 + n + (n % 2));
        expect(wavPadLength(encoding, n)).toBe(n % 2);
      }
    }
  });

  it('refuses G.711 at another rate, rates out of range and mismatched bodies', () => {
    expect(() => wavHeader('mulaw', 16000, 1)).toThrow(/G.711 is written at 8000 Hz, not 16000 Hz/);
    expect(() => wavHeader('pcm16', 4000, 1)).toThrow(WavFormatError);
    expect(() => wavFileBytes('pcm16', 8000, new Uint8Array(2))).toThrow(/Int16Array/);
    expect(() => wavFileBytes('alaw', 8000, new Int16Array(2))).toThrow(/Uint8Array codes/);
    expect(() => wavHeader('pcm16', 8000, 2 ** 31)).toThrow(/do not fit a WAV file/);
  });
});

describe('round trips through the reader', () => {
  it('16-bit PCM: every int16 value comes back as n / 32768', () => {
    const all = Int16Array.from({ length: 65536 }, (_, i) => i - 32768);
    const { layout, out } = readAll(wavFileBytes('pcm16', 48000, all));
    expect(layout).toMatchObject({ encoding: 'pcm', bitsPerSample: 16, sampleRate: 48000, frames: 65536 });
    // DEVELOPERS.md scale, 32768 (common practice, no source).
    for (let i = 0; i < all.length; i++) if (out[i] * 32768 !== all[i]) expect(out[i] * 32768).toBe(all[i]);
  });

  it('G.711: every code comes back and decodes to the G.711 tables', () => {
    const codes = Uint8Array.from({ length: 257 }, (_, i) => i & 0xff);
    for (const [encoding, ref] of [
      ['mulaw', MU_REF],
      ['alaw', A_REF],
    ] as const) {
      const file = wavFileBytes(encoding, 8000, codes);
      const { layout, out } = readAll(file);
      expect(layout).toMatchObject({ encoding, formatTag: encoding === 'mulaw' ? 7 : 6, frames: 257 });
      expect([...file.subarray(layout.dataOffset, layout.dataOffset + 257)]).toEqual([...codes]);
      // ITU-T G.711 Tables 2 / 1 via test/core/g711-reference.ts (from memory).
      expect([...out].map((v) => v * 32768)).toEqual([...codes].map((c) => ref.decoded[c]));
    }
  });

  it("pcm16Bytes is little-endian two's complement", () => {
    expect([...pcm16Bytes(Int16Array.from([0x1234, -2]))]).toEqual([0x34, 0x12, 0xfe, 0xff]);
  });
});
