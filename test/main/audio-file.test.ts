// Reading and writing audio files on disk: every format through openAudio in
// chunks, every refusal as an AudioFileError naming the file, the writers'
// round trips. Files are built byte by byte after the RIFF specification
// (test/core/wav-riff.ts, from memory).
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  AudioFileError,
  createWavWriter,
  openAudio,
  writeRawFile,
  writeWavFile,
  type AudioReader,
} from '../../main/cli/audio-file';
import { A_REF, MU_REF } from '../core/g711-reference';
import { chunk, extensibleFmt, f32, f64, fmt, le16, le24, le32, riff } from '../core/wav-riff';

const dir = mkdtempSync(path.join(tmpdir(), 'qs-audio-file-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
let serial = 0;
function put(bytes: Uint8Array | number[], name = `f${serial++}.wav`): string {
  const p = path.join(dir, name);
  writeFileSync(p, Uint8Array.from(bytes));
  return p;
}

/** Reads everything with a given read-buffer size. */
async function drain(reader: AudioReader, block = 1000): Promise<number[]> {
  const out = new Float64Array(block);
  const all: number[] = [];
  for (;;) {
    const n = await reader.read(out);
    if (n === 0) break;
    for (let i = 0; i < n; i++) all.push(out[i]);
  }
  await reader.close();
  return all;
}

async function refusal(p: string, opts?: Parameters<typeof openAudio>[1]): Promise<string> {
  try {
    const r = await openAudio(p, opts);
    await drain(r);
  } catch (err) {
    expect(err).toBeInstanceOf(AudioFileError);
    const e = err as AudioFileError;
    expect(e.file).toBe(p);
    // The message starts with the file name, and carries no stack-like text.
    expect(e.message.startsWith(`${p}: `)).toBe(true);
    expect(e.message).not.toMatch(/\n|\bat .*:\d+:\d+/);
    return e.problem;
  }
  throw new Error(`${p} was read, not refused`);
}

// A 16-bit ramp long enough to cross several chunks.
const N = 10_007;
const ramp = Int16Array.from({ length: N }, (_, i) => ((i * 613) % 65536) - 32768);

describe('openAudio reads every format in chunks', () => {
  it('16-bit stereo, both channels, chunk and buffer sizes that do not divide the length', async () => {
    const data = [...ramp].flatMap((s) => [...le16(s & 0xffff), ...le16(-s & 0xffff)]);
    const p = put(riff([fmt({ tag: 1, channels: 2, rate: 44100, bits: 16 }), chunk('data', data)]));
    for (const [chunkFrames, block] of [
      [5, 7],
      [333, 1000],
      [65536, 4096],
      [4096, 20_000],
    ]) {
      const left = await openAudio(p, { chunkFrames });
      expect(left.info).toEqual({
        path: p,
        container: 'wav',
        encoding: 'pcm',
        bitsPerSample: 16,
        validBitsPerSample: 16,
        formatTag: 1,
        channels: 2,
        channel: 0,
        sampleRate: 44100,
        frames: N,
      });
      // n / 32768 (DEVELOPERS.md scale; common practice, no source).
      const l = await drain(left, block);
      expect(l.length).toBe(N);
      expect(l.every((v, i) => v * 32768 === ramp[i])).toBe(true);
      const r = await drain(await openAudio(p, { chunkFrames, channel: 1 }), block);
      expect(r.every((v, i) => v * 32768 === (-ramp[i] << 16) >> 16)).toBe(true);
    }
  });

  it('fills the whole buffer except at the end, then returns 0; position counts frames', async () => {
    const p = put(
      riff([fmt({ tag: 1, channels: 1, rate: 8000, bits: 16 }), chunk('data', [...ramp].flatMap(le16))]),
    );
    const r = await openAudio(p, { chunkFrames: 100 });
    const out = new Float64Array(4000);
    expect(await r.read(out)).toBe(4000);
    expect(await r.read(out)).toBe(4000);
    expect(r.position).toBe(8000);
    expect(await r.read(out)).toBe(N - 8000);
    expect(await r.read(out)).toBe(0);
    await r.close();
    await expect(r.read(out)).rejects.toThrow(/read after close/);
  });

  it('8-, 24- and 32-bit PCM, float 32 and 64, mu-law, A-law, extensible', async () => {
    const v = [0.5, -0.25, 0, -1];
    const cases: [string, Uint8Array, number[]][] = [
      // Unsigned 8-bit, 0x80 = 0 (RIFF spec, from memory).
      [
        'pcm8',
        riff([fmt({ tag: 1, channels: 1, rate: 8000, bits: 8 }), chunk('data', [0xc0, 0x60, 0x80, 0x00])]),
        v,
      ],
      [
        'pcm24',
        riff([
          fmt({ tag: 1, channels: 1, rate: 48000, bits: 24 }),
          chunk(
            'data',
            v.flatMap((x) => le24(x * 2 ** 23)),
          ),
        ]),
        v,
      ],
      [
        'pcm32',
        riff([
          fmt({ tag: 1, channels: 1, rate: 96000, bits: 32 }),
          chunk(
            'data',
            v.flatMap((x) => le32(x * 2 ** 31)),
          ),
        ]),
        v,
      ],
      [
        'float32',
        riff([fmt({ tag: 3, channels: 1, rate: 48000, bits: 32 }), chunk('data', v.flatMap(f32))]),
        v,
      ],
      [
        'float64',
        riff([fmt({ tag: 3, channels: 1, rate: 192000, bits: 64 }), chunk('data', v.flatMap(f64))]),
        v,
      ],
      [
        'mulaw',
        riff([
          fmt({ tag: 7, channels: 1, rate: 8000, bits: 8, extra: le16(0) }),
          chunk('fact', le32(3)),
          chunk('data', [0, 0x7f, 0xff]),
        ]),
        // ITU-T G.711 Table 2 via g711-reference.ts (from memory).
        [0, 0x7f, 0xff].map((c) => MU_REF.decoded[c] / 32768),
      ],
      [
        'alaw',
        riff([
          fmt({ tag: 6, channels: 1, rate: 8000, bits: 8, extra: le16(0) }),
          chunk('fact', le32(3)),
          chunk('data', [0xd5, 0x55, 0xaa]),
        ]),
        // ITU-T G.711 Table 1 via g711-reference.ts (from memory).
        [0xd5, 0x55, 0xaa].map((c) => A_REF.decoded[c] / 32768),
      ],
      [
        'extensible float',
        riff([
          extensibleFmt({ subTag: 3, channels: 1, rate: 48000, bits: 32, validBits: 32 }),
          chunk('data', v.flatMap(f32)),
        ]),
        v,
      ],
    ];
    for (const [name, file, expected] of cases) {
      const got = await drain(await openAudio(put(file), { chunkFrames: 3 }));
      expect(got, name).toEqual(expected);
    }
  });

  it('headerless G.711 (--raw mu|a) at 8 kHz', async () => {
    const codes = Array.from({ length: 256 }, (_, i) => i);
    const p = put(codes, 'codes.ul');
    const mu = await openAudio(p, { raw: 'mu', chunkFrames: 100 });
    expect(mu.info).toMatchObject({
      container: 'raw',
      encoding: 'mulaw',
      sampleRate: 8000,
      channels: 1,
      frames: 256,
    });
    // ITU-T G.711 Tables 2 / 1 via g711-reference.ts (from memory).
    expect((await drain(mu)).map((x) => x * 32768)).toEqual(MU_REF.decoded);
    const a = await openAudio(p, { raw: 'a' });
    expect(a.info.encoding).toBe('alaw');
    expect((await drain(a)).map((x) => x * 32768)).toEqual(A_REF.decoded);
  });
});

describe('refusals name the file and the problem', () => {
  const good = riff([
    fmt({ tag: 1, channels: 2, rate: 8000, bits: 16 }),
    chunk('data', [1, 0, 2, 0, 3, 0, 4, 0]),
  ]);

  it('missing file, directory, FIFO, missing folder on the path', async () => {
    expect(await refusal(path.join(dir, 'nope.wav'))).toBe('no such file');
    const sub = path.join(dir, 'a-folder.wav');
    mkdirSync(sub);
    expect(await refusal(sub)).toBe('is a directory, not an audio file');
    const fifo = path.join(dir, 'pipe.wav');
    // A FIFO would block a reader waiting for a writer; it must be refused at once.
    execFileSync('mkfifo', [fifo]);
    expect(await refusal(fifo)).toBe('is not a regular file');
    expect(await refusal(path.join(put(good), 'inner.wav'))).toMatch(/no such file/);
  });

  it('not a WAV file, truncated header, truncated data, wrong sizes', async () => {
    expect(await refusal(put(Uint8Array.from(Buffer.from('ID3\x04 not audio'))))).toMatch(
      /not a RIFF\/WAVE file/,
    );
    expect(await refusal(put(good.subarray(0, 20)))).toMatch(/fmt chunk declares 16 bytes but only 0 follow/);
    expect(await refusal(put(good.subarray(0, 47)))).toMatch(/data chunk declares 8 bytes but only 3 follow/);
    const lying = good.slice();
    lying.set(le32(80_000), 40);
    expect(await refusal(put(lying))).toMatch(
      /data chunk declares 80000 bytes but only 8 follow in the file/,
    );
  });

  it('unknown format, unsupported bit depth, zero channels, rate out of range, zero samples', async () => {
    const f = (
      tag: number,
      channels: number,
      rate: number,
      bits: number,
      data: number[],
      blockAlign?: number,
    ) => put(riff([fmt({ tag, channels, rate, bits, blockAlign }), chunk('data', data)]));
    expect(await refusal(f(0x55, 1, 8000, 0, [0, 0], 1))).toMatch(
      /unsupported format tag 0x0055 \(MPEG Layer III\)/,
    );
    expect(await refusal(f(1, 1, 8000, 20, [0, 0, 0]))).toMatch(/unsupported bit depth 20 for PCM/);
    expect(await refusal(f(1, 0, 8000, 16, [0, 0], 2))).toMatch(/zero channels/);
    expect(await refusal(f(1, 1, 4000, 16, [0, 0]))).toMatch(/sample rate 4000 Hz is outside/);
    expect(await refusal(f(1, 1, 8000, 16, []))).toBe('contains no samples');
    expect(await refusal(put([]), { raw: 'mu' })).toMatch(/contains no samples/);
    expect(await refusal(put([]))).toMatch(/empty/);
  });

  it('channel index out of range, bad options', async () => {
    const p = put(good);
    expect(await refusal(p, { channel: 2 })).toBe(
      'channel index 2 is out of range: the file has 2 channel(s), 0..1',
    );
    expect(await refusal(put([1, 2, 3]), { raw: 'a', channel: 1 })).toMatch(/has 1 channel\(s\)/);
    expect(await refusal(p, { channel: -1 })).toMatch(/channel index -1/);
    expect(await refusal(p, { chunkFrames: 0 })).toMatch(/chunk size 0/);
  });

  it('NaN or infinite floats: refused by the read that meets them, with frame and time', async () => {
    const v = Array.from({ length: 20_000 }, (_, i) => Math.sin(i / 10) / 2);
    v[12_345] = NaN;
    const p = put(riff([fmt({ tag: 3, channels: 1, rate: 8000, bits: 32 }), chunk('data', v.flatMap(f32))]));
    // 12345 / 8000 s = 1.543 s (arithmetic).
    expect(await refusal(p, { chunkFrames: 4096 })).toBe(
      'sample 12345 (at 1.543 s) of channel 0 is NaN; float samples must be finite',
    );
    v[12_345] = 0;
    v[17] = -Infinity;
    const q = put(riff([fmt({ tag: 3, channels: 1, rate: 8000, bits: 64 }), chunk('data', v.flatMap(f64))]));
    expect(await refusal(q)).toMatch(/^sample 17 \(at 0.002 s\) of channel 0 is -Infinity/);
    // Frames read before the bad one were delivered by earlier reads.
    const r = await openAudio(p, { chunkFrames: 1000 });
    const out = new Float64Array(12_000);
    expect(await r.read(out)).toBe(12_000);
    await expect(r.read(out)).rejects.toThrow(AudioFileError);
    // The failed read released the file already.
    await expect(r.read(out)).rejects.toThrow(/read after close/);
    await r.close();
  });

  it('a file that shrinks while being read is an error, not a hang', async () => {
    const p = put(
      riff([fmt({ tag: 1, channels: 1, rate: 8000, bits: 16 }), chunk('data', [...ramp].flatMap(le16))]),
    );
    const r = await openAudio(p, { chunkFrames: 1000 });
    writeFileSync(p, readFileSync(p).subarray(0, 5000));
    await expect(r.read(new Float64Array(N))).rejects.toThrow(/ended early at byte 5000/);
    await r.close();
  });
});

describe('writers', () => {
  it('writeWavFile: 16-bit PCM and G.711 round trips', async () => {
    const pcm = path.join(dir, 'out16.wav');
    await writeWavFile(pcm, { encoding: 'pcm16', sampleRate: 48000, samples: ramp });
    const back = await drain(await openAudio(pcm, { chunkFrames: 999 }));
    expect(back.every((v, i) => v * 32768 === ramp[i])).toBe(true);
    const codes = Uint8Array.from({ length: 1001 }, (_, i) => (i * 7) & 0xff);
    for (const [encoding, ref] of [
      ['mulaw', MU_REF],
      ['alaw', A_REF],
    ] as const) {
      const p = path.join(dir, `out-${encoding}.wav`);
      await writeWavFile(p, { encoding, sampleRate: 8000, codes });
      const r = await openAudio(p);
      expect(r.info).toMatchObject({ encoding, formatTag: encoding === 'mulaw' ? 7 : 6, frames: 1001 });
      // ITU-T G.711 tables via g711-reference.ts (from memory).
      expect((await drain(r)).map((x) => x * 32768)).toEqual([...codes].map((c) => ref.decoded[c]));
      // 58-byte header, the codes, one pad byte for the odd count (RIFF spec, from memory).
      const bytes = readFileSync(p);
      expect(bytes.length).toBe(58 + 1001 + 1);
      expect([...bytes.subarray(58, 58 + 1001)]).toEqual([...codes]);
    }
  });

  it('writeRawFile writes the codes and nothing else', async () => {
    const p = path.join(dir, 'out.al');
    const codes = Uint8Array.from([0xd5, 0x55, 0x2a]);
    await writeRawFile(p, codes);
    expect([...readFileSync(p)]).toEqual([0xd5, 0x55, 0x2a]);
    const back = await drain(await openAudio(p, { raw: 'a' }));
    expect(back.map((x) => x * 32768)).toEqual([...codes].map((c) => A_REF.decoded[c]));
  });

  it('createWavWriter streams blocks and gives the same file as writeWavFile', async () => {
    for (const [encoding, body] of [
      ['pcm16', ramp],
      ['mulaw', Uint8Array.from(ramp, (s) => s & 0xff)],
    ] as const) {
      const whole = path.join(dir, `whole-${encoding}.wav`);
      const streamed = path.join(dir, `streamed-${encoding}.wav`);
      const sampleRate = encoding === 'pcm16' ? 16000 : 8000;
      await writeWavFile(
        whole,
        encoding === 'pcm16'
          ? { encoding, sampleRate, samples: ramp }
          : { encoding, sampleRate, codes: body as Uint8Array },
      );
      const w = await createWavWriter(streamed, { encoding, sampleRate });
      for (let i = 0; i < body.length; i += 1234) await w.write(body.subarray(i, i + 1234));
      expect(w.frames).toBe(N);
      await w.close();
      expect(readFileSync(streamed).equals(readFileSync(whole))).toBe(true);
    }
  });

  it('abort deletes a half-written file; writer errors are AudioFileErrors', async () => {
    const p = path.join(dir, 'aborted.wav');
    const w = await createWavWriter(p, { encoding: 'alaw', sampleRate: 8000 });
    await w.write(Uint8Array.from([1, 2, 3]));
    await expect(w.write(new Int16Array(2))).rejects.toThrow(/takes Uint8Array blocks/);
    await w.abort();
    await expect(openAudio(p)).rejects.toThrow(/no such file/);
    const missing = path.join(dir, 'no-folder', 'x.wav');
    await expect(
      writeWavFile(missing, { encoding: 'pcm16', sampleRate: 8000, samples: ramp }),
    ).rejects.toThrow(new AudioFileError(missing, 'cannot write: no such file'));
    await expect(createWavWriter(missing, { encoding: 'mulaw', sampleRate: 8000 })).rejects.toThrow(
      AudioFileError,
    );
    await expect(
      writeWavFile(p, { encoding: 'mulaw', sampleRate: 48000, codes: new Uint8Array(1) }),
    ).rejects.toThrow(/G.711 is written at 8000 Hz/);
    await expect(writeWavFile(p, { encoding: 'alaw', sampleRate: 8000 })).rejects.toThrow(
      /G.711 needs codes/,
    );
  });
});
