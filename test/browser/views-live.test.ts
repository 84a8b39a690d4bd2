// The Live view on the demo talker: every panel draws; on steady noise each one moves when
// the input gain drops by 20 dB.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchWith, poll, serveBuild, type EngineSite } from './engine-page';

let site: EngineSite;
let browser: Browser;
let page: Page;

beforeAll(async () => {
  site = await serveBuild('qs-live-');
  browser = await launchWith([]);
  page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
  await page.goto(site.server.url);
  await page.waitForSelector('body[data-ready="true"]', { timeout: 10_000 });
});

afterAll(async () => {
  await browser?.close();
  await site?.close();
});

const data = (testId: string, key: string) =>
  page.getByTestId(testId).evaluate((el, k) => (el as HTMLElement).dataset[k] ?? '', key);
const num = async (testId: string, key: string) => Number(await data(testId, key));

interface Figures {
  mode: number;
  top: string;
  topShare: number;
  active: number;
  lastLevel: number;
  lowest: number;
  rms: number;
}

const figures = async (): Promise<Figures> => ({
  mode: await num('panel-level-spread', 'modeDbov'),
  top: await data('ledger-a', 'topSegment'),
  topShare: await num('ledger-a', 'topShare'),
  active: await num('meter-peak-dbov', 'value'),
  lastLevel: await num('panel-snr-trace', 'lastLevel'),
  lowest: await num('panel-level-snr', 'lowestLiveDbm0'),
  rms: await transferRms(),
});

// The transfer curve sits in the second row, below the first screen: panels draw only while shown, so
// bring it into view for a reading and then return to the first row.
async function transferRms(): Promise<number> {
  await page.getByTestId('panel-transfer').scrollIntoViewIfNeeded();
  const before = await data('panel-transfer', 'talkerRms');
  // Wait for a draw made after it came into view (throttled to a few per second).
  await poll(async () => (await data('panel-transfer', 'talkerRms')) !== before || before !== '', {
    timeout: 4000,
  }).toBe(true);
  await page.waitForTimeout(600);
  const rms = await num('panel-transfer', 'talkerRms');
  await page.getByTestId('panel-level-spread').scrollIntoViewIfNeeded();
  return rms;
}

describe('the Live view', () => {
  it('draws every panel from the demo talker', async () => {
    await page.getByTestId('engine-start').click();
    await poll(async () => num('live-view', 'frames'), { timeout: 15_000 }).toBeGreaterThan(20);
    for (const id of ['panel-level-spread', 'panel-snr-trace', 'panel-level-snr', 'panel-transfer']) {
      expect(await page.getByTestId(id).locator('canvas').count()).toBeGreaterThan(0);
    }
    // Theory of both channels arrived (computed once per channel change).
    await poll(async () => num('panel-level-snr', 'theory')).toBeGreaterThanOrEqual(2);
    // G.711 has 8 chords per polarity (ITU-T G.711), so the ledger lists 8 segments.
    expect(await page.getByTestId('ledger-a').locator('tbody tr').count()).toBe(8);
    // 8 chords: 7 inner edges plus 0 dBov at the top (ITU-T G.711).
    expect((await data('panel-level-spread', 'edges')).split(',').length).toBe(8);
    // The meters carry their units.
    expect(await page.getByTestId('meter-active-dbov').textContent()).toMatch(/dBov$/);
    expect(await page.getByTestId('meter-active-dbm0').textContent()).toMatch(/dBm0$/);
  });

  it('moves every panel when the input level drops by 20 dB', async () => {
    // A steady source, so that no pause of the talker can pass for the level step.
    await page.getByTestId('source-kind').selectOption('noise');
    await poll(() => page.evaluate(() => window.quantiscope.engine.state().source.kind)).toBe('noise');
    // Let the 3 s "this moment" span fill with the noise before the step.
    await page.waitForTimeout(3500);
    await poll(async () => Number.isFinite((await figures()).mode), { timeout: 8000 }).toBe(true);
    const before = await figures();
    await page.getByTestId('input-gain').fill('-20');
    await page.getByTestId('input-gain').press('Enter');
    await page.waitForTimeout(4000);
    // A 20 dB gain step moves instantaneous levels by 20 dB (arithmetic of dB, common practice, no source).
    await poll(async () => (await figures()).mode, { timeout: 8000 }).toBeLessThan(before.mode - 12);
    const after = await figures();
    // The momentary peak falls with the gain (arithmetic of dB, common practice, no source).
    expect(after.active).toBeLessThan(before.active - 6);
    expect(after.lastLevel).toBeLessThan(before.lastLevel + 0.01);
    // Softer speech occupies lower chords: the top chord or its share changes (ITU-T G.711 chord layout).
    expect(after.top !== before.top || after.topShare !== before.topShare).toBe(true);
    // Binned frames reach lower levels on the Level/SNR curve.
    expect(after.lowest).toBeLessThanOrEqual(before.lowest);
    // Talker RMS marked on the transfer curve falls by about 10x (20 dB).
    expect(after.rms).toBeLessThan(before.rms / 3);
  });
});
