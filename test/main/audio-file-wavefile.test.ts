// Cross-check with an independent WAV implementation from the npm registry,
// wavefile 11 (devDependency): it reads the files our writers make with the same
// format tags and codes, and our reader reads the files it makes with its samples.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import wavefile from 'wavefile';
import { afterAll, describe, expect, it } from 'vitest';
import { createWavWriter, openAudio, writeWavFile } from '../../main/cli/audio-file';
import { A_REF, MU_REF } from '../core/g711-reference';

const { WaveFile } = wavefile;
const dir = mkdtempSync(path.join(tmpdir(), 'qs-wavefile-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

interface Fmt {
  audioFormat: number;
  numChannels: number;
  sampleRate: number;
  byteRate: number;
  blockAlign: number;
  bitsPerSample: number;
}

function parsedByWavefile(file: string) {
  const wav = new WaveFile(readFileSync(file));
  return {
    wav,
    fmt: wav.fmt as Fmt,
    fact: wav.fact as { chunkId: string; dwSampleLength: number },
    data: wav.data as { chunkSize: number; samples: Uint8Array },
  };
}

async function readOurs(file: string): Promise<Float64Array> {
  const r = await openAudio(file, { chunkFrames: 777 });
  const out = new Float64Array(r.info.frames);
  expect(await r.read(out)).toBe(r.info.frames);
  await r.close();
  return out;
}

// Every code twice, once at an odd count so the pad byte is exercised.
const codes = Uint8Array.from({ length: 513 }, (_, i) => (i * 101) & 0xff);

describe('wavefile reads what we write', () => {
  for (const [encoding, tag, ref] of [
    ['mulaw', 7, MU_REF],
    ['alaw', 6, A_REF],
  ] as const) {
    it(`G.711 ${encoding}: format tag ${tag}, 8000 Hz, fact count, the same codes`, async () => {
      const file = path.join(dir, `${encoding}.wav`);
      await writeWavFile(file, { encoding, sampleRate: 8000, codes });
      const { wav, fmt, fact, data } = parsedByWavefile(file);
      expect(wav.container).toBe('RIFF');
      expect(wav.format).toBe('WAVE');
      // Format tags 7 (mu-law) and 6 (A-law), mono, 8 bits, 8000 bytes/s (mmreg.h / RIFF spec, from memory).
      expect(fmt).toMatchObject({
        audioFormat: tag,
        numChannels: 1,
        sampleRate: 8000,
        byteRate: 8000,
        blockAlign: 1,
        bitsPerSample: 8,
      });
      expect(fact.chunkId).toBe('fact');
      expect(fact.dwSampleLength).toBe(codes.length);
      // wavefile hands the pad byte after an odd data chunk over with the samples;
      // the chunk size it read is the sample count, and the pad byte is 0 (RIFF spec, from memory).
      expect(data.chunkSize).toBe(codes.length);
      expect([...data.samples.subarray(0, codes.length)]).toEqual([...codes]);
      expect([...data.samples.subarray(codes.length)]).toEqual([0]);
      // wavefile's own G.711 decoding to 16 bits, and ours, both equal the
      // ITU-T G.711 tables (Tables 2 / 1 via g711-reference.ts, from memory).
      const expected = [...codes].map((c) => ref.decoded[c]);
      if (encoding === 'mulaw') wav.fromMuLaw();
      else wav.fromALaw();
      expect([...wav.getSamples()].slice(0, codes.length)).toEqual(expected);
      expect([...(await readOurs(file))].map((x) => x * 32768)).toEqual(expected);
    });
  }

  it('16-bit PCM from the streaming writer: tag 1, the same samples', async () => {
    const samples = Int16Array.from({ length: 5000 }, (_, i) => Math.round(20000 * Math.sin(i / 7)));
    const file = path.join(dir, 'pcm16.wav');
    const w = await createWavWriter(file, { encoding: 'pcm16', sampleRate: 48000 });
    for (let i = 0; i < samples.length; i += 999) await w.write(samples.subarray(i, i + 999));
    await w.close();
    const { wav, fmt } = parsedByWavefile(file);
    expect(fmt).toMatchObject({
      audioFormat: 1,
      numChannels: 1,
      sampleRate: 48000,
      blockAlign: 2,
      bitsPerSample: 16,
    });
    expect(Int16Array.from(wav.getSamples())).toEqual(samples);
  });
});

describe('we read what wavefile writes', () => {
  // wavefile's bit-depth codes and the full scale it stores integers against (its README).
  const n = 300;
  const unit = Array.from({ length: n }, (_, i) => Math.sin(i / 5) * 0.9);
  const cases: [string, number, (x: number) => number, (x: number) => number][] = [
    ['8', 8000, (x) => Math.round(x * 127) + 128, (s) => (s - 128) / 128],
    ['16', 16000, (x) => Math.round(x * 32767), (s) => s / 32768],
    ['24', 48000, (x) => Math.round(x * 8388607), (s) => s / 8388608],
    ['32', 96000, (x) => Math.round(x * 2147483647), (s) => s / 2147483648],
    ['32f', 44100, Math.fround, (s) => s],
    ['64', 192000, (x) => x, (s) => s],
  ];
  for (const [depth, rate, store, scale] of cases) {
    it(`bit depth "${depth}" at ${rate} Hz, stereo, second channel`, async () => {
      const wav = new WaveFile();
      const left = unit.map(store);
      const right = unit.map((x) => store(-x / 2));
      wav.fromScratch(2, rate, depth, [left, right]);
      const file = path.join(dir, `wavefile-${depth}.wav`);
      writeFileSync(file, wav.toBuffer());
      const r = await openAudio(file, { channel: 1 });
      expect(r.info).toMatchObject({ channels: 2, sampleRate: rate, frames: n });
      const out = new Float64Array(n);
      expect(await r.read(out)).toBe(n);
      await r.close();
      // Exact: the same integers divided by the same power of two (arithmetic).
      expect([...out].map((v) => v + 0)).toEqual(right.map((s) => scale(s) + 0));
    });
  }

  it('wavefile mu-law and A-law files (its own fmt layout with cbSize 2)', async () => {
    for (const [depth, ref] of [
      ['8m', MU_REF],
      ['8a', A_REF],
    ] as const) {
      const wav = new WaveFile();
      wav.fromScratch(1, 8000, depth, codes);
      const file = path.join(dir, `wavefile-${depth}.wav`);
      writeFileSync(file, wav.toBuffer());
      // ITU-T G.711 tables via g711-reference.ts (from memory).
      expect([...(await readOurs(file))].map((x) => x * 32768)).toEqual(
        [...codes].map((c) => ref.decoded[c]),
      );
    }
  });
});
