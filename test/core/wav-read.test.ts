// Reading WAV files built byte by byte (test/core/wav-riff.ts, after the RIFF
// specification, from memory) with core/io: every supported format, the chunk
// walk, and each refusal.
import { describe, expect, it } from 'vitest';
import { decodeChannel, parseWavBytes, WavFormatError, type AudioLayout } from '../../core/io/index';
import { A_REF, MU_REF } from './g711-reference';
import {
  ascii,
  chunk,
  extensibleFmt,
  f32,
  f64,
  fmt,
  le16,
  le24,
  le32,
  riff,
  subFormatGuid,
} from './wav-riff';

function samplesOf(file: Uint8Array, channel = 0): { layout: AudioLayout; x: number[] } {
  const layout = parseWavBytes(file);
  const out = new Float64Array(layout.frames);
  const bad = decodeChannel(file, layout.dataOffset, layout.frames, layout, channel, out, 0);
  expect(bad).toBe(-1);
  return { layout, x: [...out] };
}

const refusal = (file: Uint8Array): string => {
  try {
    parseWavBytes(file);
  } catch (err) {
    expect(err).toBeInstanceOf(WavFormatError);
    return (err as Error).message;
  }
  throw new Error('the file was read, not refused');
};

describe('WAV formats, decoded to the int16 n / 32768 scale', () => {
  it('8-bit PCM is unsigned with 128 as zero', () => {
    // RIFF specification: 8-bit samples are unsigned, 0x80 the midpoint (from memory).
    const file = riff([
      fmt({ tag: 1, channels: 1, rate: 8000, bits: 8 }),
      chunk('data', [0x00, 0x80, 0xff, 0x40]),
    ]);
    const { layout, x } = samplesOf(file);
    expect(layout).toMatchObject({
      encoding: 'pcm',
      bitsPerSample: 8,
      channels: 1,
      sampleRate: 8000,
      frames: 4,
    });
    // (b - 128) / 128: arithmetic on the 16-bit scale, 8-bit value b-128 shifted left by 8.
    expect(x).toEqual([-1, 0, 127 / 128, -0.5]);
  });

  it("16-bit PCM is signed two's complement", () => {
    const data = [...le16(0x8000), ...le16(0x7fff), ...le16(1), ...le16(0xffff), ...le16(0)];
    const { layout, x } = samplesOf(
      riff([fmt({ tag: 1, channels: 1, rate: 16000, bits: 16 }), chunk('data', data)]),
    );
    expect(layout.frames).toBe(5);
    // n / 32768 (DEVELOPERS.md scale; common practice, no source).
    expect(x).toEqual([-1, 32767 / 32768, 1 / 32768, -1 / 32768, 0]);
  });

  it('24-bit PCM: three bytes, full scale 2^23', () => {
    const data = [...le24(0x800000), ...le24(0x7fffff), ...le24(0x000100), ...le24(0xffffff)];
    const { layout, x } = samplesOf(
      riff([fmt({ tag: 1, channels: 1, rate: 48000, bits: 24 }), chunk('data', data)]),
    );
    expect(layout.blockAlign).toBe(3);
    // A 24-bit value v reads v / 2^23, so 256 (= int16 1 shifted by 8) reads 1/32768 (arithmetic).
    expect(x).toEqual([-1, 0x7fffff / 0x800000, 1 / 32768, -1 / 0x800000]);
  });

  it('32-bit PCM: full scale 2^31', () => {
    const data = [...le32(0x80000000), ...le32(0x40000000), ...le32(0x00010000), ...le32(0xffffffff)];
    const { x } = samplesOf(riff([fmt({ tag: 1, channels: 1, rate: 44100, bits: 32 }), chunk('data', data)]));
    expect(x).toEqual([-1, 0.5, 1 / 32768, -1 / 2 ** 31]);
  });

  it('IEEE float 32 and 64 (tag 3) pass values through, beyond +-1 included', () => {
    const v = [0.25, -1.5, 1e-7, 0];
    const f = riff([fmt({ tag: 3, channels: 1, rate: 48000, bits: 32 }), chunk('data', v.flatMap(f32))]);
    const d = riff([
      fmt({ tag: 3, channels: 1, rate: 96000, bits: 64, extra: le16(0) }),
      chunk('fact', le32(4)),
      chunk('data', v.flatMap(f64)),
    ]);
    // float32 rounding of each value (IEEE 754).
    expect(samplesOf(f).x).toEqual(v.map(Math.fround));
    expect(samplesOf(d).x).toEqual(v);
    expect(samplesOf(d).layout).toMatchObject({ encoding: 'float', bitsPerSample: 64, sampleRate: 96000 });
  });

  it('mu-law (tag 7) and A-law (tag 6): all 256 codes decode to the G.711 tables', () => {
    const codes = Array.from({ length: 256 }, (_, i) => i);
    // The non-PCM form: fmt with cbSize 0, a fact chunk with the sample count (RIFF spec, from memory).
    const mu = riff([
      fmt({ tag: 7, channels: 1, rate: 8000, bits: 8, extra: le16(0) }),
      chunk('fact', le32(256)),
      chunk('data', codes),
    ]);
    const a = riff([
      fmt({ tag: 6, channels: 1, rate: 8000, bits: 8, extra: le16(0) }),
      chunk('fact', le32(256)),
      chunk('data', codes),
    ]);
    // ITU-T G.711 Tables 2 and 1 via test/core/g711-reference.ts (from memory), on the 16-bit scale.
    expect(samplesOf(mu).x.map((v) => v * 32768)).toEqual(MU_REF.decoded);
    expect(samplesOf(a).x.map((v) => v * 32768)).toEqual(A_REF.decoded);
    expect(samplesOf(mu).layout).toMatchObject({ encoding: 'mulaw', formatTag: 7 });
    expect(samplesOf(a).layout).toMatchObject({ encoding: 'alaw', formatTag: 6 });
    // A plain 16-byte fmt (no cbSize) is accepted too: older writers omit it.
    const bare = riff([fmt({ tag: 7, channels: 1, rate: 8000, bits: 8 }), chunk('data', [0xff, 0x80])]);
    expect(samplesOf(bare).x.map((v) => v * 32768)).toEqual([MU_REF.decoded[0xff], MU_REF.decoded[0x80]]);
  });

  it('WAVE_FORMAT_EXTENSIBLE with PCM, float, mu-law and A-law sub-formats', () => {
    // 24 valid bits in a 32-bit container, left-justified (extensible addendum, from memory).
    const pcm = riff([
      extensibleFmt({ subTag: 1, channels: 1, rate: 48000, bits: 32, validBits: 24, mask: 4 }),
      chunk('data', [...le32(0x7fffff00), ...le32(0x80000000)]),
    ]);
    const p = samplesOf(pcm);
    expect(p.layout).toMatchObject({
      formatTag: 0xfffe,
      encoding: 'pcm',
      bitsPerSample: 32,
      validBitsPerSample: 24,
    });
    expect(p.x).toEqual([0x7fffff00 / 2 ** 31, -1]);
    const flt = riff([
      extensibleFmt({ subTag: 3, channels: 2, rate: 44100, bits: 32, validBits: 32, mask: 3 }),
      chunk('data', [...f32(0.5), ...f32(-0.25), ...f32(0.125), ...f32(1)]),
    ]);
    expect(samplesOf(flt, 1).x).toEqual([-0.25, 1]);
    for (const [subTag, ref, encoding] of [
      [7, MU_REF, 'mulaw'],
      [6, A_REF, 'alaw'],
    ] as const) {
      const file = riff([
        extensibleFmt({ subTag, channels: 1, rate: 8000, bits: 8, validBits: 8 }),
        chunk('fact', le32(3)),
        chunk('data', [0x00, 0x7f, 0xd5]),
      ]);
      const r = samplesOf(file);
      expect(r.layout.encoding).toBe(encoding);
      expect(r.x.map((v) => v * 32768)).toEqual([ref.decoded[0], ref.decoded[0x7f], ref.decoded[0xd5]]);
    }
    // 16 bits in a 16-bit container with validBits 0 ("not given") reads as 16.
    const zeroValid = riff([
      extensibleFmt({ subTag: 1, channels: 1, rate: 8000, bits: 16, validBits: 0 }),
      chunk('data', le16(0x4000)),
    ]);
    expect(samplesOf(zeroValid)).toMatchObject({ layout: { validBitsPerSample: 16 }, x: [0.5] });
  });

  it('picks one channel of an interleaved file', () => {
    // Frames interleave channels in order (RIFF spec, from memory).
    const frames = [
      [100, -200, 300],
      [400, -500, 600],
    ].flatMap((f) => f.flatMap(le16));
    const file = riff([fmt({ tag: 1, channels: 3, rate: 8000, bits: 16 }), chunk('data', frames)]);
    expect(samplesOf(file, 0).x.map((v) => v * 32768)).toEqual([100, 400]);
    expect(samplesOf(file, 1).x.map((v) => v * 32768)).toEqual([-200, -500]);
    expect(samplesOf(file, 2).x.map((v) => v * 32768)).toEqual([300, 600]);
  });

  it('accepts 8 kHz and 192 kHz, the ends of the supported range', () => {
    for (const rate of [8000, 192000]) {
      const file = riff([fmt({ tag: 1, channels: 1, rate, bits: 16 }), chunk('data', le16(7))]);
      expect(parseWavBytes(file).sampleRate).toBe(rate);
    }
  });
});

describe('the chunk walk', () => {
  it('skips unknown, fact and LIST chunks and honours the pad byte of odd sizes', () => {
    // Odd-sized chunks are followed by one pad byte not counted in their size (RIFF spec, from memory).
    const list = chunk('LIST', [...ascii('INFO'), ...chunk('INAM', [...ascii('tone'), 0])]);
    const file = riff([
      chunk('junk', [1, 2, 3]),
      fmt({ tag: 1, channels: 1, rate: 8000, bits: 16 }),
      chunk('fact', le32(2)),
      list,
      chunk('xyz ', [9]),
      chunk('data', [...le16(1000), ...le16(-1000 & 0xffff)]),
      chunk('cue ', [0, 0, 0, 0]),
    ]);
    const { layout, x } = samplesOf(file);
    // RIFF header 12, junk 8+3+pad, fmt 8+16, fact 8+4, LIST, "xyz " 8+1+pad, data header 8.
    expect(layout.dataOffset).toBe(12 + 12 + 24 + 12 + list.length + 10 + 8);
    expect(x.map((v) => v * 32768)).toEqual([1000, -1000]);
  });

  it('reads a file that ends right after an odd data chunk without its pad byte', () => {
    const body = riff([fmt({ tag: 7, channels: 1, rate: 8000, bits: 8 }), chunk('data', [1, 2, 3])]);
    expect(parseWavBytes(body.subarray(0, body.length - 1)).frames).toBe(3);
  });

  it('does not trust the RIFF size: larger or smaller than the file, the data chunk decides', () => {
    const file = riff([fmt({ tag: 1, channels: 1, rate: 8000, bits: 16 }), chunk('data', le16(5))]);
    const larger = file.slice();
    larger.set(le32(1_000_000), 4);
    const smaller = file.slice();
    smaller.set(le32(4), 4);
    expect(parseWavBytes(larger).frames).toBe(1);
    expect(parseWavBytes(smaller).frames).toBe(1);
  });
});

describe('refusals name the problem', () => {
  const pcm16 = (data: number[], declared?: number) =>
    riff([fmt({ tag: 1, channels: 1, rate: 8000, bits: 16 }), chunk('data', data, declared)]);

  it('not RIFF/WAVE, other RIFF forms, RF64, RIFX, empty and tiny files', () => {
    expect(refusal(Uint8Array.from(ascii('ID3\x03 some mp3')))).toMatch(/not a RIFF\/WAVE file.*"ID3\\x03"/);
    expect(refusal(riff([chunk('avih', [0, 0])], 'AVI '))).toMatch(/form "AVI ", not WAVE/);
    expect(refusal(Uint8Array.from([...ascii('RF64'), ...le32(0xffffffff), ...ascii('WAVE')]))).toMatch(
      /RF64/,
    );
    expect(refusal(Uint8Array.from([...ascii('RIFX'), ...le32(4), ...ascii('WAVE')]))).toMatch(/big-endian/);
    expect(refusal(new Uint8Array(0))).toMatch(/empty/);
    expect(refusal(Uint8Array.from(ascii('RIFF')))).toMatch(/truncated: 4 bytes/);
    expect(refusal(Uint8Array.from([...ascii('RIFF'), ...le32(0), ...ascii('WAVE')]))).toMatch(/RIFF size 0/);
  });

  it('truncated headers and data', () => {
    const file = pcm16([...le16(1), ...le16(2), ...le16(3)]);
    // Cut inside the fmt chunk, inside the data chunk header, inside the data.
    expect(refusal(file.subarray(0, 30))).toMatch(/fmt chunk declares 16 bytes but only 10 follow/);
    expect(refusal(file.subarray(0, 40))).toMatch(/truncated inside a chunk header at offset 36/);
    expect(refusal(file.subarray(0, 46))).toMatch(
      /data chunk declares 6 bytes but only 2 follow in the file/,
    );
    expect(refusal(file.subarray(0, 36))).toMatch(/has no data chunk/);
    expect(refusal(riff([]))).toMatch(/has no fmt chunk/);
  });

  it('wrong sizes in headers', () => {
    expect(refusal(pcm16(le16(1), 0x7fffffff))).toMatch(
      /data chunk declares 2147483647 bytes but only 2 follow/,
    );
    expect(refusal(pcm16([1, 2, 3]))).toMatch(/data chunk size 3 is not a whole number of 2-byte frames/);
    const fmt12 = riff([
      chunk('fmt ', [1, 0, 1, 0, 0x40, 0x1f, 0, 0, 0x80, 0x3e, 0, 0]),
      chunk('data', [0, 0]),
    ]);
    expect(refusal(fmt12)).toMatch(/fmt chunk is 12 bytes, shorter than the 16/);
    const badAlign = riff([
      fmt({ tag: 1, channels: 2, rate: 8000, bits: 16, blockAlign: 2 }),
      chunk('data', [0, 0]),
    ]);
    expect(refusal(badAlign)).toMatch(
      /block align 2 does not match 2 channel\(s\) of 16 bits \(expected 4\)/,
    );
    const bigJunk = riff([chunk('junk', [1, 2], 5000), fmt({ tag: 1, channels: 1, rate: 8000, bits: 16 })]);
    expect(refusal(bigJunk)).toMatch(
      /chunk "junk" at offset 12 declares 5000 bytes, past the end of the file/,
    );
    const shortExt = riff([
      fmt({ tag: 0xfffe, channels: 1, rate: 8000, bits: 16, extra: le16(0) }),
      chunk('data', [0, 0]),
    ]);
    expect(refusal(shortExt)).toMatch(/EXTENSIBLE fmt chunk is 18 bytes, it needs 40/);
  });

  it('data before fmt', () => {
    const file = riff([chunk('data', [0, 0]), fmt({ tag: 1, channels: 1, rate: 8000, bits: 16 })]);
    expect(refusal(file)).toMatch(/data chunk comes before any fmt chunk/);
  });

  it('unknown format tags and sub-formats', () => {
    const adpcm = riff([
      fmt({ tag: 2, channels: 1, rate: 8000, bits: 4, blockAlign: 256 }),
      chunk('data', [0, 0]),
    ]);
    expect(refusal(adpcm)).toMatch(/unsupported format tag 0x0002 \(Microsoft ADPCM\)/);
    const odd = riff([fmt({ tag: 0x1234, channels: 1, rate: 8000, bits: 8 }), chunk('data', [0, 0])]);
    expect(refusal(odd)).toMatch(/unsupported format tag 0x1234;/);
    const guid = subFormatGuid(1);
    guid[15] ^= 1;
    const ext = riff([
      extensibleFmt({ subTag: 1, channels: 1, rate: 8000, bits: 16, validBits: 16, guid }),
      chunk('data', [0, 0]),
    ]);
    expect(refusal(ext)).toMatch(
      /unsupported WAVE_FORMAT_EXTENSIBLE sub-format \{00000001-0000-0010-8000-00aa00389b70\}/,
    );
    const adpcmExt = riff([
      extensibleFmt({ subTag: 2, channels: 1, rate: 8000, bits: 16, validBits: 16 }),
      chunk('data', [0, 0]),
    ]);
    expect(refusal(adpcmExt)).toMatch(/sub-format \{00000002-/);
  });

  it('unsupported bit depths, zero channels, rates out of range', () => {
    const pcm12 = riff([fmt({ tag: 1, channels: 1, rate: 8000, bits: 12 }), chunk('data', [0, 0])]);
    expect(refusal(pcm12)).toMatch(/unsupported bit depth 12 for PCM \(supported: 8, 16, 24, 32\)/);
    const f16 = riff([fmt({ tag: 3, channels: 1, rate: 8000, bits: 16 }), chunk('data', [0, 0])]);
    expect(refusal(f16)).toMatch(/unsupported bit depth 16 for IEEE float \(supported: 32, 64\)/);
    const mu16 = riff([fmt({ tag: 7, channels: 1, rate: 8000, bits: 16 }), chunk('data', [0, 0])]);
    expect(refusal(mu16)).toMatch(/unsupported bit depth 16 for mu-law/);
    const valid = riff([
      extensibleFmt({ subTag: 1, channels: 1, rate: 8000, bits: 16, validBits: 20 }),
      chunk('data', [0, 0]),
    ]);
    expect(refusal(valid)).toMatch(/20 valid bits do not fit a 16-bit sample container/);
    const mono0 = riff([
      fmt({ tag: 1, channels: 0, rate: 8000, bits: 16, blockAlign: 2 }),
      chunk('data', [0, 0]),
    ]);
    expect(refusal(mono0)).toMatch(/zero channels/);
    for (const rate of [7999, 192001, 0]) {
      const file = riff([fmt({ tag: 1, channels: 1, rate, bits: 16 }), chunk('data', [0, 0])]);
      expect(refusal(file)).toMatch(
        new RegExp(`sample rate ${rate} Hz is outside the supported 8000..192000 Hz`),
      );
    }
  });

  it('zero samples', () => {
    expect(refusal(pcm16([]))).toMatch(/contains no samples/);
  });
});

describe('non-finite float samples', () => {
  it('are reported with their position in the block, and decoding stops there', () => {
    // IEEE 754: NaN and the infinities are the only values with v - v != 0.
    for (const bad of [NaN, Infinity, -Infinity]) {
      for (const [bits, enc] of [
        [32, f32],
        [64, f64],
      ] as const) {
        const data = [0.5, 0.25, bad, 0.125].flatMap(enc);
        const file = riff([fmt({ tag: 3, channels: 1, rate: 8000, bits }), chunk('data', data)]);
        const layout = parseWavBytes(file);
        const out = new Float64Array(4);
        expect(decodeChannel(file, layout.dataOffset, 4, layout, 0, out, 0)).toBe(2);
        expect(out[3]).toBe(0);
      }
    }
  });

  it('in another channel do not stop the chosen one', () => {
    const data = [0.5, NaN, 0.25, Infinity].flatMap(f32);
    const file = riff([fmt({ tag: 3, channels: 2, rate: 8000, bits: 32 }), chunk('data', data)]);
    expect(samplesOf(file, 0).x).toEqual([0.5, 0.25]);
  });
});
