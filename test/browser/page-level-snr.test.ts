// The Level/SNR curve names the signal model of its theory lines and lets the user pick
// sine, Gaussian or Laplacian (speech-like); the G.712 mask, a sine-method mask, is drawn
// only with the sine model, beside sine sweep points, never beside speech-model lines.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchWith, poll, serveBuild, type EngineSite } from './engine-page';

let site: EngineSite;
let browser: Browser;
let page: Page;

// Series of the chart: x, theory A, theory B, frames A, frames B, sweep A, sweep B, mask.
const THEORY_A = 1;
const THEORY_B = 2;
const SWEEP_A = 5;
const MASK = 7;

beforeAll(async () => {
  site = await serveBuild('qs-levelsnr-');
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

const curve = async () => (await page.evaluate(() => window.quantiscope.chartData('panel-level-snr')))[0];
const at = (data: (number | null)[][], series: number, dbm0: number) => data[series][data[0].indexOf(dbm0)];
const legendShown = (label: string) =>
  page
    .locator('[data-testid="legend-level-snr"] .legend-item')
    .filter({ hasText: label })
    .evaluate((el) => !el.closest('[hidden]'));

async function chooseModel(model: 'sine' | 'gaussian' | 'laplacian') {
  await page.getByTestId('level-snr-model').selectOption(model);
  // The theory of both channels for this model has arrived from the compute worker.
  await poll(async () => {
    const d = await curve();
    return d[THEORY_A].some((v) => v !== null) && d[THEORY_B].some((v) => v !== null);
  }).toBe(true);
  await page.waitForTimeout(200);
  return curve();
}

describe('the Level/SNR curve', () => {
  it('draws the theory of the model chosen, named in the legend', async () => {
    await page.evaluate(() => window.quantiscope.engine.setChannels('uniform:8', 'g711-mu'));
    const sine = await chooseModel('sine');
    // A full-load sine on an 8-bit uniform quantizer: 6.02 N + 1.76 = 49.92 dB (Jayant and Noll
    // 1984); +3 dBm0 is 0.14 dB below full load (load capacity +3.14 dBm0, DEVELOPERS.md).
    expect(at(sine, THEORY_A, 3)!).toBeCloseTo(49.92 - 0.14, 0);
    // Below overload the error is Delta^2/12 whatever the signal (Bennett; Jayant and Noll
    // 1984): SNR = 6.02 N + 4.77 + level in dBov, and -20 dBm0 is -26.15 dBov RMS here.
    const quiet = 6.02 * 8 + 4.77 - 26.15;
    // A sine spanning only some 18 steps leaves an error not quite uniform, so its exact
    // figure strays from Delta^2/12 by a few tenths of a dB (common practice, no source).
    expect(Math.abs(at(sine, THEORY_A, -20)! - quiet)).toBeLessThan(0.3);
    expect(await page.locator('[data-testid="legend-level-snr"] .legend-label').first().innerText()).toBe(
      'theory A uniform:8, sine',
    );
    const gauss = await chooseModel('gaussian');
    const laplace = await chooseModel('laplacian');
    expect(Math.abs(at(gauss, THEORY_A, -20)! - quiet)).toBeLessThan(0.05);
    expect(Math.abs(at(laplace, THEORY_A, -20)! - quiet)).toBeLessThan(0.05);
    // At +3 dBm0 a Gaussian or Laplacian signal overloads the quantizer often, a sine never:
    // clipping, not granular noise, then sets the SNR (Jayant and Noll 1984, loading factor).
    expect(at(gauss, THEORY_A, 3)!).toBeLessThan(at(sine, THEORY_A, 3)! - 15);
    expect(at(laplace, THEORY_A, 3)!).toBeLessThan(at(gauss, THEORY_A, 3)!);
    expect(await page.locator('[data-testid="legend-level-snr"] .legend-label').first().innerText()).toBe(
      'theory A uniform:8, Laplacian (speech-like)',
    );
  });

  it('draws the G.712 mask only with the sine model, and G.711 meets it there', async () => {
    const laplace = await curve();
    expect(laplace[MASK].every((v) => v === null)).toBe(true);
    expect(await legendShown('G.712 mask (sine method)')).toBe(false);
    const sine = await chooseModel('sine');
    expect(await legendShown('G.712 mask (sine method)')).toBe(true);
    // The mask as kept in core (ITU-T G.712 sine method, from memory): 35 dB from -30 to 0 dBm0,
    // 29 dB at -40, 24 dB at -45, nothing below.
    expect(at(sine, MASK, -20)).toBe(35);
    expect(at(sine, MASK, -40)).toBe(29);
    expect(at(sine, MASK, -50)).toBeNull();
    // G.711 mu-law (channel B) meets it at every level from -45 to 0 dBm0 with a sine (ITU-T G.712 on
    // G.711 channels, from memory): the theory line stays on or above the mask.
    for (let l = -45; l <= 0; l++)
      expect(at(sine, THEORY_B, l)!, `${l} dBm0`).toBeGreaterThanOrEqual(at(sine, MASK, l)!);
  });

  it('shows the last sweep beside the theory of its own method only', async () => {
    await page.getByTestId('view-tab-sweep').click();
    await page.getByTestId('sweep-run').click();
    await poll(() => page.getByTestId('sweep-status').getAttribute('data-state'), { timeout: 30_000 }).toBe(
      'done',
    );
    await page.getByTestId('view-tab-live').click();
    const sine = await chooseModel('sine');
    expect(sine[SWEEP_A].some((v) => v !== null)).toBe(true);
    expect(await legendShown('sweep A (sine, in-band)')).toBe(true);
    for (const model of ['gaussian', 'laplacian'] as const) {
      const d = await chooseModel(model);
      expect(
        d[SWEEP_A].every((v) => v === null),
        model,
      ).toBe(true);
    }
    // A noise sweep (band-limited Gaussian noise, after ITU-T O.131) belongs with the Gaussian model.
    await page.getByTestId('view-tab-sweep').click();
    await page.getByTestId('sweep-method').selectOption('noise');
    await page.getByTestId('sweep-run').click();
    await poll(() => page.getByTestId('sweep-status').getAttribute('data-state'), { timeout: 30_000 }).toBe(
      'done',
    );
    await page.getByTestId('view-tab-live').click();
    const gauss = await chooseModel('gaussian');
    expect(gauss[SWEEP_A].some((v) => v !== null)).toBe(true);
    expect((await chooseModel('sine'))[SWEEP_A].every((v) => v === null)).toBe(true);
  });
});
