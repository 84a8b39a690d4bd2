// quantiscope sweep: SNR versus level against the G.712 mask, pass/fail in the exit status.
import { describe, expect, it } from 'vitest';
import type { SweepReport } from '../../main/cli/commands/sweep';
import { cli } from './cli-fixtures';

async function sweepJson(...argv: string[]): Promise<{ code: number; reports: SweepReport[] }> {
  const r = await cli(['sweep', ...argv, '--json']);
  return { code: r.code, reports: JSON.parse(r.stdout) as SweepReport[] };
}

describe('sweep', () => {
  it('passes G.711 mu-law against the G.712 sine mask, exit 0', async () => {
    // G.711 channels are built to meet G.712's signal-to-total-distortion mask (common practice, no source).
    const r = await cli(['sweep', '--channel', 'g711-mu', '--from', '-45', '--to', '0', '--step', '5']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/PASS against "G\.712 sine method" \(10 levels judged/);
    expect(r.stdout).not.toContain('FAIL');
  });

  it('fails an 8-bit uniform channel at low levels, exit 1, with the handbook SNR', async () => {
    const uniform8 = ['-c', 'uniform:8', '--from', '-40', '--to', '0', '--step', '10'];
    const { code, reports } = await sweepJson(...uniform8);
    expect(code).toBe(1);
    const [r] = reports;
    expect(r.judgement?.pass).toBe(false);
    for (const p of r.points) {
      // Uniform N bits, sine of amplitude A re the overload point: 6.02 N + 1.76 + 20 log10 A
      // (Jayant and Noll 1984, from memory); A in dB is the level in dBov + 3.01 (sine crest).
      const handbook = 6.02 * 8 + 1.76 + p.dbov + 3.01;
      if (p.dbm0 >= -30) expect(Math.abs(p.widebandDb - handbook), String(p.dbm0)).toBeLessThan(0.5);
    }
    // The mask's 35 dB at -30 dBm0 (G.712, from memory) against about 16.6 dB.
    const at30 = r.judgement?.verdicts.find((v) => v.dbm0 === -30);
    expect(at30?.requiredDb).toBe(35);
    expect(at30?.pass).toBe(false);
    const text = await cli(['sweep', ...uniform8]);
    expect(text.stdout).toMatch(/FAIL against "G\.712 sine method": 3 of 5 levels below the mask/);
    expect(text.stderr).toBe('quantiscope sweep: uniform:8 failed the mask');
  });

  it('holds a custom mask and the wideband figure when asked', async () => {
    const aLaw = ['-c', 'g711-a', '--from', '-20', '--to', '0', '--step', '10'];
    const strict = await cli(['sweep', ...aLaw, '--mask', '-30:45,0:45']);
    expect(strict.code).toBe(1);
    const none = await sweepJson(...aLaw, '--mask', 'none');
    expect(none.code).toBe(0);
    expect(none.reports[0].judgement).toBeNull();
    const wide = await sweepJson(...aLaw, '--figure', 'wideband');
    expect(wide.reports[0].judgement?.figure).toBe('wideband');
  });

  it('shows the SNR after each stage of a tandem', async () => {
    const args = ['--from', '-40', '--to', '0', '--step', '10'];
    const { reports } = await sweepJson('-c', 'g711-mu>g711-a', '-c', 'g711-mu', ...args);
    const [tandem, single] = reports;
    expect(tandem.stageSweeps.map((s) => s.stage)).toEqual(['g711-mu', 'g711-a']);
    // After stage 1 the tandem is the first stage alone; after the last, the channel (definition).
    expect(tandem.stageSweeps[0].inBandDb).toEqual(single.points.map((p) => p.inBandDb));
    expect(tandem.stageSweeps[1].inBandDb).toEqual(tandem.points.map((p) => p.inBandDb));
    expect(single.stageSweeps).toEqual([]);
    // A second coder adds its own noise: lower SNR than the first alone at mid levels (common practice, no source).
    const at20 = tandem.points.findIndex((p) => p.dbm0 === -20);
    expect(tandem.points[at20].widebandDb).toBeLessThan(single.points[at20].widebandDb);
    const text = await cli(['sweep', '-c', 'g711-mu>g711-a', ...args]);
    expect(text.out[1]).toMatch(/after 1/);
  });

  it('prints CSV, one row per channel and level', async () => {
    const r = await cli([
      'sweep',
      '-c',
      'g711-mu',
      '-c',
      'g711-a',
      '--from',
      '-10',
      '--to',
      '0',
      '--step',
      '5',
      '--csv',
    ]);
    expect(r.code).toBe(0);
    expect(r.out[0]).toBe(
      'channel,dbm0,dbov,widebandDb,inBandDb,theoryDb,overloadShare,requiredDb,marginDb,pass',
    );
    expect(r.out).toHaveLength(1 + 2 * 3);
    expect(r.out[1].startsWith('g711-mu,-10,')).toBe(true);
    expect(r.out[1].split(',')[9]).toBe('pass');
  });
});
