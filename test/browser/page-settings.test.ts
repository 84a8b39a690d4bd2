// One control per setting, one store: each setting changed by every route it has (form
// field, text form, preset, button, key, slider) and every place on the page that shows
// it read back, so two controls of one setting cannot drift apart.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { EngineState } from '../../renderer/audio/engine';
import { launchWith, poll, serveBuild, type EngineSite } from './engine-page';

let site: EngineSite;
let browser: Browser;
let page: Page;

beforeAll(async () => {
  site = await serveBuild('qs-settings-');
  browser = await launchWith([]);
  page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
  page.on('pageerror', (e) => console.error(`page: ${e.message}`));
  await page.goto(site.server.url);
  await page.waitForSelector('body[data-ready="true"]', { timeout: 10_000 });
  await page.getByTestId('engine-start').click();
  await page.waitForFunction(() => window.quantiscope.engine.state().running, null, { timeout: 10_000 });
});

afterAll(async () => {
  await browser?.close();
  await site?.close();
});

const state = () => page.evaluate(() => window.quantiscope.engine.state()) as Promise<EngineState>;
const text = (id: string) => page.getByTestId(id).first().innerText();
const value = (id: string) => page.getByTestId(id).inputValue();

/** Everywhere channel `slot` is shown, once the worklet runs it and a snapshot has been drawn. */
async function channelShown(slot: 'a' | 'b') {
  const label = slot.toUpperCase();
  return {
    engine: (await state()).inUse[slot],
    text: await value(`channel-${slot}`),
    summary: await text(`channel-summary-${slot}-text`),
    ledger: (await page.locator(`[data-testid="ledger-${slot}"] caption`).innerText()).replace(
      `${label}: `,
      '',
    ),
    trace: (
      await page
        .locator('[data-testid="legend-snr-trace"] .legend-label')
        .nth(slot === 'a' ? 0 : 1)
        .innerText()
    ).replace(`${label} `, ''),
  };
}

async function expectChannel(slot: 'a' | 'b', short: string, canonical = short) {
  await poll(async () => (await state()).inUse[slot], { timeout: 15_000 }).toBe(canonical);
  // Snapshots of the new channel have reached the panels.
  await poll(async () => (await channelShown(slot)).ledger, { timeout: 10_000 }).toBe(short);
  const shown = await channelShown(slot);
  expect(shown).toEqual({ engine: canonical, text: short, summary: short, ledger: short, trace: short });
}

describe('channels: the form, the text form, the presets and the summary show one value', () => {
  it('applies A from the form fields and the text form follows', async () => {
    await page.getByTestId('open-channels').click();
    await page.getByTestId('setup-a-law').selectOption('uniform');
    // The law's defaults apply at once: uniform, 12 bits, mid-tread (our defaults).
    await expectChannel('a', 'uniform:12');
    await page.getByTestId('setup-a-bits').fill('10');
    // While typing, the text form already shows what the fields make...
    expect(await value('channel-a')).toBe('uniform:10');
    expect((await state()).channels.a).toBe('uniform:12');
    // ...and Enter applies it.
    await page.getByTestId('setup-a-bits').press('Enter');
    await expectChannel('a', 'uniform:10');
    expect(await value('setup-a-law')).toBe('uniform');
    // Bits times rate: 10 x 8000 = 80 kbit/s (arithmetic).
    expect(await text('channel-summary-a-figures')).toBe('10 bits · 8 kHz · 80 kbit/s');
  });

  it('applies A from the text form and the fields follow', async () => {
    await page.getByTestId('channel-a').fill('mu:100:7');
    // While typing the fields follow the text as soon as it reads.
    expect(await value('setup-a-law')).toBe('mu');
    expect(await value('setup-a-param')).toBe('100');
    expect(await value('setup-a-bits')).toBe('7');
    await page.getByTestId('channel-a').press('Enter');
    await expectChannel('a', 'mu:100:7');
  });

  it('applies a preset from the list and from the preset table', async () => {
    await page.getByTestId('setup-b-preset').selectOption('uniform:8');
    await expectChannel('b', 'uniform:8');
    expect(await value('setup-b-law')).toBe('uniform');
    expect(await value('setup-b-bits')).toBe('8');
    await page
      .locator('[data-testid="preset-row"][data-preset="g711-a"] [data-testid="preset-use-a"]')
      .click();
    await expectChannel('a', 'g711-a');
    expect(await value('setup-a-law')).toBe('g711-a');
    // A tandem has no form: the fields say so and the text form holds it.
    await page
      .locator(
        '[data-testid="preset-row"][data-preset="g711-mu>g711-a>g711-mu"] [data-testid="preset-use-b"]',
      )
      .click();
    await expectChannel('b', 'g711-mu>g711-a>g711-mu');
    expect(await page.getByTestId('setup-b-bits').isDisabled()).toBe(true);
    expect(await text('setup-b-note')).toContain('edit the text form');
  });

  it('refuses a bad value where it was typed and changes nothing', async () => {
    const before = (await state()).channels;
    await page.getByTestId('channel-a').fill('g711-q');
    await page.getByTestId('channel-a').press('Enter');
    // core's parser names the unknown law (channel text form, DEVELOPERS.md).
    expect(await text('setup-a-text-error')).toContain('g711-q');
    expect(await page.getByTestId('channel-a').getAttribute('aria-invalid')).toBe('true');
    await page.getByTestId('setup-a-law').selectOption('uniform');
    await page.getByTestId('setup-a-bits').fill('17');
    await page.getByTestId('setup-a-bits').press('Enter');
    // Uniform bits run from 2 to 16 (channel text form, DEVELOPERS.md).
    expect(await text('setup-a-bits-error')).toContain('bits must be a whole number from 2 to 16');
    const after = (await state()).channels;
    expect(after.b).toBe(before.b);
    expect(after.a).toBe('uniform:12');
    await page.getByTestId('channel-a').fill('g711-mu');
    await page.getByTestId('channel-a').press('Enter');
    await page.getByTestId('channel-b').fill('g711-a');
    await page.getByTestId('channel-b').press('Enter');
    await expectChannel('a', 'g711-mu');
    await expectChannel('b', 'g711-a');
    await page.keyboard.press('Escape');
  });
});

describe('monitor, output and level: buttons, keys and fields show one value', () => {
  const monitorShown = async () => ({
    engine: (await state()).monitor,
    pressed: await page
      .locator('.monitor[aria-pressed="true"]')
      .evaluateAll((b) => b.map((x) => (x as HTMLElement).dataset.choice)),
    readout: await page.getByTestId('monitor-state').getAttribute('data-choice'),
  });

  it('monitor choice by button and by key', async () => {
    await page.getByTestId('monitor-b').click();
    await poll(monitorShown).toEqual({ engine: 'b', pressed: ['b'], readout: 'b' });
    await page.locator('body').press('r');
    await poll(monitorShown).toEqual({ engine: 'ref', pressed: ['ref'], readout: 'ref' });
    await page.locator('body').press('e');
    await poll(monitorShown).toEqual({ engine: 'error', pressed: ['error'], readout: 'error' });
    await page.getByTestId('error-of').selectOption('b');
    await poll(() => text('monitor-state')).toBe('Error of B');
    expect((await state()).errorOf).toBe('b');
    await page.getByTestId('error-gain').fill('12');
    await page.getByTestId('error-gain').press('Enter');
    await poll(async () => (await state()).errorGainDb).toBe(12);
    expect(await value('error-gain')).toBe('12');
    // Keys belong to the field while it has the focus; once it is left, they are the monitor's again.
    await page.locator('body').press('a');
    expect((await state()).monitor).toBe('error');
    await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
    await page.locator('body').press('a');
    await poll(monitorShown).toEqual({ engine: 'a', pressed: ['a'], readout: 'a' });
  });

  it('mute and volume by button, key and slider', async () => {
    const shown = async () => ({
      engine: (await state()).muted,
      readout: await page.getByTestId('output-state').getAttribute('data-muted'),
      button: (await text('output-toggle')).replace(/\s*M$/, ''),
    });
    expect(await shown()).toEqual({ engine: true, readout: 'true', button: 'Unmute' });
    await page.getByTestId('output-toggle').click();
    await poll(shown).toEqual({ engine: false, readout: 'false', button: 'Mute' });
    await page.locator('body').press('m');
    await poll(shown).toEqual({ engine: true, readout: 'true', button: 'Unmute' });
    const volume = async () => ({
      engine: (await state()).volumeDb,
      slider: Number(await value('output-volume')),
      text: await text('output-volume-text'),
    });
    // Start at -36 dB, keys step 3 dB (our settings), capped at -12 dB.
    expect(await volume()).toEqual({ engine: -36, slider: -36, text: '-36 dB (max -12)' });
    await page.locator('body').press('=');
    await poll(volume).toEqual({ engine: -33, slider: -33, text: '-33 dB (max -12)' });
    await page.getByTestId('output-volume').fill('-20');
    await poll(volume).toEqual({ engine: -20, slider: -20, text: '-20 dB (max -12)' });
    for (let i = 0; i < 6; i++) await page.locator('body').press('=');
    // The cap holds whatever the route.
    await poll(volume).toEqual({ engine: -12, slider: -12, text: '-12 dB (max -12)' });
    await page.locator('body').press('-');
    await poll(volume).toEqual({ engine: -15, slider: -15, text: '-15 dB (max -12)' });
  });

  it('gain by field and by the alignment', async () => {
    await page.getByTestId('input-gain').fill('-6');
    await page.getByTestId('input-gain').press('Enter');
    await poll(async () => (await state()).inputGainDb).toBe(-6);
    await poll(async () => (await state()).alignment.activeDbov, { timeout: 10_000 }).not.toBeNull();
    await page.getByTestId('align-button').click();
    const s = await state();
    expect(s.inputGainDb).not.toBe(-6);
    expect(Number(await value('input-gain'))).toBeCloseTo(s.inputGainDb, 2);
    // The target shown on the button is the one in the Input drawer.
    await page.getByTestId('open-input').click();
    await page.getByTestId('align-target').fill('-30');
    await page.getByTestId('align-target').press('Enter');
    await poll(() => text('align-button')).toBe('Align to -30 dBov');
    expect((await state()).alignment.targetDbov).toBe(-30);
    await page.keyboard.press('Escape');
  });

  it('source by the list and the test signal by its fields', async () => {
    await page.getByTestId('source-kind').selectOption('tone');
    await poll(async () => (await state()).source.kind).toBe('tone');
    await page.getByTestId('open-input').click();
    await page.getByTestId('tone-dbm0').fill('-20');
    await page.getByTestId('tone-dbm0').press('Enter');
    await poll(async () => (await state()).testSignal.dbm0).toBe(-20);
    expect(await value('source-kind')).toBe('tone');
    await page.keyboard.press('Escape');
    await page.getByTestId('source-kind').selectOption('demo');
    await poll(async () => (await state()).source.kind).toBe('demo');
  });
});

describe('page settings: theme, theory model, spans and targets', () => {
  it('each shows the same everywhere', async () => {
    const theme = async () => ({
      html: await page.evaluate(() => document.documentElement.dataset.theme),
      store: await page.evaluate(() => window.quantiscope.store.page.theme),
      button: await page.getByTestId('theme-toggle').getAttribute('aria-pressed'),
    });
    const start = await theme();
    await page.getByTestId('theme-toggle').click();
    const flipped = start.html === 'dark' ? 'light' : 'dark';
    expect(await theme()).toEqual({ html: flipped, store: flipped, button: String(flipped === 'dark') });
    await page.getByTestId('theme-toggle').click();
    expect(await theme()).toEqual(start);

    await page.getByTestId('level-snr-model').selectOption('laplacian');
    expect(await page.evaluate(() => window.quantiscope.store.page.model)).toBe('laplacian');
    expect(await page.getByTestId('panel-level-snr').getAttribute('data-model')).toBe('laplacian');
    await page.getByTestId('spread-whole').click();
    expect(await page.getByTestId('panel-level-spread').getAttribute('data-span')).toBe('whole');
    expect(await page.getByTestId('spread-whole').getAttribute('aria-pressed')).toBe('true');
    expect(await page.getByTestId('spread-moment').getAttribute('aria-pressed')).toBe('false');
    await page.getByTestId('tradeoff-target').fill('25');
    await page.getByTestId('tradeoff-target').press('Enter');
    expect(await page.evaluate(() => window.quantiscope.store.page.targetSnrDb)).toBe(25);
  });
});
