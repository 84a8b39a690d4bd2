// quantiscope compare on a "foreign" channel: the output made by an independent
// G.711 coder (the npm package alawmulaw), delayed and scaled by known amounts.
import path from 'node:path';
import { mulaw } from 'alawmulaw';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeWavFile } from '../../main/cli/audio-file';
import type { FileResult } from '../../main/cli/analyze-file';
import type { CompareReport } from '../../main/cli/commands/compare';
import { cli, gaussian, talker, tempDir, toPcm16, writePcm16 } from './cli-fixtures';

let dir: string;
let remove: () => Promise<void>;
const f = (name: string) => path.join(dir, name);
const DELAY = 37;
const GAIN = 0.5;

beforeAll(async () => {
  ({ dir, remove } = await tempDir('qs-compare-'));
  const ref = talker(8000, 8, 9, [-20, -26, -32]);
  await writePcm16(f('ref.wav'), 8000, ref);
  const scaled = Float64Array.from(ref, (v) => GAIN * v);
  await writePcm16(f('half.wav'), 8000, scaled);
  const out = new Float64Array(ref.length);
  for (let n = DELAY; n < out.length; n++) out[n] = scaled[n - DELAY];
  // The device: alawmulaw's mu-law coder, stored as a mu-law WAV file.
  await writeWavFile(f('device.wav'), {
    encoding: 'mulaw',
    sampleRate: 8000,
    codes: mulaw.encode(toPcm16(out)),
  });
  await writePcm16(f('ref48.wav'), 48000, talker(48000, 4, 10, [-22, -30]));
  await writePcm16(f('other.wav'), 8000, gaussian(8000, 8, 0.05, 77));
});

afterAll(() => remove());

async function compare(...argv: string[]) {
  const r = await cli(['compare', ...argv, '--json']);
  return { ...r, report: r.code === 0 ? (JSON.parse(r.stdout) as CompareReport) : null };
}

describe('compare', () => {
  it('finds the delay and gain and measures what the coder did', async () => {
    const { code, stderr, report } = await compare(f('ref.wav'), f('device.wav'));
    expect(code).toBe(0);
    expect(stderr).toBe('');
    const r = report as CompareReport;
    expect(r.delaySamples).toBe(DELAY);
    expect(r.delayMs).toBeCloseTo((1000 * DELAY) / 8000, 12);
    // Least squares meets the true gain to the coder's noise (about -37 dB: a few 0.1 %).
    expect(r.gain).toBeCloseTo(GAIN, 2);
    expect(r.correlation).toBeGreaterThan(0.999);
    expect(r.reliable).toBe(true);
    expect(r.warnings).toEqual([]);
    // OUT is mu-law, so the ledger is the mu-law chords.
    expect(r.ledger).toBe('g711-mu');
    expect(r.segments).toHaveLength(8);
    // The same figures as our own G.711 mu-law channel on the scaled signal: both codes are
    // G.711 (alawmulaw and ours agree but for ties, see test/core/g711-alawmulaw.test.ts).
    const [own] = JSON.parse(
      (await cli(['analyze', f('half.wav'), '-c', 'g711-mu', '--json'])).stdout,
    ) as FileResult[];
    expect(r.snrDb as number).toBeCloseTo(own.channels[0].snrDb as number, 0);
    expect(Math.abs((r.snrDb as number) - (own.channels[0].snrDb as number))).toBeLessThan(0.2);
    expect(r.segSnrDb.mean as number).toBeCloseTo(own.channels[0].segSnrDb.mean as number, 0);
    expect(r.activeLevelDbov as number).toBeCloseTo(own.activeLevelDbov as number, 1);
  });

  it('brings a 48 kHz reference to the 8 kHz output through the channel path', async () => {
    expect((await cli(['encode', f('ref48.wav'), f('ref48.mu.wav'), '--law', 'mu'])).code).toBe(0);
    const { code, report } = await compare(f('ref48.wav'), f('ref48.mu.wav'));
    expect(code).toBe(0);
    const r = report as CompareReport;
    expect(r.rate).toBe(8000);
    expect(r.reliable).toBe(true);
    // Both went through the same filters, so the delay is a whole number of samples.
    expect(Math.abs(r.delayFraction)).toBeLessThan(0.05);
    expect(r.gain).toBeCloseTo(1, 2);
    // G.711 mu-law on speech-like levels: mid to high 30s dB (log region 38 dB, Jayant and Noll 1984, from memory).
    expect(r.snrDb as number).toBeGreaterThan(32);
  });

  it('says when the alignment is unreliable', async () => {
    const { code, report, err } = await compare(f('ref.wav'), f('other.wav'));
    expect(code).toBe(0);
    const r = report as CompareReport;
    expect(r.reliable).toBe(false);
    expect(Math.abs(r.correlation)).toBeLessThan(0.1);
    expect(r.warnings[0]).toMatch(/^alignment unreliable: normalised correlation -?0\.\d+ is below 0\.9/);
    expect(err[0]).toMatch(/^quantiscope compare: alignment unreliable/);
    const text = await cli(['compare', f('ref.wav'), f('other.wav')]);
    expect(text.stdout).toContain('UNRELIABLE');
  });

  it('names a missing file', async () => {
    const r = await cli(['compare', f('ref.wav'), f('gone.wav')]);
    expect(r.code).toBe(1);
    expect(r.stderr).toBe(`quantiscope compare: ${f('gone.wav')}: no such file`);
  });
});
