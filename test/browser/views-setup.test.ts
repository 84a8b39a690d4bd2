// The channel setup, Sweep view and trade-off panel mounted on the real page, in Debian's
// Chromium: setup changes reach the engine (the snapshot's segment edges move), bad
// values are refused at their field, a sweep runs in the compute worker and its table
// judges every level, and screenshots of the Sweep view are kept for a look.
import { mkdir } from 'node:fs/promises';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { EngineState } from '../../renderer/audio/engine';
import { launchWith, poll, serveBuild, type EngineSite } from './engine-page';

const root = path.resolve(__dirname, '../..');
const OUT = path.join(root, 'test-output');
let site: EngineSite;
let browser: Browser;
let page: Page;

beforeAll(async () => {
  site = await serveBuild('qs-views-');
  await mkdir(OUT, { recursive: true });
  browser = await launchWith([]);
  page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
  page.on('console', (m) => {
    if (m.type() === 'error') console.error(`page: ${m.text()}`);
  });
  await page.goto(site.server.url);
  await page.waitForSelector('body[data-ready="true"]', { timeout: 10_000 });
});

afterAll(async () => {
  await browser?.close();
  await site?.close();
});

const state = () => page.evaluate(() => window.quantiscope.engine.state()) as Promise<EngineState>;
const edgesA = () =>
  page.evaluate(() => {
    const a = window.quantiscope.engine.lastAnalysis;
    return a
      ? Array.from(a.channels[0].meter.segments.edgesDbov, (v) => (Number.isFinite(v) ? v : null))
      : null;
  });
const snapshots = async () => (await state()).snapshots;

describe('channel setup', () => {
  it('applies A and B from the fields and the segment edges in the snapshots move', async () => {
    await page.getByTestId('engine-start').click();
    await poll(async () => (await state()).running).toBe(true);
    await poll(async () => (await edgesA())?.length).toBe(9); // G.711 mu-law: 8 chords (ITU-T G.711)
    await page.getByTestId('setup-a-law').selectOption('uniform');
    await page.getByTestId('setup-a-bits').fill('12');
    await page.getByTestId('setup-a-segments').fill('4');
    await expect.poll(() => page.getByTestId('setup-a-text').textContent()).toBe('uniform:12,seg=4');
    // Bits times rate: 12 x 8000 = 96 kbit/s (arithmetic).
    expect(await page.getByTestId('setup-a-bitrate').textContent()).toContain('96.0 kbit/s');
    await page.getByTestId('setup-b-preset').selectOption('mu:100:7');
    expect(await page.getByTestId('setup-b-text').textContent()).toBe('mu:100:7');
    await page.getByTestId('setup-apply').click();
    await poll(async () => (await state()).channels).toEqual({ a: 'uniform:12,seg=4', b: 'mu:100:7' });
    // The engine panel's own field and state line keep working beside the setup.
    expect(await page.getByTestId('engine-state').textContent()).toContain('uniform:12,seg=4');
    // Uniform segments are 6 dB bands down from the overload point (DEVELOPERS.md; 20 log10 2 = 6.02 dB,
    // common practice, no source): edges -18.06, -12.04, -6.02, 0 dBov.
    const before = await snapshots();
    await poll(async () => (await snapshots()) > before + 2).toBe(true);
    await poll(async () => (await edgesA())?.length).toBe(5);
    const e = (await edgesA())!;
    expect(e[0]).toBeNull();
    for (const [i, want] of [-18.06, -12.04, -6.02, 0].entries()) expect(e[i + 1]!).toBeCloseTo(want, 1);
  });

  it('refuses bad values at their field and leaves the engine alone', async () => {
    const channels = (await state()).channels;
    await page.getByTestId('setup-a-bits').fill('17');
    // core's parser: uniform bits run from 2 to 16 (channel text form, DEVELOPERS.md).
    await expect
      .poll(() => page.getByTestId('setup-a-bits-error').textContent())
      .toContain('bits must be a whole number from 2 to 16');
    expect(await page.getByTestId('setup-a-bits').getAttribute('aria-invalid')).toBe('true');
    expect(await page.getByTestId('setup-apply').isDisabled()).toBe(true);
    await page.getByTestId('setup-a-bits').fill('12');
    await page.getByTestId('setup-b-param').fill('-5');
    // mu below 0 has no compressor (mu-law definition, common practice, no source).
    expect(await page.getByTestId('setup-b-param-error').textContent()).toContain('mu must be 0 or more');
    expect(await page.getByTestId('setup-a-bits-error').textContent()).toBe('');
    await page.getByTestId('setup-b-param').fill('100');
    await page.getByTestId('setup-b-rate').fill('500');
    expect(await page.getByTestId('setup-b-rate-error').textContent()).toContain('rate must be');
    await page.getByTestId('setup-b-rate').fill('8:k');
    expect(await page.getByTestId('setup-b-rate-error').textContent()).toContain('not a plain value');
    await page.getByTestId('setup-a-segments').fill('0');
    expect(await page.getByTestId('setup-a-segments-error').textContent()).toContain('segment count');
    await page.getByTestId('setup-apply').click({ force: true });
    expect((await state()).channels).toEqual(channels);
    await page.getByTestId('setup-a-segments').fill('4');
    await page.getByTestId('setup-b-rate').fill('8k');
    expect(await page.getByTestId('setup-apply').isDisabled()).toBe(false);
  });

  it('designs a quantizer from the talker measured so far and applies it as B', async () => {
    await page.getByTestId('setup-b-law').selectOption('designed');
    await page.getByTestId('setup-b-bits').fill('5');
    await page.getByTestId('setup-b-design').click();
    // Lloyd-Max with 5 bits: 32 levels, so 31 decision values (Max 1960, from memory).
    await expect
      .poll(() => page.getByTestId('setup-b-text').textContent(), { timeout: 15_000 })
      .toMatch(/^table:talker-lm-5:/);
    const text = (await page.getByTestId('setup-b-text').textContent())!;
    expect(text.split(':')[2].split('/')).toHaveLength(31);
    expect(await page.getByTestId('setup-b-bitrate').textContent()).toContain('40.0 kbit/s');
    await page.getByTestId('setup-apply').click();
    await poll(async () => (await state()).channels.b).toBe(text);
    expect((await state()).fault).toBeNull();
  });
});

describe('sweep view', () => {
  it('sweeps A and B in the worker and judges every level against the mask', async () => {
    // G.711 meets the G.712 sine mask (ITU-T G.712, from memory); uniform 8 bits cannot:
    // 6.02 N + 1.76 dB at full load falls to about 7 dB at -40 dBm0 (Jayant and Noll 1984).
    await page.getByTestId('channel-a').fill('g711-mu');
    await page.getByTestId('channel-b').fill('uniform:8');
    await page.getByTestId('channels-apply').click();
    await poll(async () => (await state()).channels).toEqual({ a: 'g711-mu', b: 'uniform:8' });
    await page.getByTestId('view-tab-sweep').click();
    await page.getByTestId('sweep-run').click();
    await poll(() => page.getByTestId('sweep-status').getAttribute('data-state'), { timeout: 20_000 }).toBe(
      'done',
    );
    // Computed in the worker, not in the page.
    expect(await page.getByTestId('sweep-status').textContent()).not.toContain('in the page');
    // -60 .. +3 dBm0 in 1 dB steps: 64 levels.
    expect(await page.getByTestId('sweep-row').count()).toBe(64);
    expect(await page.getByTestId('sweep-summary-a').getAttribute('data-pass')).toBe('true');
    expect(await page.getByTestId('sweep-summary-b').getAttribute('data-pass')).toBe('false');
    const row = (dbm0: number) => page.locator(`[data-testid="sweep-row"][data-dbm0="${dbm0}"]`);
    expect(await row(-40).getByTestId('sweep-a-verdict').textContent()).toBe('pass');
    expect(await row(-40).getByTestId('sweep-b-verdict').textContent()).toBe('fail');
    expect(await row(-10).getByTestId('sweep-b-verdict').textContent()).toBe('pass');
    // Nothing is required below -45 dBm0 (G.712 mask as kept in core, from memory).
    expect(await row(-50).getByTestId('sweep-a-verdict').getAttribute('data-pass')).toBe('none');
    const snr = Number((await row(-40).getByTestId('sweep-b-snr').textContent())!.replace(' dB', ''));
    expect(snr).toBeGreaterThan(4);
    expect(snr).toBeLessThan(10);
    expect(await page.locator('[data-testid="sweep-chart"] canvas').count()).toBe(1);
  });

  it('keeps screenshots of the Sweep view at 1280x800 and 1920x1080', async () => {
    for (const [w, hgt] of [
      [1280, 800],
      [1920, 1080],
    ]) {
      await page.setViewportSize({ width: w, height: hgt });
      await page.waitForTimeout(300);
      const view = page.getByTestId('sweep-view');
      await view.scrollIntoViewIfNeeded();
      const box = (await view.boundingBox())!;
      // The chart follows the view's width (resizable layout).
      const canvas = (await page.locator('[data-testid="sweep-chart"] canvas').boundingBox())!;
      expect(canvas.width).toBeGreaterThan(box.width * 0.8);
      expect(box.width).toBeLessThanOrEqual(w);
      await view.screenshot({ path: path.join(OUT, `sweep-view-${w}x${hgt}.png`) });
      await page.screenshot({ path: path.join(OUT, `sweep-page-${w}x${hgt}.png`) });
    }
  });
});

describe('trade-off panel', () => {
  it('predicts the share of active frames for the candidates with A and B picked out', async () => {
    await page.getByTestId('view-tab-live').click();
    await page.getByTestId('tradeoff-share').fill('0');
    await page.getByTestId('tradeoff-update').click();
    expect(await page.getByTestId('tradeoff-share-error').textContent()).toContain('share must be');
    await page.getByTestId('tradeoff-share').fill('95');
    await page.getByTestId('tradeoff-update').click();
    await poll(() => page.getByTestId('tradeoff-status').getAttribute('data-state'), {
      timeout: 20_000,
    }).toBe('done');
    expect(await page.getByTestId('tradeoff-a').textContent()).toContain('A: g711-mu, 64 kbit/s');
    expect(await page.getByTestId('tradeoff-b').textContent()).toContain('B: uniform:8, 64 kbit/s');
    expect(await page.locator('[data-testid="tradeoff-chart"] canvas').count()).toBe(1);
    await page.setViewportSize({ width: 1280, height: 800 });
    await page.getByTestId('tradeoff-panel').screenshot({ path: path.join(OUT, 'tradeoff-1280x800.png') });
    await page
      .getByTestId('channel-setup')
      .screenshot({ path: path.join(OUT, 'channel-setup-1280x800.png') });
  });
});
