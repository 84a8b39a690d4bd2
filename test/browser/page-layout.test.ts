// The page as one instrument, at the sizes users have (1024x700, 1280x800, 1920x1080) in
// both themes, with the demo talker running: the measurements and every monitor control
// on the first screen without scrolling, no panel's content outside its box, text that
// meets WCAG 2.1's 4.5:1 contrast (success criterion 1.4.3) in legends, labels and the
// charts' axes, and every chart repainted when the theme changes. Screenshots of each go
// to test-output/ and are checked for what they hold.
import { mkdir } from 'node:fs/promises';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchWith, poll, serveBuild, type EngineSite } from './engine-page';
import { canvasPrints, contrast, overflowing, pngSize, textColours } from './page-checks';

const OUT = path.resolve(__dirname, '../../test-output');
const SIZES = [
  [1024, 700],
  [1280, 800],
  [1920, 1080],
] as const;
const THEMES = ['light', 'dark'] as const;
const FIRST_SCREEN = [
  'panel-level-spread',
  'panel-ledger',
  'panel-snr-trace',
  'panel-level-snr',
  'panel-meters',
];
const CONTROLS = [
  'engine-start',
  'source-kind',
  'monitor-ref',
  'monitor-a',
  'monitor-b',
  'monitor-hidden',
  'monitor-error',
  'hidden-new-draw',
  'hidden-reveal',
  'output-toggle',
  'output-state',
  'output-volume',
  'volume-caution',
  'output-meter',
  'channel-summary-a',
  'channel-summary-b',
  'input-gain',
  'theme-toggle',
];
/** WCAG 2.1 success criterion 1.4.3: 4.5:1 for normal text. */
const MIN_CONTRAST = 4.5;

let site: EngineSite;
let browser: Browser;
let page: Page;

beforeAll(async () => {
  site = await serveBuild('qs-layout-');
  await mkdir(OUT, { recursive: true });
  browser = await launchWith([]);
  page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
  page.on('pageerror', (e) => console.error(`page: ${e.message}`));
  await page.goto(site.server.url);
  await page.waitForSelector('body[data-ready="true"]', { timeout: 10_000 });
});

afterAll(async () => {
  await browser?.close();
  await site?.close();
});

const setTheme = async (theme: 'light' | 'dark') => {
  if ((await page.evaluate(() => document.documentElement.dataset.theme)) !== theme)
    await page.getByTestId('theme-toggle').click();
  expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe(theme);
};

const draws = (testId: string) =>
  page.getByTestId(testId).evaluate((el) => Number((el as HTMLElement).dataset.draws ?? 0));

describe('every chart follows the theme', () => {
  it('repaints every canvas on the page when the theme changes, before any audio', async () => {
    await setTheme('light');
    // The theory lines arrive from the compute worker; wait for them so only the theme changes.
    await poll(() => page.getByTestId('panel-level-snr').getAttribute('data-theory')).toBe('2');
    await page.waitForTimeout(300);
    const before = await canvasPrints(page, 'body');
    // Live: spread, trace (2), Level/SNR, transfer, trade-off; Sweep: its chart.
    expect(before.length).toBeGreaterThanOrEqual(7);
    await setTheme('dark');
    await page.waitForTimeout(300);
    const after = await canvasPrints(page, 'body');
    expect(after).toHaveLength(before.length);
    for (let i = 0; i < before.length; i++) expect(after[i], `canvas ${i}`).not.toBe(before[i]);
    await setTheme('light');
  });
});

describe.each(SIZES)('at %ix%i', (width, height) => {
  it.each(THEMES)(
    'shows the measurements first and keeps everything in its box (%s theme)',
    async (theme) => {
      await page.setViewportSize({ width, height });
      await setTheme(theme);
      if (!(await page.evaluate(() => window.quantiscope.engine.state().running))) {
        await page.getByTestId('engine-start').click();
        await poll(() => page.evaluate(() => window.quantiscope.engine.state().running)).toBe(true);
      }
      for (const id of FIRST_SCREEN) await poll(() => draws(id), { timeout: 15_000 }).toBeGreaterThan(3);
      await page.waitForTimeout(700);

      // On the first screen, without scrolling, whole, and not on top of one another.
      expect(await page.evaluate(() => window.scrollY)).toBe(0);
      const boxes = [];
      for (const id of [...FIRST_SCREEN, ...CONTROLS]) {
        const b = (await page.getByTestId(id).first().boundingBox())!;
        expect(b, id).not.toBeNull();
        expect(b.x, id).toBeGreaterThanOrEqual(0);
        expect(b.y, id).toBeGreaterThanOrEqual(0);
        expect(b.x + b.width, id).toBeLessThanOrEqual(width + 0.5);
        expect(b.y + b.height, id).toBeLessThanOrEqual(height + 0.5);
        boxes.push({ id, ...b });
      }
      const panels = boxes.slice(0, FIRST_SCREEN.length);
      for (const p of panels) {
        // Tall enough to read: a chart needs room for its axes (common practice, no source).
        expect(p.height, p.id).toBeGreaterThan(150);
        for (const q of panels)
          if (p !== q) {
            const apart =
              p.x + p.width <= q.x + 0.5 ||
              q.x + q.width <= p.x + 0.5 ||
              p.y + p.height <= q.y + 0.5 ||
              q.y + q.height <= p.y + 0.5;
            expect(apart, `${p.id} overlaps ${q.id}`).toBe(true);
          }
      }
      // Each control is on top where it is drawn (no bar or drawer covers it).
      for (const id of CONTROLS) {
        const hit = await page
          .getByTestId(id)
          .first()
          .evaluate((el) => {
            const r = el.getBoundingClientRect();
            const top = document.elementFromPoint(r.left + r.width / 2, r.top + r.height / 2);
            return top !== null && (el === top || el.contains(top));
          });
        expect(hit, id).toBe(true);
      }
      // Both ledgers whole: every segment row of A and B inside the panel (G.711: 8 chords each, ITU-T G.711).
      expect(await page.locator('[data-testid="ledger-a"] tbody tr').count()).toBe(8);
      expect(await page.locator('[data-testid="ledger-b"] tbody tr').count()).toBe(8);
      const snrCells = page.locator('[data-testid="ledger-b"] tbody tr td:last-child');
      const ledger = (await page.getByTestId('panel-ledger').boundingBox())!;
      for (let i = 0; i < 8; i++) {
        const c = (await snrCells.nth(i).boundingBox())!;
        expect(c.x + c.width).toBeLessThanOrEqual(ledger.x + ledger.width + 0.5);
        expect(c.y + c.height).toBeLessThanOrEqual(ledger.y + ledger.height + 0.5);
      }
      expect(await overflowing(page, '.live-panel, .masthead, .footnote')).toEqual([]);

      // Text: legends, labels, readouts, the bars.
      const texts = await textColours(page, '.live-panel, .masthead, .footnote');
      expect(texts.length).toBeGreaterThan(100);
      const poor = texts
        .map((t) => ({ ...t, ratio: contrast(t.colour, t.background) }))
        .filter((t) => t.ratio < MIN_CONTRAST)
        .map((t) => `${t.where} "${t.text}": ${t.ratio.toFixed(2)} (${t.colour} on ${t.background})`);
      expect(poor).toEqual([]);
      // Canvas: the colours the charts draw axes, ticks and tick labels with, read from the theme they use.
      const p = await page.evaluate(() => window.quantiscope.palette());
      expect(contrast(p.axisInk, p.panel)).toBeGreaterThanOrEqual(MIN_CONTRAST);
      expect(contrast(p.ink, p.panel)).toBeGreaterThanOrEqual(MIN_CONTRAST);
      // The panel colour the charts assume is the one the panels have.
      const panelBg = await page
        .getByTestId('panel-meters')
        .evaluate((el) => getComputedStyle(el).backgroundColor);
      expect(contrast(p.panel, panelBg)).toBeCloseTo(1, 3);

      const file = path.join(OUT, `page-${width}x${height}-${theme}.png`);
      await page.screenshot({ path: file });
      const png = await pngSize(file);
      expect([png.width, png.height]).toEqual([width, height]);
      // A page of charts and text, not a blank one (a flat PNG of this size compresses to a few kB).
      expect(png.bytes).toBeGreaterThan(40_000);
    },
  );

  it('keeps the drawers and the Sweep view inside the window', async () => {
    await page.setViewportSize({ width, height });
    for (const drawer of ['channels', 'input'] as const) {
      await page.getByTestId(drawer === 'channels' ? 'open-channels' : 'open-input').click();
      const d = page.getByTestId(`drawer-${drawer}`);
      await expect.poll(() => d.isVisible()).toBe(true);
      const b = (await d.boundingBox())!;
      expect(b.x).toBeGreaterThanOrEqual(0);
      expect(b.x + b.width).toBeLessThanOrEqual(width + 0.5);
      expect(b.y + b.height).toBeLessThanOrEqual(height + 0.5);
      expect(await overflowing(page, `[data-testid="drawer-${drawer}"]`)).toEqual([]);
      const texts = await textColours(page, `[data-testid="drawer-${drawer}"]`);
      expect(texts.filter((t) => contrast(t.colour, t.background) < MIN_CONTRAST)).toEqual([]);
      if (width === 1280)
        await page.screenshot({ path: path.join(OUT, `drawer-${drawer}-${width}x${height}.png`) });
      await page.keyboard.press('Escape');
      await expect.poll(() => d.isVisible()).toBe(false);
    }
    await page.getByTestId('view-tab-sweep').click();
    expect(await overflowing(page, '.sweep-view')).toEqual([]);
    const v = (await page.getByTestId('sweep-view').boundingBox())!;
    expect(v.x + v.width).toBeLessThanOrEqual(width + 0.5);
    await page.getByTestId('view-tab-live').click();
  });
});
