// The renderer page in the browser shell: built into a temporary directory, served by the
// loopback server, loaded in Debian's Chromium. Outside references are named per check.
import { mkdir, mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import alawmulaw from 'alawmulaw';
import type { Browser, Page, Response } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildAll } from '../../build/build.mjs';
import { startStaticServer, type StaticServer } from '../../main/browser-shell/server';
import { createQuantizer } from '../../core/quantizers/index';
import { CHANNEL_PRESETS, formatChannel, parseChannel } from '../../core/spec/index';
import { launchChromium } from './chromium';
import { pngSize } from './page-checks';

const root = fileURLToPath(new URL('../..', import.meta.url));
const screenshotPath = path.join(root, 'test-output', 'shell.png');

let out: string;
let server: StaticServer;
let browser: Browser;
let page: Page;
let response: Response | null;

beforeAll(async () => {
  out = await mkdtemp(path.join(tmpdir(), 'qs-shell-'));
  await buildAll({ outDir: out });
  server = await startStaticServer({ root: path.join(out, 'renderer'), port: 0 });
  browser = await launchChromium();
  page = await browser.newPage({ viewport: { width: 1200, height: 760 } });
  response = await page.goto(server.url);
  await page.waitForSelector('body[data-ready="true"]', { timeout: 10_000 });
});

afterAll(async () => {
  await browser?.close();
  await server?.close();
  if (out) await rm(out, { recursive: true, force: true });
});

const text = (testId: string, scope = page.locator('body')) => scope.getByTestId(testId).innerText();

describe('renderer in the browser shell', () => {
  it('is served with the strict policy and the isolation headers', () => {
    const h = response!.headers();
    expect(response!.status()).toBe(200);
    expect(h['content-security-policy']).toContain("default-src 'none'");
    expect(h['content-security-policy']).toContain("script-src 'self'");
    // HTML standard: COOP same-origin + COEP require-corp -> cross-origin isolated.
    expect(h['cross-origin-opener-policy']).toBe('same-origin');
    expect(h['cross-origin-embedder-policy']).toBe('require-corp');
    expect(h['x-content-type-options']).toBe('nosniff');
  });

  it('is cross-origin isolated, so SharedArrayBuffer exists', async () => {
    const isolation = await page.evaluate(() => ({
      isolated: globalThis.crossOriginIsolated,
      sab: typeof SharedArrayBuffer,
      secure: globalThis.isSecureContext,
    }));
    // HTML standard: SharedArrayBuffer is exposed only to cross-origin isolated contexts.
    expect(isolation).toEqual({ isolated: true, sab: 'function', secure: true });
  });

  it('shows the title, the cautions and the shell', async () => {
    expect(await page.title()).toBe('Quantiscope');
    const caution = await text('caution');
    // Hearing and feedback cautions (common practice, no source).
    for (const words of ['damage hearing', 'start low', 'howl', 'headphones', 'muted', 'capped']) {
      expect(caution).toContain(words);
    }
    expect(await text('shell-info')).toMatch(/^browser shell · v\d+\.\d+\.\d+/);
  });

  it('starts with the output muted, visibly', async () => {
    const state = page.getByTestId('output-state');
    expect(await state.innerText()).toBe('Output muted');
    expect(await state.getAttribute('data-muted')).toBe('true');
    expect(await page.getByTestId('output-toggle').isDisabled()).toBe(true);
  });

  it('lists the presets with figures computed by core', async () => {
    await page.getByTestId('open-channels').click();
    const rows = page.getByTestId('preset-row');
    // One list for every surface: core's presets.
    expect(await rows.count()).toBe(CHANNEL_PRESETS.length);
    // Expected line figures: G.711 (8000 samples/s, 8 bits: 64 kbit/s; mu-law overload
    // 8159 x 4 in 16-bit PCM, A-law 4096 x 8; load capacity +3.17 / +3.14 dBm0, section 5,
    // from memory); the uniform channel: 12 bits x 8000 samples/s (arithmetic); the
    // continuous laws and uniform: overload 1.0 and +3.14 dBm0 unless set (our convention,
    // DEVELOPERS.md "Numbers and scales").
    const expected: Record<string, [string, string, string]> = {
      'g711-mu': ['64 kbit/s', '32636', '+3.17 dBm0'],
      'g711-a': ['64 kbit/s', '32768', '+3.14 dBm0'],
      'mu:255:8': ['64 kbit/s', '32768', '+3.14 dBm0'],
      'a:87.6:8': ['64 kbit/s', '32768', '+3.14 dBm0'],
      'uniform:12': ['96 kbit/s', '32768', '+3.14 dBm0'],
    };
    for (const [preset, [bitRate, overload, capacity]] of Object.entries(expected)) {
      const row = page.locator(`[data-testid="preset-row"][data-preset="${preset}"]`);
      expect(await text('preset-canonical', row)).toBe(formatChannel(parseChannel(preset)));
      expect(await text('preset-bitrate', row)).toBe(bitRate);
      expect(await text('preset-overload-pcm16', row)).toBe(overload);
      expect(await text('preset-load-capacity', row)).toBe(capacity);
    }
    await page.keyboard.press('Escape');
    expect(await page.getByTestId('drawer-channels').isVisible()).toBe(false);
  });

  it('loads the worklet, which stays silent while muted and quantizes like G.711 when not', async () => {
    // A 1020 Hz sine (G.712 reference frequency, from memory) on exact 16-bit values.
    const n = 4096;
    const input = Array.from({ length: n }, (_, i) =>
      Math.round(30000 * Math.sin((2 * Math.PI * 1020 * i) / 8000)),
    );
    const rendered = await page.evaluate(async (pcm) => {
      const render = async (muted: boolean) => {
        const ctx = new OfflineAudioContext(1, pcm.length, 8000);
        await ctx.audioWorklet.addModule('worklet.js');
        const buffer = ctx.createBuffer(1, pcm.length, 8000);
        buffer.getChannelData(0).set(pcm.map((v) => v / 32768));
        const source = new AudioBufferSourceNode(ctx, { buffer });
        const node = new AudioWorkletNode(ctx, 'quantiscope-channel', {
          outputChannelCount: [1],
          processorOptions: {
            a: 'g711-mu',
            muted,
            monitor: 'a',
            recordSeconds: 1,
            finishAtFrame: pcm.length,
          },
        });
        // Channel A's output as the worklet computed it, recorded beside the input it received.
        const final = new Promise<Float32Array>((resolve) => {
          node.port.onmessage = (e: MessageEvent<{ type: string; outA: Float32Array }>) => {
            if (e.data.type === 'final') resolve(e.data.outA);
          };
        });
        source.connect(node).connect(ctx.destination);
        source.start();
        const result = await ctx.startRendering();
        return { out: Array.from(result.getChannelData(0)), a: Array.from(await final, (v) => v * 32768) };
      };
      const muted = await render(true);
      return { muted: muted.out, live: (await render(false)).a };
    }, input);

    expect(rendered.muted.every((v) => v === 0)).toBe(true);
    // Live and offline figures agree to the last bit: the worklet runs core's quantizer.
    const q = createQuantizer('g711-mu');
    expect(rendered.live).toEqual(input.map((v) => q.quantize(v / 32768) * 32768));
    // Independent oracle: alawmulaw's mu-law encode/decode. Ties on exact decision values
    // may round either way (G.711 reference code convention), so a few may differ.
    const oracle = alawmulaw.mulaw.decode(alawmulaw.mulaw.encode(Int16Array.from(input)));
    const differing = rendered.live.filter((v, i) => v !== oracle[i]).length;
    expect(differing).toBeLessThan(n / 100);
  });

  it('runs the test tone through the worklet and unmutes on request', async () => {
    await page.getByTestId('engine-start').click();
    await expect.poll(() => page.getByTestId('engine-state').getAttribute('data-running')).toBe('true');
    expect(await text('engine-state')).toBe('48 kHz');
    expect(await text('channel-summary-a-text')).toBe('g711-mu');
    await page.getByTestId('output-toggle').click();
    await expect.poll(() => page.getByTestId('output-state').getAttribute('data-muted')).toBe('false');
    expect(await text('output-state')).toBe('Output live');
    // The volume slider cannot go above the cap.
    expect(await page.getByTestId('output-volume').getAttribute('max')).toBe('-12');
    await page.getByTestId('output-toggle').click();
    await expect.poll(() => page.getByTestId('output-state').getAttribute('data-muted')).toBe('true');
  });

  it('shows the whole page, both rows, in a full-page picture', async () => {
    await mkdir(path.dirname(screenshotPath), { recursive: true });
    await page.screenshot({ path: screenshotPath, fullPage: true });
    const png = await pngSize(screenshotPath);
    // The second row (Transfer curve, Trade-off) sits below the first screen: the page is taller than the window.
    expect(png.width).toBe(1200);
    expect(png.height).toBeGreaterThan(760 + 300);
    expect(png.bytes).toBeGreaterThan(40_000);
  });
});
