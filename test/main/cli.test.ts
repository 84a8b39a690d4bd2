// The command line's channel figures, against ITU-T G.711 and plain arithmetic.
import { describe, expect, it } from 'vitest';
import { channelFigures, EXIT_FAILURE, EXIT_OK, EXIT_USAGE, runCli } from '../../main/cli/run';

async function run(...argv: string[]) {
  const out: string[] = [];
  const err: string[] = [];
  const code = await runCli(argv, { out: (l) => out.push(l), err: (l) => err.push(l) }, '9.9.9');
  return { code, out, err };
}

describe('quantiscope channel', () => {
  it('describes G.711 mu-law as the standard does', () => {
    const f = channelFigures('g711-mu');
    // G.711: 8000 samples/s, 8-bit codes, so 64 kbit/s.
    expect(f.bits).toBe(8);
    expect(f.rateHz).toBe(8000);
    expect(f.bitRate).toBe(64000);
    // G.711 mu-law: last decision value 8159 in 14-bit units (from memory), x4 to 16-bit PCM.
    expect(f.overloadPcm16).toBeCloseTo(8159 * 4, 9);
    // G.711 section 5: theoretical load capacity +3.17 dBm0 for mu-law (from memory).
    expect(f.loadCapacityDbm0).toBeCloseTo(3.17, 9);
    // G.711 has 8 chords (segments) per polarity.
    expect(f.segmentCount).toBe(8);
  });

  it('describes G.711 A-law and a 12-bit uniform channel', () => {
    const a = channelFigures('g711-a');
    // G.711 A-law: 4096 in 13-bit units (from memory), x8 to 16-bit PCM = full scale.
    expect(a.overloadPcm16).toBeCloseTo(32768, 9);
    // G.711 section 5: +3.14 dBm0 for A-law (from memory).
    expect(a.loadCapacityDbm0).toBeCloseTo(3.14, 9);
    const u = channelFigures('uniform:12');
    // 12 bits x 8000 samples/s (arithmetic).
    expect(u.bitRate).toBe(96000);
    expect(u.bits).toBe(12);
  });

  it('prints text and JSON', async () => {
    const text = await run('channel', 'mu:255:8');
    expect(text.code).toBe(EXIT_OK);
    expect(text.out.join('\n')).toMatch(/bit rate\s+64 kbit\/s/);
    const json = await run('channel', '--json', 'g711-a', 'uniform:8');
    expect(json.code).toBe(EXIT_OK);
    const parsed = JSON.parse(json.out.join('')) as {
      bitRate: number;
      segmentEdgesDbov: (number | null)[];
    }[];
    expect(parsed.map((p) => p.bitRate)).toEqual([64000, 64000]);
    // The first edge (zero amplitude) is -Infinity, which JSON cannot carry.
    expect(parsed[0].segmentEdgesDbov[0]).toBeNull();
  });

  it('refuses bad text with a message naming the bad part', async () => {
    const r = await run('channel', 'mu:abc:8');
    expect(r.code).toBe(EXIT_FAILURE);
    expect(r.err.join('\n')).toContain('abc');
  });

  it('handles usage errors', async () => {
    expect((await run()).code).toBe(EXIT_USAGE);
    expect((await run('--help')).code).toBe(EXIT_OK);
    expect((await run('--version')).out).toEqual(['9.9.9']);
    expect((await run('channel')).code).toBe(EXIT_USAGE);
    expect((await run('channel', '--bogus', 'g711-mu')).code).toBe(EXIT_USAGE);
    expect((await run('frobnicate')).code).toBe(EXIT_USAGE);
    expect((await run('presets')).out.some((l) => l.startsWith('g711-mu'))).toBe(true);
  });
});
