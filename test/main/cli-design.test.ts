// quantiscope design: Lloyd-Max from the files' level spread against Max's published
// Gaussian tables, and --recommend against the handbook SNR of uniform quantizers.
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DesignReport } from '../../main/cli/commands/design';
import type { Recommendation } from '../../core/design/recommend';
import { cli, gaussian, talker, tempDir, writePcm16 } from './cli-fixtures';

let dir: string;
let remove: () => Promise<void>;
const f = (name: string) => path.join(dir, name);
let sigma = 0;

beforeAll(async () => {
  ({ dir, remove } = await tempDir('qs-design-'));
  // Gaussian noise at 8 kHz: the file's samples are what the 8 kHz quantizer sees.
  const x = gaussian(8000, 20, 0.05, 3);
  let s2 = 0;
  for (const v of x) s2 += Math.round(v * 32768) ** 2;
  sigma = Math.sqrt(s2 / x.length) / 32768;
  // Split over two files: their level spreads add.
  await writePcm16(f('g1.wav'), 8000, x.subarray(0, 80000));
  await writePcm16(f('g2.wav'), 8000, x.subarray(80000));
  // Bursts at -20, -26 and -32 dBov RMS with deep pauses (well under the P.56 threshold).
  await writePcm16(f('talk.wav'), 8000, talker(8000, 20, 4, [-20, -26, -32]));
});

afterAll(() => remove());

describe('design --bits', () => {
  it("designs Max's 3-bit Gaussian quantizer from Gaussian noise files", async () => {
    const r = await cli(['design', f('g1.wav'), f('g2.wav'), '--bits', '3', '--json']);
    expect(r.code).toBe(0);
    const d = (JSON.parse(r.stdout) as { design: DesignReport }).design;
    expect(d.files).toEqual([f('g1.wav'), f('g2.wav')]);
    // J. Max (1960), Gaussian, unit variance, N = 3 (from memory): thresholds 0.5006, 1.050,
    // 1.748; outputs 0.2451, 0.7560, 1.344, 2.152. The files' histogram (0.5 dB bins) and a
    // finite sample leave about 1 % off.
    const t = [0.5006, 1.05, 1.748];
    const y = [0.2451, 0.756, 1.344, 2.152];
    d.decisions.forEach((v, i) => expect(Math.abs(v / sigma / t[i] - 1), `t${i + 1}`).toBeLessThan(0.02));
    d.outputs.forEach((v, i) => expect(Math.abs(v / sigma / y[i] - 1), `y${i + 1}`).toBeLessThan(0.02));
    // Max's mean squared error 0.03455 for N = 3: SNR 10 log10(1 / 0.03455) = 14.62 dB.
    expect(d.predictedSnrDb).toBeCloseTo(14.62, 0);
    expect(d.measuredSnrDb as number).toBeCloseTo(14.62, 0);
    expect(Math.abs((d.measuredSnrDb as number) - d.predictedSnrDb)).toBeLessThan(0.2);
    // The printed channel text is a channel the other commands take.
    const again = await cli(['analyze', f('g1.wav'), '-c', d.channel, '--json']);
    expect(again.code).toBe(0);
  });

  it('prints the table with predicted and measured SNR', async () => {
    const r = await cli(['design', f('g1.wav'), '--bits', '2', '--method', 'panter-dite']);
    expect(r.code).toBe(0);
    expect(r.out[0]).toMatch(/^panter-dite quantizer, 2 bits \(4 levels/);
    expect(r.stdout).toMatch(/predicted SNR +\d+\.\d\d dB/);
    expect(r.stdout).toMatch(/measured SNR +\d+\.\d\d dB on the files/);
    expect(r.stdout).toMatch(/channel text: table:files-pd-2:/);
  });
});

describe('design --recommend', () => {
  it('ranks the candidates by bit rate and picks the cheapest that meets 30 dB in 99 %', async () => {
    const r = await cli([
      'design',
      f('talk.wav'),
      '--recommend',
      '--target-snr',
      '30',
      '--share',
      '0.99',
      '--json',
    ]);
    expect(r.code).toBe(0);
    const rec = (JSON.parse(r.stdout) as { recommendation: Recommendation }).recommendation;
    const rates = rec.candidates.map((c) => c.bitRate);
    expect(rates).toEqual([...rates].sort((a, b) => a - b));
    expect(rec.chosen).toBe(rec.candidates.findIndex((c) => c.meets));
    const meets = (id: string) => rec.candidates.find((c) => c.id === id)?.meets;
    // Uniform N bits, granular noise only: SNR = 6.02 N + 4.77 + L for frames at L dBov
    // (Jayant and Noll 1984, from memory). The softest bursts sit near -32 dBov, so 10 bits
    // give about 33 dB there and 9 bits about 27 dB.
    expect(meets('uniform:10')).toBe(true);
    expect(meets('uniform:9')).toBe(false);
    // G.711 mu-law's log region, 6.02*8 + 4.77 - 20 log10(ln 256) = 38.1 dB (same source), clears 30 dB.
    expect(meets('g711-mu')).toBe(true);
    const chosen = rec.candidates[rec.chosen];
    expect(chosen.bitRate).toBeLessThanOrEqual(64000);
    const text = await cli(['design', f('talk.wav'), '--recommend']);
    expect(text.stdout).toContain('target 30.0 dB in 99.00 % of the frames');
    expect(text.stdout).toMatch(new RegExp(`cheapest that meets it: ${chosen.id.replace(/[.]/g, '\\.')} at`));
  });

  it('refuses to design for no readable file', async () => {
    const r = await cli(['design', f('none.wav'), '--bits', '4']);
    expect(r.code).toBe(1);
    expect(r.err[0]).toBe(`quantiscope design: ${f('none.wav')}: no such file`);
  });
});
