// quantiscope encode / decode, checked with independent libraries from the npm
// registry: wavefile 11 reads the files encode writes (format tag, rate, codes),
// alawmulaw 6 supplies the G.711 codes and decoding tables to compare with.
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { alaw, mulaw } from 'alawmulaw';
import wavefile from 'wavefile';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openAudio } from '../../main/cli/audio-file';
import { A_REF, MU_REF, type LawReference } from '../core/g711-reference';
import { cli, gaussian, sine, tempDir, toPcm16, writePcm16 } from './cli-fixtures';

const { WaveFile } = wavefile;
let dir: string;
let remove: () => Promise<void>;
const f = (name: string) => path.join(dir, name);
const PCM8K = () => toPcm16(gaussian(8000, 2, 0.08, 11));

beforeAll(async () => {
  ({ dir, remove } = await tempDir('qs-encode-'));
  await writePcm16(
    f('noise8k.wav'),
    8000,
    Array.from(PCM8K(), (v) => v / 32768),
  );
  await writePcm16(f('tone48k.wav'), 48000, sine(48000, 2, 0.3, 1020));
  await writePcm16(f('tone44k.wav'), 44100, sine(44100, 2, 0.3, 1020));
});

afterAll(() => remove());

function readByWavefile(file: Buffer) {
  const wav = new WaveFile(file);
  const fmt = wav.fmt as {
    audioFormat: number;
    sampleRate: number;
    numChannels: number;
    bitsPerSample: number;
  };
  return { fmt, samples: (wav.data as { samples: Uint8Array }).samples };
}

/** Inputs on a negative decision value, where alawmulaw takes the other neighbour (see g711-alawmulaw.test.ts). */
const tieSet = (ref: LawReference) => new Set(ref.decisions16.map((d) => -d));

describe('encode', () => {
  for (const [law, ref, lib, tag] of [
    ['mu', MU_REF, mulaw, 7],
    ['a', A_REF, alaw, 6],
  ] as const) {
    it(`writes ${law}-law WAV that wavefile reads with alawmulaw's codes`, async () => {
      const out = f(`noise.${law}.wav`);
      const r = await cli(['encode', f('noise8k.wav'), out, '--law', law]);
      expect(r.code).toBe(0);
      expect(r.stderr).toBe('');
      const { fmt, samples } = readByWavefile(await readFile(out));
      // WAVE_FORMAT_MULAW = 7, WAVE_FORMAT_ALAW = 6 (Microsoft RIFF registrations, from memory).
      expect(fmt.audioFormat).toBe(tag);
      expect(fmt.sampleRate).toBe(8000);
      expect(fmt.numChannels).toBe(1);
      expect(fmt.bitsPerSample).toBe(8);
      const pcm = PCM8K();
      const theirs = lib.encode(pcm);
      expect(samples.length).toBe(pcm.length);
      const ties = tieSet(ref);
      let compared = 0;
      for (let i = 0; i < pcm.length; i++) {
        if (ties.has(pcm[i])) continue;
        compared++;
        if (samples[i] !== theirs[i]) expect([i, samples[i]]).toEqual([i, theirs[i]]);
      }
      expect(compared).toBeGreaterThan(pcm.length * 0.95);
    });
  }

  it('writes headerless codes with --raw-out, the WAV body byte for byte', async () => {
    expect((await cli(['encode', f('noise8k.wav'), f('noise.mu'), '--law', 'mu', '--raw-out'])).code).toBe(0);
    expect((await cli(['encode', f('noise8k.wav'), f('noise.mu.wav'), '--law', 'mu'])).code).toBe(0);
    const raw = await readFile(f('noise.mu'));
    const wav = readByWavefile(await readFile(f('noise.mu.wav')));
    expect(Buffer.compare(raw, Buffer.from(wav.samples))).toBe(0);
  });

  it('resamples 48 kHz and 44.1 kHz input to 8 kHz in step with the input', async () => {
    for (const name of ['tone48k', 'tone44k']) {
      const out = f(`${name}.a.wav`);
      expect((await cli(['encode', f(`${name}.wav`), out, '--law', 'a'])).code).toBe(0);
      const { fmt, samples } = readByWavefile(await readFile(out));
      expect(fmt.sampleRate).toBe(8000);
      // 2 s at 8000 Hz (arithmetic).
      expect(samples.length).toBe(16000);
      // Decoded by alawmulaw, the codes are the tone sampled at 8 kHz from time 0 within half a
      // sample (the filters' delay need not be a whole 8 kHz sample): at some offset of at most
      // half a sample the match is that of A-law on a tone (about 38 dB, Jayant and Noll 1984,
      // from memory), less the voice-band filter's ripple. A whole sample off, it is below 10 dB.
      const decoded = alaw.decode(samples);
      const snrAt = (offset: number) => {
        const want = new Float64Array(16000);
        for (let i = 0; i < want.length; i++)
          want[i] = 0.3 * Math.sin((2 * Math.PI * 1020 * (i - offset)) / 8000);
        let s = 0;
        let e = 0;
        for (let i = 800; i < 15200; i++) {
          s += want[i] * want[i];
          e += (decoded[i] / 32768 - want[i]) ** 2;
        }
        return 10 * Math.log10(s / e);
      };
      const best = Math.max(...Array.from({ length: 49 }, (_, k) => snrAt(k / 48 - 0.5)));
      expect(best, name).toBeGreaterThan(30);
      expect(snrAt(1), name).toBeLessThan(10);
      expect(snrAt(-1), name).toBeLessThan(10);
    }
  });

  it('refuses a missing law and a missing input with a message', async () => {
    const noLaw = await cli(['encode', f('noise8k.wav'), f('x.wav')]);
    expect(noLaw.code).toBe(2);
    expect(noLaw.stderr).toContain('--law mu or --law a');
    const missing = await cli(['encode', f('absent.wav'), f('x.wav'), '--law', 'mu']);
    expect(missing.code).toBe(1);
    expect(missing.stderr).toBe(`quantiscope encode: ${f('absent.wav')}: no such file`);
  });
});

describe('decode', () => {
  it('writes 16-bit PCM with the G.711 decoding tables (alawmulaw)', async () => {
    for (const [law, lib] of [
      ['mu', mulaw],
      ['a', alaw],
    ] as const) {
      const g711 = f(`noise.${law}.wav`);
      expect((await cli(['encode', f('noise8k.wav'), g711, '--law', law])).code).toBe(0);
      const pcm = f(`noise.${law}.pcm.wav`);
      const r = await cli(['decode', g711, pcm]);
      expect(r.code).toBe(0);
      const codes = readByWavefile(await readFile(g711)).samples;
      const back = new WaveFile(await readFile(pcm));
      const fmt = back.fmt as { audioFormat: number; bitsPerSample: number; sampleRate: number };
      expect([fmt.audioFormat, fmt.bitsPerSample, fmt.sampleRate]).toEqual([1, 16, 8000]);
      const got = Int16Array.from(back.getSamples(false, Int16Array) as unknown as ArrayLike<number>);
      expect(Array.from(got)).toEqual(Array.from(lib.decode(codes)));
    }
  });

  it('decodes headerless G.711 given --raw', async () => {
    const codes = mulaw.encode(PCM8K());
    const { writeFile } = await import('node:fs/promises');
    await writeFile(f('in.mu'), codes);
    expect((await cli(['decode', f('in.mu'), f('in.pcm.wav'), '--raw', 'mu'])).code).toBe(0);
    const r = await openAudio(f('in.pcm.wav'));
    const x = new Float64Array(r.info.frames);
    await r.read(x);
    await r.close();
    expect(Array.from(x, (v) => v * 32768)).toEqual(Array.from(mulaw.decode(codes)));
  });
});
