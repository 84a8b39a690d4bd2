// Hidden on the real page: one seeded draw per trial, kept until the user asks for a new one
// (button or key), and nothing the page can read (text, titles, attributes, the state API)
// differs between Hidden = A and Hidden = B until Reveal; after Reveal the draw and its seed
// can be read for the record.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { EngineState } from '../../renderer/audio/engine';
import { launchWith, poll, serveBuild, type EngineSite } from './engine-page';

let site: EngineSite;
let browser: Browser;
let page: Page;

beforeAll(async () => {
  site = await serveBuild('qs-hidden-');
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

const state = () => page.evaluate(() => window.quantiscope.engine.state()) as Promise<EngineState>;

/**
 * Everything about the monitor the page can read: the state with the running figures and
 * the trial number left out (they move by themselves), the title, and the text, titles,
 * data- and aria- attributes of the bars, the output meter's moving numbers left out.
 */
const readable = () =>
  page.evaluate(() => {
    const s = window.quantiscope.engine.state() as unknown as Record<string, unknown>;
    const { snapshots: _s, snr: _r, alignment: _a, calibration: _c, latency: _l, howl: _h, ...rest } = s;
    const hidden = { ...(rest.hidden as object), draw: 0 };
    const bars = document.querySelector('.masthead')!;
    const skip = (el: Element) =>
      el.closest('[data-testid="output-meter"], [data-testid="hidden-draw"]') !== null;
    const attrs: string[] = [];
    for (const el of Array.from(bars.querySelectorAll('*'))) {
      if (skip(el)) continue;
      for (const a of Array.from(el.attributes))
        if (
          a.name.startsWith('data-') ||
          a.name.startsWith('aria-') ||
          a.name === 'title' ||
          a.name === 'class'
        )
          attrs.push(`${el.tagName}.${a.name}=${a.value}`);
      for (const n of Array.from(el.childNodes))
        if (n.nodeType === 3 && n.textContent!.trim()) attrs.push(`text:${n.textContent!.trim()}`);
    }
    return { state: { ...rest, hidden }, title: document.title, attrs };
  });

describe('Hidden', () => {
  it('keeps one draw per trial whatever is monitored between, and draws again on request', async () => {
    await page.getByTestId('engine-start').click();
    await poll(async () => (await state()).running).toBe(true);
    // Channels that sound different, so the draw matters.
    await page.evaluate(() => window.quantiscope.engine.setChannels('g711-mu', 'uniform:6'));
    await page.getByTestId('monitor-hidden').click();
    const first = (await state()).hidden.draw;
    for (const id of ['monitor-a', 'monitor-b', 'monitor-ref', 'monitor-hidden'])
      await page.getByTestId(id).click();
    await page.getByTestId('hidden-reveal').click();
    await poll(async () => (await state()).hidden.revealed).not.toBeNull();
    const r = (await state()).hidden.revealed!;
    expect(r.draw).toBe(first);
    // Shown for the record with its seed and draw number.
    expect(await page.getByTestId('hidden-answer').innerText()).toBe(
      `Hidden is ${r.slot.toUpperCase()} (draw ${r.draw}, seed ${r.seed})`,
    );
    // Back and forth again: the same draw, the same answer.
    await page.getByTestId('monitor-a').click();
    await page.getByTestId('monitor-hidden').click();
    expect((await state()).hidden).toEqual({ draw: first, revealed: r });
    // The key N and the button both make a new draw, which is not revealed.
    await page.locator('body').press('n');
    await poll(async () => (await state()).hidden.draw).toBe(first + 1);
    expect((await state()).hidden.revealed).toBeNull();
    expect(await page.getByTestId('hidden-answer').innerText()).toBe('');
    await page.getByTestId('hidden-new-draw').click();
    await poll(async () => (await state()).hidden.draw).toBe(first + 2);
    expect(await page.getByTestId('hidden-draw').innerText()).toBe(`draw ${first + 2}`);
  });

  it('lets the page read nothing that differs between Hidden = A and Hidden = B before Reveal', async () => {
    const before: Partial<Record<'a' | 'b', Awaited<ReturnType<typeof readable>>>> = {};
    const seeds = new Set<number>();
    // Each draw is A or B by a fair seeded coin: 30 draws miss one of them with odds 2^-29.
    for (let i = 0; i < 30 && !(before.a && before.b); i++) {
      await page.waitForTimeout(250);
      const seen = await readable();
      await page.getByTestId('hidden-reveal').click();
      await poll(async () => (await state()).hidden.revealed).not.toBeNull();
      const r = (await state()).hidden.revealed!;
      seeds.add(r.seed);
      before[r.slot] ??= seen;
      await page.getByTestId('hidden-new-draw').click();
      await poll(async () => (await state()).hidden.revealed).toBeNull();
    }
    expect(before.a && before.b).toBeTruthy();
    expect(before.a!.attrs.length).toBeGreaterThan(50);
    expect(before.b).toEqual(before.a);
    // One seed for the whole run: draws are its successive outcomes.
    expect(seeds.size).toBe(1);
  });
});
