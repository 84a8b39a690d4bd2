// The Trade-off and the talker design on the real page: only a talker's active frames from
// the current source count (test signals excluded, a looping file once), the count says how
// many from which source and can be reset; every candidate can be named by hovering and read
// in a table sorted by any column; and the page recommends and designs what `quantiscope
// design` does for the same recording.
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderDemoTalker } from '../../core/signals/demo-talker';
import type { DesignReport } from '../../main/cli/commands/design';
import type { Recommendation } from '../../core/design/index';
import { cli } from '../main/cli-fixtures';
import { launchWith, poll, serveBuild, writeWav, type EngineSite } from './engine-page';

const RATE = 48000;
let site: EngineSite;
let browser: Browser;
let page: Page;
let wav: string;

beforeAll(async () => {
  site = await serveBuild('qs-tradeoff-');
  // A seeded talker of our own, 6 s, as a 16-bit WAV at the engine's rate.
  wav = await writeWav(site.dir, 'talker-6s.wav', renderDemoTalker(RATE, 6, 23), RATE);
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

const frames = () => page.evaluate(() => window.quantiscope.tally.frames);
const counted = () => page.getByTestId('talker-frames').innerText();
const predict = async () => {
  await page.getByTestId('tradeoff-update').click();
  await poll(() => page.getByTestId('tradeoff-status').getAttribute('data-state'), { timeout: 30_000 }).toBe(
    'done',
  );
};

describe('the talker the Trade-off counts', () => {
  it('leaves test signals out, says what it counts, and can start afresh', async () => {
    await page.getByTestId('engine-start').click();
    await poll(() => page.evaluate(() => window.quantiscope.engine.state().running)).toBe(true);
    // The Trade-off sits on the second row: brought on screen, as a user scrolls to it.
    await page.getByTestId('tradeoff-panel').scrollIntoViewIfNeeded();
    await page.getByTestId('source-kind').selectOption('tone');
    await poll(counted).toContain('a test signal, not a talker');
    await page.waitForTimeout(1000);
    expect(await frames()).toBe(0);
    await page.getByTestId('tradeoff-update').click();
    expect(await page.getByTestId('tradeoff-status').innerText()).toContain('test signals are not counted');
    await page.getByTestId('source-kind').selectOption('demo');
    await poll(frames, { timeout: 10_000 }).toBeGreaterThan(50);
    expect(await counted()).toMatch(/^\d+ active frames from demo talker \(first pass, counting\)\.$/);
    const before = await frames();
    await page.getByTestId('talker-reset').click();
    await poll(frames).toBeLessThan(before);
  });
});

describe('the candidates', () => {
  it('names every candidate on hover and lists them all in a sortable table', async () => {
    await poll(frames, { timeout: 10_000 }).toBeGreaterThan(100);
    await predict();
    const [data] = await page.evaluate(() => window.quantiscope.chartData('tradeoff-chart'));
    const n = data[0].length;
    expect(n).toBeGreaterThan(50);
    const rows = page.locator('[data-testid="tradeoff-table"] tbody tr');
    expect(await rows.count()).toBe(n);
    // Hover the point of A (G.711 mu-law, 64 kbit/s): the line names law, parameter, bits, rate, bit rate, share.
    const a = page.locator('[data-testid="tradeoff-table"] tbody tr[data-candidate="g711-mu"]');
    const share = Number((await a.locator('td').nth(6).innerText()).replace(' %', ''));
    const at = await page.evaluate((y) => window.quantiscope.pointOnPage('tradeoff-chart', 0, 64, y), share);
    await page.mouse.move(at!.x, at!.y);
    await poll(() => page.getByTestId('tradeoff-hover').isVisible()).toBe(true);
    const hover = await page.getByTestId('tradeoff-hover').innerText();
    // Several 8-bit candidates sit close together at 64 kbit/s: the nearest is named, in full.
    expect(hover).toMatch(
      /^\S+: (uniform|mu-law|A-law|G\.711|designed for the talker), [^,]+, 8 bits at 8000 Hz = 64 kbit\/s; predicted \d+\.\d % of frames at or above 30 dB/,
    );
    const named = await page.getByTestId('tradeoff-hover').getAttribute('data-candidate');
    const row = page.locator(`[data-testid="tradeoff-table"] tbody tr[data-candidate="${named}"]`);
    expect(await row.locator('td').nth(5).innerText()).toBe('64');
    expect(
      Math.abs(Number((await row.locator('td').nth(6).innerText()).replace(' %', '')) - share),
    ).toBeLessThan(3);
    // Sorting: by bit rate descending, then by predicted share ascending.
    const column = async (i: number) =>
      (await rows.locator(`td:nth-child(${i + 1})`).allInnerTexts()).map((t) => parseFloat(t));
    await page.locator('[data-testid="tradeoff-table"] button[data-sort="bitrate"]').click();
    expect(await page.getByTestId('tradeoff-table').getAttribute('data-sort')).toBe('bitrate:desc');
    const rates = await column(5);
    expect(rates).toEqual([...rates].sort((x, y) => y - x));
    await page.locator('[data-testid="tradeoff-table"] button[data-sort="share"]').click();
    const shares = await column(6);
    expect(shares).toEqual([...shares].sort((x, y) => x - y));
  });
});

describe('the same recording on the page and on the command line', () => {
  it('gives the same designed table and the same recommended channel', async () => {
    // The command line's design probe is 16-bit linear PCM at 8 kHz: the page's channel A is made the same.
    await page.evaluate(() => window.quantiscope.engine.setChannels('uniform:16', 'g711-a'));
    await poll(() => page.evaluate(() => window.quantiscope.engine.state().inUse.a)).toBe('uniform:16');
    await page.getByTestId('source-file').setInputFiles(wav);
    await poll(() => page.evaluate(() => window.quantiscope.engine.state().source.label)).toBe(
      'talker-6s.wav',
    );
    await poll(counted, { timeout: 20_000 }).toContain('(one whole pass)');
    await page.getByTestId('open-channels').click();
    await page.getByTestId('design-bits').fill('4');
    await page.getByTestId('design-run').click();
    await poll(() => page.getByTestId('design-status').getAttribute('data-state'), { timeout: 20_000 }).toBe(
      'done',
    );
    const name = (await page.getByTestId('design-status').getAttribute('data-table'))!;
    const table = await page.evaluate((n) => window.quantiscope.store.tables.get(n), name);
    await page.keyboard.press('Escape');
    await predict();
    const chosen = await page.getByTestId('tradeoff-chosen').getAttribute('data-chosen');
    const pageFrames = await frames();

    const run = await cli(['design', wav, '--bits', '4', '--recommend', '--json']);
    expect(run.code).toBe(0);
    const out = JSON.parse(run.stdout) as { design: DesignReport; recommendation: Recommendation };
    // The same frames (one pass of the file, 20 ms each at 8 kHz) ...
    expect(Math.abs(out.recommendation.frames - pageFrames)).toBeLessThanOrEqual(1);
    // ... the same recommended channel, at the same default target and share ...
    expect(chosen).toBe(out.recommendation.candidates[out.recommendation.chosen]?.id ?? '');
    expect(out.recommendation.share).toBe(
      (await page.evaluate(() => window.quantiscope.store.page.sharePct)) / 100,
    );
    // ... and the same table: its positive half, level by level (Chromium and Node may round the
    // filter design's sines apart in the last bit, so 1e-6 relative is allowed).
    const half = table!.outputs.length / 2;
    const pos = { decisions: table!.decisions.slice(half), outputs: table!.outputs.slice(half) };
    expect(pos.outputs).toHaveLength(out.design.outputs.length);
    pos.outputs.forEach((v, i) => expect(Math.abs(v / out.design.outputs[i] - 1)).toBeLessThan(1e-6));
    pos.decisions.forEach((v, i) => expect(Math.abs(v / out.design.decisions[i] - 1)).toBeLessThan(1e-6));
    expect(path.basename(wav)).toBe('talker-6s.wav');
  });
});
