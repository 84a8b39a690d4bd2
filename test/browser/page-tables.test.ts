// Stored tables on the page: a quantizer designed from the talker gets a short name that the
// user sees and types (table:NAME); the app keeps its levels (across a reload), lists them,
// exports and imports them as a tables file, and the command line takes that very file with
// --table; what goes to the engine and to files carries the full levels beside the name.
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderDemoTalker } from '../../core/signals/demo-talker';
import { parseTableFile } from '../../core/spec/table-file';
import { parseChannel } from '../../core/spec/parse';
import type { EngineState } from '../../renderer/audio/engine';
import { cli } from '../main/cli-fixtures';
import { launchWith, poll, serveBuild, writeWav, type EngineSite } from './engine-page';

let site: EngineSite;
let browser: Browser;
let page: Page;
let exported: string;

beforeAll(async () => {
  site = await serveBuild('qs-tables-');
  browser = await launchWith([]);
  page = await browser.newPage({ viewport: { width: 1280, height: 800 }, acceptDownloads: true });
  page.on('pageerror', (e) => console.error(`page: ${e.message}`));
  await page.goto(site.server.url);
  await page.waitForSelector('body[data-ready="true"]', { timeout: 10_000 });
});

afterAll(async () => {
  await browser?.close();
  await site?.close();
});

const state = () => page.evaluate(() => window.quantiscope.engine.state()) as Promise<EngineState>;
const listed = () =>
  page
    .locator('[data-testid="table-list"] tbody tr')
    .evaluateAll((r) => r.map((x) => (x as HTMLElement).dataset.table));

describe('a designed quantizer by its short name', () => {
  it('is designed from the talker, stored as table:NAME and used as B by that name', async () => {
    await page.getByTestId('engine-start').click();
    await poll(async () => (await state()).running).toBe(true);
    await poll(() => page.evaluate(() => window.quantiscope.tally.frames), {
      timeout: 10_000,
    }).toBeGreaterThan(100);
    await page.getByTestId('open-channels').click();
    await page.getByTestId('design-bits').fill('5');
    await page.getByTestId('design-run').click();
    await poll(() => page.getByTestId('design-status').getAttribute('data-state'), { timeout: 20_000 }).toBe(
      'done',
    );
    expect(await page.getByTestId('design-status').getAttribute('data-table')).toBe('talker-5b');
    expect(await listed()).toEqual(['talker-5b']);
    await page.getByTestId('design-use-b').click();
    await poll(async () => (await state()).inUse.b, { timeout: 10_000 }).toMatch(/^table:talker-5b:/);
    // The user reads and types the name...
    expect(await page.getByTestId('channel-b').inputValue()).toBe('table:talker-5b');
    expect(await page.getByTestId('channel-summary-b-text').innerText()).toBe('table:talker-5b');
    expect(await page.getByTestId('setup-b-law').inputValue()).toBe('table');
    expect(await page.getByTestId('setup-b-table').inputValue()).toBe('talker-5b');
    // ...and the form stays a form, not a page of numbers.
    expect((await page.getByTestId('setup-b-slot').boundingBox())!.height).toBeLessThan(300);
    // The engine (and whatever it records) has every level: Lloyd-Max with 5 bits has 32 levels
    // and 31 decision values (Max 1960, from memory).
    const spec = parseChannel((await state()).channels.b);
    const stage = spec.stages[0];
    expect(stage.law === 'table' && [stage.name, stage.decisions.length, stage.outputs.length]).toEqual([
      'talker-5b',
      31,
      32,
    ]);
  });

  it('refuses a name no table has, at the field', async () => {
    await page.getByTestId('channel-a').fill('table:nosuch');
    await page.getByTestId('channel-a').press('Enter');
    expect(await page.getByTestId('setup-a-text-error').innerText()).toContain(
      '"nosuch": no stored table of that name',
    );
    expect((await state()).channels.a).toBe('g711-mu');
    await page.getByTestId('channel-a').fill('table:talker-5b');
    await page.getByTestId('channel-a').press('Enter');
    await poll(async () => (await state()).channels.a).toMatch(/^table:talker-5b:/);
  });

  it('exports a tables file that core and the command line read', async () => {
    const download = page.waitForEvent('download');
    await page.getByTestId('table-export').click();
    const d = await download;
    exported = path.join(site.dir, 'exported-tables.json');
    await d.saveAs(exported);
    const tables = parseTableFile(await readFile(exported, 'utf8'), exported);
    expect(tables.map((t) => t.name)).toEqual(['talker-5b']);
    const stage = parseChannel((await state()).channels.b).stages[0];
    expect(stage.law === 'table' && stage.outputs).toEqual(tables[0].outputs);
    // The command line analyses a recording through the same table, named as on the page.
    const wav = await writeWav(site.dir, 'talk.wav', renderDemoTalker(48000, 2, 9), 48000);
    const run = await cli(['analyze', wav, '--table', exported, '--channel', 'table:talker-5b', '--json']);
    expect(run.code).toBe(0);
    const [result] = JSON.parse(run.stdout) as { channels: { name: string }[] }[];
    // Its JSON carries the full levels beside the name.
    expect(result.channels[0].name).toMatch(/^table:talker-5b:[^,]*\//);
    expect(parseChannel(result.channels[0].name).stages[0]).toEqual(
      parseChannel((await state()).channels.b).stages[0],
    );
  });

  it('keeps the tables across a reload, and imports a file back after a delete', async () => {
    await page.reload();
    await page.waitForSelector('body[data-ready="true"]');
    await page.getByTestId('open-channels').click();
    expect(await listed()).toEqual(['talker-5b']);
    await page
      .locator('[data-testid="table-list"] tr[data-table="talker-5b"] [data-testid="table-remove"]')
      .click();
    expect(await listed()).toEqual([]);
    // A file that is not a tables file is refused with its name, and the shelf is left as it was.
    await page.getByTestId('table-import').setInputFiles({
      name: 'notes.json',
      mimeType: 'application/json',
      buffer: Buffer.from('{"hello": 1}'),
    });
    await poll(() => page.getByTestId('table-import-status').innerText()).toMatch(/^notes\.json: /);
    expect(await page.getByTestId('table-import-status').getAttribute('data-state')).toBe('error');
    expect(await listed()).toEqual([]);
    await page.getByTestId('table-import').setInputFiles(exported);
    await poll(listed).toEqual(['talker-5b']);
    expect(await page.getByTestId('table-import-status').innerText()).toBe(
      'Imported 1 table from exported-tables.json: talker-5b.',
    );
  });
});
