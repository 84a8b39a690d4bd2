// Each fault of the live engine, provoked for real, and its state and message:
// - permission denied: Chromium with a fake device but without the fake-UI flag, in a
//   context granted nothing, so getUserMedia's prompt is refused (NotAllowedError);
// - no input device: Chromium without the fake-device flag on a machine with no sound
//   card, microphone permission granted (NotFoundError);
// - unplugged mid-capture: the track's 'ended' event dispatched on the live track
//   (track.stop() never fires it, Media Capture and Streams);
// - suspended by the system: the context suspended behind the engine's back;
// - undecodable file and a WAV of 0 samples, picked with the file input and dropped.
// After each, capture resumes. Files at other rates are not faults.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderTestTone } from '../../core/signals/test-signals';
import type { EngineState } from '../../renderer/audio/engine';
import { launchWith, poll, serveBuild, wavBytes, type EngineSite } from './engine-page';

let site: EngineSite;
let browser: Browser;

beforeAll(async () => {
  site = await serveBuild('qs-faults-');
  browser = await launchWith(['--use-fake-device-for-media-stream']);
});

afterAll(async () => {
  await browser?.close();
  await site?.close();
});

async function openPage(permissions: string[]): Promise<Page> {
  const context = await browser.newContext({ permissions });
  const page = await context.newPage();
  await page.goto(site.server.url);
  await page.waitForSelector('body[data-ready="true"]', { timeout: 10_000 });
  await page.getByTestId('engine-start').click();
  await poll(() => state(page).then((s) => s.running)).toBe(true);
  return page;
}

const state = (page: Page) => page.evaluate(() => window.quantiscope.engine.state()) as Promise<EngineState>;
const faultCode = (page: Page) => page.getByTestId('engine-fault').getAttribute('data-code');
const faultText = (page: Page) => page.getByTestId('engine-fault').innerText();

describe('faults of the live engine', () => {
  it('microphone permission denied', async () => {
    const page = await openPage([]);
    await page.getByTestId('source-kind').selectOption('microphone');
    await poll(() => faultCode(page)).toBe('permission-denied');
    expect(await faultText(page)).toMatch(/Microphone access was refused/);
    // Still usable: the demo talker plays on.
    expect((await state(page)).source.kind).toBe('demo');
    expect((await state(page)).running).toBe(true);
    await page.context().close();
  });

  it('device unplugged mid-capture, then capture resumes', async () => {
    const page = await openPage(['microphone']);
    expect(await page.evaluate(() => window.quantiscope.engine.useMicrophone())).toBe(true);
    expect((await state(page)).source.kind).toBe('microphone');
    await page.evaluate(() => window.quantiscope.engine.inputTrack()!.dispatchEvent(new Event('ended')));
    await poll(() => faultCode(page)).toBe('device-ended');
    expect(await faultText(page)).toMatch(/stopped delivering sound/);
    expect(await page.evaluate(() => window.quantiscope.engine.inputTrack())).toBeNull();
    expect(await page.evaluate(() => window.quantiscope.engine.useMicrophone())).toBe(true);
    expect((await state(page)).fault).toBeNull();
    expect(await page.getByTestId('engine-fault').isHidden()).toBe(true);

    // Suspended by the system (the engine did not ask): a message and a Resume button.
    await page.evaluate(() => window.quantiscope.engine.context!.suspend());
    await poll(() => faultCode(page)).toBe('context-suspended');
    expect(await faultText(page)).toMatch(/suspended audio/);
    await page.getByTestId('engine-resume').click();
    await poll(() => state(page).then((s) => s.phase)).toBe('running');
    expect((await state(page)).fault).toBeNull();
    await page.context().close();
  });

  it('undecodable file, a WAV of 0 samples, then a 44.1 kHz WAV that plays', async () => {
    const page = await openPage([]);
    const picker = page.getByTestId('source-file');
    await picker.setInputFiles({
      name: 'noise.wav',
      mimeType: 'audio/wav',
      buffer: Buffer.from('not audio at all, just text'),
    });
    await poll(() => faultCode(page)).toBe('file-undecodable');
    expect(await faultText(page)).toMatch(/could not be decoded/);

    await picker.setInputFiles({
      name: 'empty.wav',
      mimeType: 'audio/wav',
      buffer: wavBytes(new Float32Array(0), 8000),
    });
    await poll(() => faultCode(page)).toBe('file-empty');
    expect(await faultText(page)).toMatch(/no audio samples/);

    // A 44.1 kHz file, dropped on the page: Chromium resamples it to the context rate (no fault).
    const tone = renderTestTone({
      overloadPoint: 1,
      loadCapacityDbm0: 3.14,
      dbm0: -10,
      rate: 44100,
      seconds: 0.5,
    });
    const bytes = Array.from(wavBytes(tone, 44100));
    const transfer = await page.evaluateHandle((b) => {
      const dt = new DataTransfer();
      dt.items.add(new File([Uint8Array.from(b)], 'tone-44k1.wav', { type: 'audio/wav' }));
      return dt;
    }, bytes);
    await page.getByTestId('source-drop').dispatchEvent('drop', { dataTransfer: transfer });
    await poll(() => state(page).then((s) => s.source.label)).toBe('tone-44k1.wav');
    const s = await state(page);
    expect(s.source.kind).toBe('file');
    expect(s.fault).toBeNull();
    await page.context().close();
  });

  it('a refused channel text, at the field and at the engine', async () => {
    const page = await openPage([]);
    await page.getByTestId('open-channels').click();
    await page.getByTestId('channel-a').fill('g711-q');
    await page.getByTestId('channel-a').press('Enter');
    // The form refuses it where it was typed, with core's message naming the bad part.
    await poll(() => page.getByTestId('setup-a-text-error').innerText()).toMatch(/g711-q/);
    expect((await state(page)).channels.a).toBe('g711-mu');
    // Straight to the engine (as a session file could), it is a fault with the same message.
    expect(await page.evaluate(() => window.quantiscope.engine.setChannels('g711-q', 'g711-a'))).toBe(false);
    await poll(() => faultCode(page)).toBe('channel-invalid');
    expect(await faultText(page)).toMatch(/g711-q/);
    expect((await state(page)).channels.a).toBe('g711-mu');
    await page.context().close();
  });

  it('calibrates the input with a tone of known level and keeps the offset per device', async () => {
    const page = await openPage([]);
    await page.getByTestId('source-kind').selectOption('tone');
    await poll(() => state(page).then((s) => s.source.kind)).toBe('tone');
    await page.getByTestId('open-input').click();
    await page.getByTestId('tone-dbm0').fill('-10');
    await page.getByTestId('tone-dbm0').press('Enter');
    await page.evaluate(() => window.quantiscope.engine.resetFigures());
    await page.waitForTimeout(600);
    await page.getByTestId('calib-known').fill('-10');
    await page.getByTestId('calib-button').click();
    const s = await state(page);
    // The tone is -10 dBm0 at G.711 mu-law: its peak is 8159*4/32768 * 10^(-13.17/20) (load capacity
    // +3.17 dBm0, from memory), so it reads 20 log10(that) dBFS and the offset is the difference.
    const dbfs = 20 * Math.log10(((8159 * 4) / 32768) * Math.pow(10, (-10 - 3.17) / 20));
    expect(s.calibration.offsetDb!).toBeCloseTo(-10 - dbfs, 1);
    // Read back after later snapshots: the tone still reads its own level, to a hundredth of a dB.
    expect(s.calibration.inputDbm0!).toBeCloseTo(-10, 2);
    await poll(() => page.getByTestId('calib-offset').innerText()).toMatch(/dB$/);
    // Kept for that input: after a reload, the same source finds it again.
    await page.reload();
    await page.waitForSelector('body[data-ready="true"]');
    await page.getByTestId('engine-start').click();
    await poll(() => state(page).then((x) => x.running)).toBe(true);
    await page.getByTestId('source-kind').selectOption('tone');
    await expect
      .poll(() => state(page).then((x) => x.calibration.offsetDb))
      .toBeCloseTo(s.calibration.offsetDb!, 9);
    await page.context().close();
  });

  it('keeps the cautions on screen and the output muted at start', async () => {
    const page = await openPage([]);
    const caution = await page.getByTestId('caution').innerText();
    // Hearing and feedback cautions (common practice, no source).
    for (const words of ['damage hearing', 'howl', 'headphones', 'muted']) expect(caution).toContain(words);
    expect(await page.getByTestId('output-state').getAttribute('data-muted')).toBe('true');
    expect((await state(page)).muted).toBe(true);
    await page.context().close();
  });
});

describe('no input device', () => {
  it('reports it when the machine has no microphone at all', async () => {
    // A second Chromium without the fake device: this machine has no sound card.
    const bare = await launchWith([]);
    try {
      const context = await bare.newContext({ permissions: ['microphone'] });
      const page = await context.newPage();
      await page.goto(site.server.url);
      await page.waitForSelector('body[data-ready="true"]', { timeout: 10_000 });
      await page.getByTestId('engine-start').click();
      await poll(() => state(page).then((s) => s.running)).toBe(true);
      expect(await page.evaluate(() => window.quantiscope.engine.useMicrophone())).toBe(false);
      expect(await faultCode(page)).toBe('no-input-device');
      expect(await faultText(page)).toMatch(/No microphone was found.*NotFoundError/);
    } finally {
      await bare.close();
    }
  });
});
