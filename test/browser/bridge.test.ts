// Renderer-side decisions that need no browser: which shell bridge the page uses, and
// the monitor volume cap (hearing safeguard: output capped, common practice, no source).
import { describe, expect, it } from 'vitest';
import type { ShellBridge } from '../../core/bridge';
import { pickBridge } from '../../renderer/bridge';
import { clampVolumeDb, OUTPUT_CAP_DB, OUTPUT_MIN_DB, OUTPUT_START_DB } from '../../renderer/audio/engine';

describe('pickBridge', () => {
  it("uses the preload's bridge when Electron exposed one", async () => {
    const electron: ShellBridge = { appInfo: async () => ({ version: '1.2.3', shell: 'electron' }) };
    expect(pickBridge({ quantiscopeShell: electron })).toBe(electron);
    expect(await pickBridge({ quantiscopeShell: electron }).appInfo()).toEqual({
      version: '1.2.3',
      shell: 'electron',
    });
  });

  it('falls back to the browser bridge otherwise, including on a malformed global', async () => {
    expect((await pickBridge({}).appInfo()).shell).toBe('browser');
    expect((await pickBridge({ quantiscopeShell: { appInfo: 'nope' } }).appInfo()).shell).toBe('browser');
    expect((await pickBridge({ quantiscopeShell: null }).appInfo()).shell).toBe('browser');
  });
});

describe('monitor volume', () => {
  it('never exceeds the cap and starts below it', () => {
    expect(clampVolumeDb(0)).toBe(OUTPUT_CAP_DB);
    expect(clampVolumeDb(1e9)).toBe(OUTPUT_CAP_DB);
    expect(clampVolumeDb(Number.NaN)).toBe(OUTPUT_MIN_DB);
    expect(clampVolumeDb(Number.POSITIVE_INFINITY)).toBe(OUTPUT_MIN_DB);
    expect(clampVolumeDb(-1000)).toBe(OUTPUT_MIN_DB);
    expect(clampVolumeDb(-20)).toBe(-20);
    expect(OUTPUT_START_DB).toBeLessThan(OUTPUT_CAP_DB);
    expect(OUTPUT_CAP_DB).toBeLessThanOrEqual(0);
  });
});
