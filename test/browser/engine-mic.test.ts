// A fake microphone fed from a WAV file this test writes (Chromium's
// --use-file-for-fake-audio-capture, DEVELOPERS.md's recipe): the worklet records what it
// actually received (Chromium may resample or loop the file), and core run offline on
// exactly those samples gives the same quantized output and the same figures.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AnalysisSnapshot } from '../../core/analysis/analyzer';
import { renderDemoTalker } from '../../core/signals/demo-talker';
import type { EngineState } from '../../renderer/audio/engine';
import {
  launchWith,
  poll,
  PACK_TYPED,
  serveBuild,
  unpackTyped,
  writeWav,
  type EngineSite,
} from './engine-page';

const RATE = 48000;
let site: EngineSite;
let browser: Browser;
let page: Page;

beforeAll(async () => {
  site = await serveBuild('qs-mic-');
  const wav = await writeWav(site.dir, 'talker.wav', renderDemoTalker(RATE, 3, 11), RATE);
  browser = await launchWith([
    '--use-fake-ui-for-media-stream',
    '--use-fake-device-for-media-stream',
    `--use-file-for-fake-audio-capture=${wav}`,
  ]);
  page = await browser.newPage();
  await page.goto(`${site.server.url}?record=6`);
  await page.waitForSelector('body[data-ready="true"]', { timeout: 10_000 });
});

afterAll(async () => {
  await browser?.close();
  await site?.close();
});

const state = () => page.evaluate(() => window.quantiscope.engine.state()) as Promise<EngineState>;
/** Waits for figures over at least `seconds` of input since the last reset (not wall-clock time, which a busy machine stretches). */
const measuredFor = (seconds: number) =>
  page.evaluate(
    (s) =>
      new Promise<void>((done) => {
        const off = window.quantiscope.engine.subscribe((e) => {
          if (e.analysis.seconds < s) return;
          off();
          done();
        });
      }),
    seconds,
  );

interface Captured {
  frames: number;
  input: Float32Array;
  outA: Float32Array;
  outB: Float32Array;
  analysis: AnalysisSnapshot;
  core: { analysis: AnalysisSnapshot; outA: Float32Array; outB: Float32Array };
}

describe('live capture from a fake microphone', () => {
  it('starts on the demo talker with the output muted, then captures the microphone with processing off', async () => {
    await page.getByTestId('engine-start').click();
    await poll(async () => (await state()).running).toBe(true);
    expect((await state()).source.kind).toBe('demo');
    expect(await page.getByTestId('output-state').getAttribute('data-muted')).toBe('true');
    await page.getByTestId('open-channels').click();
    await page.getByTestId('channel-b').fill('uniform:12@16k');
    await page.getByTestId('channel-b').press('Enter');
    await poll(async () => (await state()).inUse.b).toBe('uniform:12@16k');
    await page.keyboard.press('Escape');
    await page.getByTestId('source-kind').selectOption('microphone');
    await poll(async () => (await state()).source.kind).toBe('microphone');
    expect((await state()).fault).toBeNull();
    // The constraints the engine asked for (Media Capture and Streams: the three processing switches).
    const settings = await page.evaluate(() => {
      const s = window.quantiscope.engine.inputTrack()!.getSettings();
      return [s.echoCancellation, s.noiseSuppression, s.autoGainControl];
    });
    expect(settings).toEqual([false, false, false]);
  });

  it('figures and quantized output equal core offline on exactly the samples received', async () => {
    await page.waitForTimeout(1500);
    const packed = await page.evaluate(async (pack) => {
      const packer = (0, eval)(pack) as (v: unknown) => unknown;
      const engine = window.quantiscope.engine;
      const rec = await engine.fetchRecord();
      const { a, b } = engine.state().channels;
      const core = window.quantiscope.analyze(rec.input, [a, b], false);
      return packer({ ...rec, core });
    }, PACK_TYPED);
    const r = unpackTyped(packed) as Captured;
    // Everything since the figures restarted is in the recording (no wrap), and it is sound.
    expect(r.frames).toBe(r.input.length);
    expect(r.frames).toBeGreaterThan(RATE);
    const rms = Math.sqrt(r.input.reduce((s, v) => s + v * v, 0) / r.input.length);
    expect(rms).toBeGreaterThan(1e-3);
    expect(r.outA).toEqual(r.core.outA);
    expect(r.outB).toEqual(r.core.outB);
    expect(r.analysis).toEqual(r.core.analysis);
    expect(r.analysis.channels.map((c) => c.text)).toEqual(['g711-mu', 'uniform:12@16k']);
  });

  it('lists the input devices and captures the one chosen, on the channel chosen', async () => {
    const inputs = await page.evaluate(() => window.quantiscope.engine.listInputs());
    expect(inputs.length).toBeGreaterThan(0);
    // Labels show once the microphone was allowed (Media Capture and Streams, enumerateDevices).
    expect(inputs.every((d) => d.label.length > 0)).toBe(true);
    const chosen = inputs[inputs.length - 1].deviceId;
    expect(await page.evaluate((id) => window.quantiscope.engine.useMicrophone(id), chosen)).toBe(true);
    const s = await state();
    expect(s.source.deviceId).toBe(chosen);
    expect(s.calibration.device).toBe(`mic:${chosen}`);
    await page.evaluate((c) => window.quantiscope.engine.setInputChannel(c), s.source.channelCount - 1);
    expect((await state()).source.inputChannel).toBe(s.source.channelCount - 1);
    await page.evaluate(() => window.quantiscope.engine.setInputChannel(0));
  });

  it('monitors Hidden without saying which, and reveals it on request', async () => {
    await page.getByTestId('monitor-hidden').click();
    await poll(() => page.getByTestId('monitor-state').getAttribute('data-choice')).toBe('hidden');
    expect(await page.getByTestId('hidden-answer').innerText()).toBe('');
    await page.getByTestId('hidden-reveal').click();
    await poll(() => page.getByTestId('hidden-answer').innerText()).toMatch(
      /^Hidden is [AB] \(draw 1, seed \d+\)$/,
    );
    await page.getByTestId('monitor-error').click();
    await poll(() => page.getByTestId('monitor-state').innerText()).toBe('Error of A');
    await page.getByTestId('monitor-a').click();
  });

  it('shows the alignment readout and sets the gain so the active level reaches -26 dBov', async () => {
    // Fresh figures from the talker on the first input channel.
    await page.evaluate(() => window.quantiscope.engine.resetFigures());
    // One whole loop of the 3 s talker, so the level is the file's, not a part of it.
    await measuredFor(3.2);
    await poll(async () => (await state()).alignment.activeDbov, { timeout: 10_000 }).not.toBeNull();
    // Read, act and read again in one task, so no snapshot moves the level in between.
    const [before, after] = await page.evaluate(() => {
      const engine = window.quantiscope.engine;
      const b = engine.state();
      engine.alignToTarget();
      return [b, engine.state()];
    });
    // -26 dBov: common practice for active speech level, no source.
    expect(after.inputGainDb).toBeCloseTo(before.inputGainDb + (-26 - before.alignment.activeDbov!), 9);
    // Measured afresh with the new gain, the looping talker now sits near the target.
    await page.evaluate(() => window.quantiscope.engine.resetFigures());
    await measuredFor(3.2);
    await page.waitForTimeout(300);
    expect(Math.abs((await state()).alignment.activeDbov! + 26)).toBeLessThan(2);
    await page.getByTestId('open-input').click();
    await poll(() => page.getByTestId('readout-active-dbov').innerText()).toMatch(/dBov$/);
    expect(await page.getByTestId('readout-latency').innerText()).toMatch(/path \d+\.\d+ ms/);
  });
});
