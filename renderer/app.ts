// First page of the renderer: shell info, the output (muted by default) with a test
// tone through the channel worklet, and the channel presets as core computes them.
import { pickBridge } from './bridge';
import { h } from './dom';
import {
  clampVolumeDb,
  MonitorEngine,
  OUTPUT_CAP_DB,
  OUTPUT_MIN_DB,
  TEST_TONE_HZ,
  type EngineStatus,
} from './audio/engine';
import { channelFigures, type ChannelFigures } from '../core/spec/index';
import { PAGE_PRESETS } from './presets';

const fmt = (n: number, digits: number) => n.toFixed(digits);
const signed = (n: number, digits: number) => (n >= 0 ? '+' : '') + n.toFixed(digits);

function presetRow(p: ChannelFigures): HTMLTableRowElement {
  return h(
    'tr',
    { 'data-testid': 'preset-row', 'data-preset': p.canonical },
    h('td', {}, p.title),
    h('td', { 'data-testid': 'preset-canonical' }, h('code', {}, p.canonical)),
    h('td', { class: 'num', 'data-testid': 'preset-bits' }, p.bits),
    h('td', { class: 'num', 'data-testid': 'preset-rate' }, p.rateHz === null ? 'native' : p.rateHz),
    h(
      'td',
      { class: 'num', 'data-testid': 'preset-bitrate' },
      p.bitRate === null ? '—' : `${fmt(p.bitRate / 1000, 0)} kbit/s`,
    ),
    h('td', { class: 'num', 'data-testid': 'preset-overload' }, fmt(p.overloadPoint, 5)),
    h('td', { class: 'num', 'data-testid': 'preset-overload-pcm16' }, fmt(p.overloadPcm16, 0)),
    h('td', { class: 'num', 'data-testid': 'preset-load-capacity' }, `${signed(p.loadCapacityDbm0, 2)} dBm0`),
  );
}

function presetPanel(): HTMLElement {
  const rows = PAGE_PRESETS.map((text) => presetRow(channelFigures(text)));
  const head = h(
    'tr',
    {},
    h('th', {}, 'Channel'),
    h('th', {}, 'Text form'),
    h('th', { class: 'num' }, 'Bits'),
    h('th', { class: 'num' }, 'Rate (Hz)'),
    h('th', { class: 'num' }, 'Bit rate'),
    h('th', { class: 'num' }, 'Overload point'),
    h('th', { class: 'num' }, 'Overload (PCM16)'),
    h('th', { class: 'num' }, 'Load capacity'),
  );
  return h(
    'section',
    { class: 'panel', 'data-testid': 'preset-panel' },
    h('h2', {}, 'Channels'),
    h(
      'table',
      { class: 'presets', 'data-testid': 'preset-table' },
      h('thead', {}, head),
      h('tbody', {}, ...rows),
    ),
    h(
      'p',
      { class: 'hint' },
      'Overload point on the float scale (16-bit PCM / 32768); load capacity: power of a sine whose peak sits at the overload point.',
    ),
  );
}

function outputPanel(): HTMLElement {
  const state = h(
    'span',
    { class: 'output-state', 'data-testid': 'output-state', 'data-muted': 'true' },
    'Output muted',
  );
  const toggle = h('button', { type: 'button', 'data-testid': 'output-toggle', disabled: true }, 'Unmute');
  const volume = h('input', {
    type: 'range',
    min: OUTPUT_MIN_DB,
    max: OUTPUT_CAP_DB,
    step: 1,
    'data-testid': 'output-volume',
    'aria-label': 'Monitor volume (dB)',
    disabled: true,
  });
  const volumeText = h('span', { 'data-testid': 'output-volume-text' });
  const start = h('button', { type: 'button', 'data-testid': 'engine-start' }, 'Start test tone');
  const channel = h(
    'select',
    { 'data-testid': 'engine-channel', 'aria-label': 'Channel' },
    ...PAGE_PRESETS.map((t) => h('option', { value: t }, t)),
  );
  const engineState = h('span', { class: 'engine-state', 'data-testid': 'engine-state' }, 'engine stopped');

  const show = (s: EngineStatus) => {
    state.textContent = s.muted ? 'Output muted' : 'Output live';
    state.dataset.muted = String(s.muted);
    toggle.textContent = s.muted ? 'Unmute' : 'Mute';
    toggle.disabled = !s.running;
    volume.disabled = !s.running;
    volume.value = String(s.volumeDb);
    volumeText.textContent = `${s.volumeDb} dB (cap ${OUTPUT_CAP_DB} dB)`;
    engineState.textContent = s.error
      ? `error: ${s.error}`
      : s.running
        ? `running at ${s.sampleRate} Hz through ${s.channel ?? '…'}`
        : 'engine stopped';
    engineState.dataset.running = String(s.running);
  };
  const engine = new MonitorEngine('worklet.js', show);
  show(engine.status);

  start.addEventListener('click', () => {
    start.disabled = true;
    engine.start(channel.value).catch((err: unknown) => {
      engine.status.error = err instanceof Error ? err.message : String(err);
      show(engine.status);
    });
  });
  channel.addEventListener('change', () => engine.setChannel(channel.value));
  toggle.addEventListener('click', () => engine.setMuted(!engine.status.muted));
  volume.addEventListener('input', () => engine.setVolumeDb(clampVolumeDb(Number(volume.value))));

  return h(
    'section',
    { class: 'panel', 'data-testid': 'output-panel' },
    h('h2', {}, 'Output'),
    h('div', { class: 'output-row' }, state, toggle, volume, volumeText),
    h('div', { class: 'output-row' }, start, channel, engineState),
    h(
      'p',
      { class: 'hint' },
      `The test tone is ${TEST_TONE_HZ} Hz at -20 dB re full scale; it stays silent until unmuted.`,
    ),
  );
}

async function main(): Promise<void> {
  const root = document.getElementById('app');
  if (!root) return;
  root.append(outputPanel(), presetPanel());
  const info = await pickBridge().appInfo();
  const shell = document.querySelector<HTMLElement>('[data-testid="shell-info"]');
  if (shell) {
    shell.textContent = `${info.shell} shell · v${info.version}`;
    shell.dataset.shell = info.shell;
  }
  document.body.dataset.ready = 'true';
}

void main();
