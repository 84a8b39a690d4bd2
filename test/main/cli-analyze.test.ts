// quantiscope analyze, driven in process on WAV files the test writes.
// Expected figures come from outside the code: the handbook SNR of a uniform
// quantizer, the A-law log-region asymptote, the amplitude density of a sine, the
// G.711 chord edges, and P.56 on a steady tone.
import { mkdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { mulaw } from 'alawmulaw';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FileResult } from '../../main/cli/analyze-file';
import { cli, sine, talker, tempDir, toPcm16, wavFile, writePcm16 } from './cli-fixtures';

let dir: string;
let remove: () => Promise<void>;
const f = (name: string) => path.join(dir, name);
const AMP = 0.1;

beforeAll(async () => {
  ({ dir, remove } = await tempDir('qs-analyze-'));
  await writePcm16(f('sine48.wav'), 48000, sine(48000, 6, AMP));
  await writePcm16(f('sine44.wav'), 44100, sine(44100, 6, AMP));
  await writePcm16(f('talk.wav'), 48000, talker(48000, 8, 5, [-30, -24, -36, -20, -28]));
  await writeFile(f('junk.wav'), 'RIFF this is not a wave file at all');
  await mkdir(f('folder.wav'));
  await writeFile(f('stereo.wav'), stereoPcm16(8000, sine(8000, 3, AMP), sine(8000, 3, AMP / 10)));
  // Headerless mu-law: the G.711 codes of a tone at 8 kHz (alawmulaw as the encoder).
  await writeFile(f('tone.mu'), mulaw.encode(toPcm16(sine(8000, 3, AMP))));
});

afterAll(() => remove());

/** A two-channel 16-bit PCM WAV file: fmt tag 1, samples interleaved (Microsoft RIFF, from memory). */
function stereoPcm16(rate: number, left: Float64Array, right: Float64Array): Uint8Array {
  const l = toPcm16(left);
  const r = toPcm16(right);
  const data = new DataView(new ArrayBuffer(4 * l.length));
  for (let i = 0; i < l.length; i++) {
    data.setInt16(4 * i, l[i], true);
    data.setInt16(4 * i + 2, r[i], true);
  }
  return wavFile({ tag: 1, channels: 2, rate, bits: 16 }, new Uint8Array(data.buffer));
}

async function analyzeJson(...argv: string[]): Promise<FileResult[]> {
  const r = await cli(['analyze', ...argv, '--json']);
  expect(r.stderr).toBe('');
  expect(r.code).toBe(0);
  return JSON.parse(r.stdout) as FileResult[];
}

/** Share of a sine's samples with |x| in [lo, hi): (2/pi)(asin(hi/A) - asin(lo/A)) (amplitude density of a sine). */
function sineShare(lo: number, hi: number, a: number): number {
  const c = (e: number) => (2 / Math.PI) * Math.asin(Math.min(1, e / a));
  return c(hi) - c(lo);
}

describe('analyze --json', () => {
  it('has our documented field names, one object per file', async () => {
    const [r] = await analyzeJson(f('sine48.wav'), '-c', 'g711-a', '-c', 'uniform:12');
    expect(Object.keys(r).slice(0, 6)).toEqual([
      'file',
      'activeLevelDbov',
      'activityFactor',
      'peakDbov',
      'overloads',
      'channels',
    ]);
    expect(r.file).toBe(f('sine48.wav'));
    expect(r.channels.map((c) => c.name)).toEqual(['g711-a', 'uniform:12']);
    const c = r.channels[0];
    expect(Object.keys(c)).toEqual(expect.arrayContaining(['name', 'snrDb', 'segSnrDb', 'segments']));
    expect(Object.keys(c.segSnrDb)).toEqual(['mean', 'p5', 'p50', 'p95']);
    expect(Object.keys(c.segments[0])).toEqual(expect.arrayContaining(['index', 'share', 'snrDb']));
    expect(c.segments.map((s) => s.index)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
  });

  it('measures a 1020 Hz tone at amplitude 0.1 as the handbooks predict', async () => {
    const [r] = await analyzeJson(f('sine48.wav'), '-c', 'g711-a', '-c', 'uniform:12');
    // A steady tone is active throughout (P.56 definition of activity), at its RMS level
    // 20 log10(0.1 / sqrt 2) = -23.01 dBov re the A-law overload point 1.0 (arithmetic);
    // the first 0.2 s while the envelope rises may count as inactive.
    expect(r.activeLevelDbov).toBeCloseTo(-23.01, 1);
    expect(r.activityFactor).toBeGreaterThan(0.95);
    // Peak of the band-limited tone: 20 log10(0.1) = -20 dBov (arithmetic), within filter ripple.
    expect(r.peakDbov as number).toBeCloseTo(-20, 0);
    expect(r.overloads).toBe(0);
    const [a, u] = r.channels;
    // Uniform N bits, sine of amplitude A: 6.02 N + 1.76 + 20 log10 A dB (Jayant and Noll 1984, from memory):
    // 72.24 + 1.76 - 20 = 54.0 dB.
    expect(u.snrDb as number).toBeGreaterThan(53.6);
    expect(u.snrDb as number).toBeLessThan(54.4);
    // A-law log region: 6.02 N + 4.77 - 20 log10(1 + ln A) = 38.2 dB (Jayant and Noll 1984, from memory),
    // a constant across levels, so frames agree with the whole.
    expect(a.snrDb as number).toBeGreaterThan(37.2);
    expect(a.snrDb as number).toBeLessThan(39.2);
    expect(Math.abs((a.segSnrDb.mean as number) - (a.snrDb as number))).toBeLessThan(0.3);
    expect(a.segSnrDb.p5 as number).toBeLessThanOrEqual(a.segSnrDb.p50 as number);
    expect(a.segSnrDb.p50 as number).toBeLessThanOrEqual(a.segSnrDb.p95 as number);
    // Occupancy of the A-law chords (ends 32, 64, ..., 4096 of 4096 in 13-bit units, G.711 from
    // memory): the sine's amplitude density over each chord.
    const ends = [0, 1 / 128, 1 / 64, 1 / 32, 1 / 16, 1 / 8, 1 / 4, 1 / 2, 1];
    a.segments.forEach((s, k) => expect(s.share).toBeCloseTo(sineShare(ends[k], ends[k + 1], AMP), 2));
    expect(a.segments[7].share).toBe(0);
    expect(a.segments[7].snrDb).toBeNull();
    // Per channel, the talker in dBov of that channel's overload point (both 1.0 here).
    expect(u.activeLevelDbov as number).toBeCloseTo(r.activeLevelDbov as number, 9);
    expect(a.activityFactor).toBe(r.activityFactor);
  });

  it('gives each channel the talker level in dBov of its own overload point', async () => {
    const [r] = await analyzeJson(f('sine48.wav'), '-c', 'g711-a', '-c', 'g711-mu');
    const [a, mu] = r.channels;
    // G.711 mu-law overloads at 8159/8192 of A-law's full scale (G.711, from memory): 0.035 dB lower.
    expect((mu.activeLevelDbov as number) - (a.activeLevelDbov as number)).toBeCloseTo(
      -20 * Math.log10(8159 / 8192),
      9,
    );
    expect((mu.peakDbov as number) - (a.peakDbov as number)).toBeCloseTo(-20 * Math.log10(8159 / 8192), 9);
  });

  it('--align -26 brings the active level to -26 dBov and says so', async () => {
    const [r] = await analyzeJson(f('talk.wav'), '--align', '-26', '-c', 'g711-mu');
    expect(r.alignedToDbov).toBe(-26);
    // The gain is the target minus what the first pass measured (by definition).
    expect(r.gainDb).toBeCloseTo(-26 - (r.measuredActiveLevelDbov as number), 12);
    // P.56 reads the gained signal 0.1 dB or less off the target (its threshold ladder is fixed in dB).
    expect(r.activeLevelDbov as number).toBeCloseTo(-26, 1);
    const [plain] = await analyzeJson(f('talk.wav'), '-c', 'g711-mu');
    expect(plain.gainDb).toBe(0);
    expect(plain.activeLevelDbov as number).toBeCloseTo(r.measuredActiveLevelDbov as number, 6);
    const text = await cli(['analyze', f('talk.wav'), '--align=-26']);
    expect(text.stdout).toMatch(
      /aligned: gain [+-]\d+\.\d\d dB brings the active level from -\d+\.\d\d to -26\.00 dBov/,
    );
  });

  it('converts a 44.1 kHz file and measures it as the 48 kHz one', async () => {
    const [r44] = await analyzeJson(f('sine44.wav'), '-c', 'uniform:12');
    const [r48] = await analyzeJson(f('sine48.wav'), '-c', 'uniform:12');
    expect(r44.sampleRate).toBe(44100);
    expect(r44.pathRate).toBe(48000);
    expect(r44.seconds).toBeCloseTo(6, 9);
    // The same tone: the same handbook SNR (54.0 dB, see above) and level.
    expect(r44.channels[0].snrDb as number).toBeCloseTo(r48.channels[0].snrDb as number, 0);
    expect(r44.activeLevelDbov as number).toBeCloseTo(r48.activeLevelDbov as number, 1);
  });

  it('reads the channel --track names from a stereo file (default the first)', async () => {
    const [first, second] = await Promise.all([
      analyzeJson(f('stereo.wav')),
      analyzeJson(f('stereo.wav'), '--track', '2'),
    ]);
    // Left: the tone at 0.1, right: at 0.01, so levels 20 dB apart (arithmetic).
    expect((first[0].activeLevelDbov as number) - (second[0].activeLevelDbov as number)).toBeCloseTo(20, 1);
  });

  it('reads headerless G.711 with --raw', async () => {
    const [r] = await analyzeJson(f('tone.mu'), '--raw', 'mu', '-c', 'g711-mu', '-c', 'g711-a');
    expect(r.sampleRate).toBe(8000);
    expect(r.seconds).toBeCloseTo(3, 9);
    // Decoded G.711 values are output levels of the same law, so coding them again loses
    // nothing (G.711 tables: each output value lies inside its own cell): no error, no SNR.
    expect(r.channels[0].snrDb).toBeNull();
    // Through A-law they are coded again, about as well as the tone itself (38 dB, see above).
    expect(r.channels[1].snrDb as number).toBeGreaterThan(34);
  });

  it('reports each stage of a tandem channel and the loss it adds', async () => {
    const [r] = await analyzeJson(
      f('talk.wav'),
      '-c',
      'g711-mu>g711-a>g711-mu',
      '-c',
      'g711-mu',
      '-c',
      'g711-mu>g711-a',
    );
    const [tandem, one, two] = r.channels;
    expect(tandem.stages.map((s) => s.name)).toEqual(['g711-mu', 'g711-a', 'g711-mu']);
    // Stage s's figure is the channel of the first s stages measured alone (definition).
    expect(tandem.stages[0].snrDb as number).toBeCloseTo(one.snrDb as number, 9);
    expect(tandem.stages[1].snrDb as number).toBeCloseTo(two.snrDb as number, 9);
    expect(tandem.stages[2].snrDb).toBe(tandem.snrDb);
    expect(tandem.stages[0].lossDb).toBeNull();
    expect(tandem.stages[1].lossDb as number).toBeCloseTo((one.snrDb as number) - (two.snrDb as number), 9);
    // Coding mu-law output again with A-law adds noise (common practice, no source).
    expect(tandem.stages[1].lossDb as number).toBeGreaterThan(0.5);
    expect(one.stages).toHaveLength(1);
    const text = await cli(['analyze', f('talk.wav'), '-c', 'g711-mu>g711-a>g711-mu']);
    expect(text.stdout).toMatch(
      /tandem g711-mu>g711-a>g711-mu, SNR after each stage: g711-mu [\d.]+ dB > g711-a [\d.]+ dB \(loss [\d.]+\)/,
    );
  });

  it('--weighting adds the O.41-weighted SNR, above the flat figure for a white error', async () => {
    const [r] = await analyzeJson(f('talk.wav'), '-c', 'uniform:10', '--weighting');
    const c = r.channels[0];
    // Psophometric weighting lowers flat noise (about 2.5 dB over 300-3400 Hz, more over the
    // whole 0-4000 Hz band: ITU-T O.41, from memory), so the weighted SNR is a few dB higher.
    expect((c.weightedSnrDb as number) - (c.snrDb as number)).toBeGreaterThan(2);
    expect((c.weightedSnrDb as number) - (c.snrDb as number)).toBeLessThan(6);
    const [flat] = await analyzeJson(f('talk.wav'), '-c', 'uniform:10');
    expect(flat.channels[0].weightedSnrDb).toBeUndefined();
  });

  it('prints CSV with one row per file and channel, agreeing with the JSON', async () => {
    const args = [f('sine48.wav'), f('talk.wav'), '-c', 'g711-mu', '-c', 'uniform:8'];
    const csv = await cli(['analyze', ...args, '--csv']);
    expect(csv.code).toBe(0);
    const [head, ...rows] = csv.out;
    const cols = head.split(',');
    expect(cols.slice(0, 3)).toEqual(['file', 'channel', 'rate']);
    expect(rows).toHaveLength(4);
    const json = await analyzeJson(...args);
    const snr = cols.indexOf('snrDb');
    const seg3 = cols.indexOf('seg3Share');
    rows.forEach((row, i) => {
      const cells = row.split(',');
      const c = json[i >> 1].channels[i & 1];
      expect(cells[1]).toBe(c.name);
      expect(Number(cells[snr])).toBe(c.snrDb);
      expect(Number(cells[seg3])).toBe(c.segments[2].share);
    });
  });
});

describe('analyze with bad files among good ones', () => {
  it('analyses the rest, names each failure with its reason, exits 1, no stack trace', async () => {
    const files = [f('sine48.wav'), f('missing.wav'), f('junk.wav'), f('folder.wav'), f('talk.wav')];
    const r = await cli(['analyze', ...files, '--json']);
    expect(r.code).toBe(1);
    const results = JSON.parse(r.stdout) as FileResult[];
    expect(results.map((x) => x.file)).toEqual([f('sine48.wav'), f('talk.wav')]);
    expect(r.err[0]).toBe(`quantiscope analyze: ${f('missing.wav')}: no such file`);
    expect(r.err[1]).toMatch(new RegExp(`^quantiscope analyze: ${f('junk.wav')}: \\S.+`));
    expect(r.err[2]).toBe(`quantiscope analyze: ${f('folder.wav')}: is a directory, not an audio file`);
    expect(r.err[3]).toBe('quantiscope analyze: 3 of 5 files failed');
    expect(r.stderr).not.toMatch(/\n\s+at |Error:/);
  });

  it('refuses a track the file lacks', async () => {
    const r = await cli(['analyze', f('sine48.wav'), '--track', '2']);
    expect(r.code).toBe(1);
    expect(r.err[0]).toBe(`quantiscope analyze: ${f('sine48.wav')}: --track 2: the file has 1 channel`);
  });
});
