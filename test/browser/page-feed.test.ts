// One route from the engine to the views, and the cost of watching: each snapshot reaches
// the views once and goes back to the audio thread (no page-side copies of whole
// snapshots); a panel draws only when its data changed and it is shown; while the
// document is hidden nothing draws and measuring goes on, and the panels catch up on return.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchWith, poll, serveBuild, type EngineSite } from './engine-page';

let site: EngineSite;
let browser: Browser;
let page: Page;

const PANELS = ['panel-level-spread', 'panel-ledger', 'panel-snr-trace', 'panel-level-snr', 'panel-meters'];

beforeAll(async () => {
  site = await serveBuild('qs-feed-');
  browser = await launchWith([]);
  page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
  page.on('pageerror', (e) => console.error(`page: ${e.message}`));
  // Counts, before the page's own code runs, every structuredClone of a whole snapshot and
  // every animation frame asked for.
  await page.addInitScript(() => {
    const w = window as unknown as { qsCount: { clones: number; frames: number } };
    w.qsCount = { clones: 0, frames: 0 };
    const clone = window.structuredClone.bind(window);
    window.structuredClone = ((v: unknown, o?: StructuredSerializeOptions) => {
      if (typeof v === 'object' && v !== null && 'talkers' in v && 'channels' in v) w.qsCount.clones++;
      return clone(v, o);
    }) as typeof structuredClone;
    const raf = window.requestAnimationFrame.bind(window);
    window.requestAnimationFrame = (cb) => {
      w.qsCount.frames++;
      return raf(cb);
    };
  });
  await page.goto(site.server.url);
  await page.waitForSelector('body[data-ready="true"]', { timeout: 10_000 });
});

afterAll(async () => {
  await browser?.close();
  await site?.close();
});

const counts = () =>
  page.evaluate(() => ({
    ...(window as unknown as { qsCount: { clones: number; frames: number } }).qsCount,
  }));
const draws = () =>
  page.evaluate(
    (ids) =>
      ids.map((id) =>
        Number(document.querySelector<HTMLElement>(`[data-testid="${id}"]`)?.dataset.draws ?? 0),
      ),
    PANELS,
  );
const snapshots = () => page.evaluate(() => window.quantiscope.engine.state().snapshots);
const setHidden = (hidden: boolean) =>
  page.evaluate((h) => {
    // Headless Chromium keeps its one tab visible, so the test stands in for the window
    // manager: the Page Visibility API's two properties, then its event.
    Object.defineProperty(document, 'hidden', { configurable: true, get: () => h });
    Object.defineProperty(document, 'visibilityState', {
      configurable: true,
      get: () => (h ? 'hidden' : 'visible'),
    });
    document.dispatchEvent(new Event('visibilitychange'));
  }, hidden);

describe('before Start', () => {
  it('asks for no animation frames once the empty panels have drawn', async () => {
    await page.waitForTimeout(1500);
    const a = await counts();
    await page.waitForTimeout(1500);
    const b = await counts();
    expect(b.frames - a.frames).toBe(0);
  });
});

describe('while monitoring', () => {
  it('hands every snapshot to the views once and back, copying none whole', async () => {
    await page.getByTestId('engine-start').click();
    await poll(() => page.evaluate(() => window.quantiscope.engine.state().running)).toBe(true);
    await page.waitForTimeout(1500);
    const c0 = await counts();
    const s0 = await snapshots();
    await page.waitForTimeout(4000);
    const s1 = await snapshots();
    const c1 = await counts();
    // About 25 a second (the worklet's rate): none skipped, so every envelope came back in time.
    expect(s1 - s0).toBeGreaterThanOrEqual(90);
    expect(s1 - s0).toBeLessThanOrEqual(110);
    expect(c1.clones - c0.clones).toBe(0);
    // The engine keeps no copy of its own for the views.
    expect(await page.evaluate(() => 'lastAnalysis' in window.quantiscope.engine)).toBe(false);
    // The panels drew, at most once per snapshot each.
    const d = await draws();
    for (const n of d) expect(n).toBeGreaterThan(20);
  });

  it('stops drawing while hidden, keeps measuring, and catches up on return', async () => {
    await setHidden(true);
    await page.waitForTimeout(300);
    const d0 = await draws();
    const s0 = await snapshots();
    const f0 = await page.evaluate(() => window.quantiscope.tally.frames);
    await page.waitForTimeout(2500);
    expect(await draws()).toEqual(d0);
    // Measuring goes on: snapshots arrive and the talker's frames are still counted.
    expect((await snapshots()) - s0).toBeGreaterThan(40);
    expect(await page.evaluate(() => window.quantiscope.tally.frames)).toBeGreaterThan(f0);
    await setHidden(false);
    await poll(async () => (await draws()).every((n, i) => n > d0[i])).toBe(true);
  });

  it('draws a panel scrolled out of view only once it comes back', async () => {
    const transfer = () =>
      page.getByTestId('panel-transfer').evaluate((el) => Number((el as HTMLElement).dataset.draws ?? 0));
    const before = await transfer();
    await page.waitForTimeout(1500);
    // Below the first screen: not drawn, though its data changes with every snapshot.
    expect(await transfer()).toBe(before);
    await page.getByTestId('panel-transfer').scrollIntoViewIfNeeded();
    await poll(transfer).toBeGreaterThan(before);
    await page.evaluate(() => window.scrollTo(0, 0));
  });
});
