// quantiscope design: Lloyd-Max for the files' active frames against the published
// Laplacian tables, --recommend against the handbook SNR of uniform quantizers, and both
// against the page's own path (core's Analyzer, FrameLevelTally, designForTalker).
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Analyzer } from '../../core/analysis/analyzer';
import { FrameLevelTally } from '../../core/design/frame-tally';
import { recommend, type Recommendation } from '../../core/design/recommend';
import { DEFAULT_TALKER_TARGET, designForTalker } from '../../core/design/talker-design';
import { fillLaplacian } from '../../core/signals/noise';
import { Xoshiro128 } from '../../core/signals/random';
import { formatChannel } from '../../core/spec/format';
import type { DesignReport } from '../../main/cli/commands/design';
import { cli, talker, tempDir, toPcm16, writePcm16 } from './cli-fixtures';

let dir: string;
let remove: () => Promise<void>;
const f = (name: string) => path.join(dir, name);
let sigma = 0;
let talk: Float64Array;

beforeAll(async () => {
  ({ dir, remove } = await tempDir('qs-design-'));
  // Laplacian noise at 8 kHz (seeded, invented): the file's samples are what the 8 kHz quantizer sees.
  const x = new Float64Array(8000 * 20);
  fillLaplacian(new Xoshiro128(3), x, 0.05);
  let s2 = 0;
  for (const v of x) s2 += Math.round(v * 32768) ** 2;
  sigma = Math.sqrt(s2 / x.length) / 32768;
  // Split over two files: their frames add up to one record.
  await writePcm16(f('l1.wav'), 8000, x.subarray(0, 80000));
  await writePcm16(f('l2.wav'), 8000, x.subarray(80000));
  // Bursts at -20, -26 and -32 dBov RMS with deep pauses (under the -60 dBov silence floor).
  talk = talker(8000, 20, 4, [-20, -26, -32]);
  await writePcm16(f('talk.wav'), 8000, talk);
});

afterAll(() => remove());

describe('design --bits', () => {
  // Was: Max's Gaussian table from Gaussian noise, when the command designed for the sample
  // level spread. It now designs for the active frames, each a Laplacian at its level, as the
  // page does; so the reference is the Laplacian table, from Laplacian noise.
  it('designs the 3-bit Laplacian Lloyd-Max quantizer from Laplacian noise files', async () => {
    const r = await cli(['design', f('l1.wav'), f('l2.wav'), '--bits', '3', '--json']);
    expect(r.code).toBe(0);
    const d = (JSON.parse(r.stdout) as { design: DesignReport }).design;
    expect(d.files).toEqual([f('l1.wav'), f('l2.wav')]);
    expect(d.frames).toBe(1000); // 20 s of 20 ms frames, none silent
    // Paez and Glisson (1972), Laplacian, unit variance, N = 8 levels (from memory): thresholds
    // 0.533, 1.253, 2.380; outputs 0.233, 0.833, 1.673, 3.087. Frame levels of 160 Laplacian
    // samples scatter by about 0.8 dB, which widens the talker's mixture a little: 2 % allowed.
    const t = [0.533, 1.253, 2.38];
    const y = [0.233, 0.833, 1.673, 3.087];
    d.decisions.forEach((v, i) => expect(Math.abs(v / sigma / t[i] - 1), `t${i + 1}`).toBeLessThan(0.02));
    d.outputs.forEach((v, i) => expect(Math.abs(v / sigma / y[i] - 1), `y${i + 1}`).toBeLessThan(0.02));
    // Its SNR, 12.64 dB for 3 bits (Jayant and Noll 1984, Laplacian Lloyd-Max, from memory).
    expect(Math.abs(d.predictedSnrDb - 12.64)).toBeLessThan(0.15);
    expect(Math.abs((d.measuredSnrDb as number) - 12.64)).toBeLessThan(0.2);
    // The printed channel text is a channel the other commands take.
    const again = await cli(['analyze', f('l1.wav'), '-c', d.channel, '--json']);
    expect(again.code).toBe(0);
  });

  it('prints the table with predicted and measured SNR', async () => {
    const r = await cli(['design', f('l1.wav'), '--bits', '2', '--method', 'panter-dite']);
    expect(r.code).toBe(0);
    expect(r.out[0]).toMatch(/^panter-dite quantizer, 2 bits \(4 levels/);
    expect(r.stdout).toMatch(/predicted SNR +\d+\.\d\d dB/);
    expect(r.stdout).toMatch(/measured SNR +\d+\.\d\d dB on the files/);
    expect(r.stdout).toMatch(/channel text: table:talker-pd-2:/);
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
    // Explicit --share 0.99 here; the default is the page's 95 % (DEFAULT_TALKER_TARGET).
    const text = await cli(['design', f('talk.wav'), '--recommend', '--share', '0.99']);
    expect(text.stdout).toContain('target 30.0 dB in 99.00 % of the frames');
    expect(text.stdout).toMatch(new RegExp(`cheapest that meets it: ${chosen.id.replace(/[.]/g, '\\.')} at`));
  });

  it('refuses to design for no readable file', async () => {
    const r = await cli(['design', f('none.wav'), '--bits', '4']);
    expect(r.code).toBe(1);
    expect(r.err[0]).toBe(`quantiscope design: ${f('none.wav')}: no such file`);
  });
});

describe('design and the page agree', () => {
  it('gives the table and the candidate that core gives for the frames the page tallies', async () => {
    const bits = await cli(['design', f('talk.wav'), '--bits', '4', '--json']);
    const rec = await cli(['design', f('talk.wav'), '--recommend', '--json']);
    expect(bits.code).toBe(0);
    expect(rec.code).toBe(0);
    const d = (JSON.parse(bits.stdout) as { design: DesignReport }).design;
    const r = (JSON.parse(rec.stdout) as { recommendation: Recommendation }).recommendation;

    // The page's path on the same samples (the file's 16-bit values): core's Analyzer fed in
    // 128-sample render quanta, channel A's frame trace tallied from snapshots as they come.
    const samples = Float64Array.from(toPcm16(talk), (v) => v / 32768);
    const analyzer = new Analyzer({ inputRate: 8000, channels: ['uniform:16'], maxBlock: 128 });
    const tally = new FrameLevelTally();
    const take = () => {
      const ch = analyzer.snapshot().channels[0].meter;
      tally.add(ch.segmental, ch.overloadPoint);
    };
    for (let at = 0; at < samples.length; at += 128) {
      analyzer.process(samples.subarray(at, Math.min(at + 128, samples.length)));
      if ((at / 128) % 10 === 9) take();
    }
    analyzer.finish();
    take();
    const frames = tally.levels();
    expect(frames).not.toBeNull();
    // Same frames, same table to the last bit (one binning and one design; common practice, no source).
    expect(d.frames).toBe(tally.frames);
    const direct = designForTalker(frames!, 4);
    expect(d.channel).toBe(formatChannel({ stages: [direct.stage], rate: 8000 }));
    expect(d.predictedSnrDb).toBe(direct.snrDb);
    // And the same recommendation against the same default target.
    expect(r.targetSnrDb).toBe(DEFAULT_TALKER_TARGET.targetSnrDb);
    expect(r.share).toBe(DEFAULT_TALKER_TARGET.share);
    const page = recommend(frames!, { ...DEFAULT_TALKER_TARGET, rateHz: 8000 });
    expect(r.chosen).toBeGreaterThanOrEqual(0);
    expect(r.candidates[r.chosen].id).toBe(page.candidates[page.chosen].id);
    expect(r.candidates.map((c) => c.predictedShare)).toEqual(page.candidates.map((c) => c.predictedShare));
  });
});
