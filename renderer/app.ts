// The renderer page: shell info, the live engine's controls (output muted at start) and
// the channel presets as core computes them. window.quantiscope is the typed handle the
// tests (and later the views) use.
import { pickBridge } from './bridge';
import { h } from './dom';
import { AudioEngine, ENGINE_RATE, renderOffline } from './audio/engine';
import { Analyzer, type AnalysisSnapshot } from '../core/analysis/analyzer';
import { enginePanel } from './engine-panel';
import { channelFigures, type ChannelFigures } from '../core/spec/index';
import { PAGE_PRESETS } from './presets';
import { pageLayout } from './views/layout';
import { mountLive } from './views/live/index';
import { mountChannelSetup } from './views/setup/index';
import { mountSweepView } from './views/sweep/index';
import { mountTradeoff } from './views/tradeoff/index';
import { ComputeClient } from './workers/client';
import 'uplot/dist/uPlot.min.css';

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

export interface QuantiscopeHandle {
  engine: AudioEngine;
  renderOffline: (
    samples: Float32Array,
    channels?: { a: string; b: string },
    options?: Parameters<typeof renderOffline>[3],
  ) => ReturnType<typeof renderOffline>;
  /** Core's offline analysis in this page's JavaScript engine (for comparing with the worklet). */
  analyze: (samples: Float32Array, channels: string[], finish?: boolean) => OfflineCore;
}

declare global {
  interface Window {
    quantiscope: QuantiscopeHandle;
  }
}

export interface OfflineCore {
  analysis: AnalysisSnapshot;
  outA: Float32Array;
  outB: Float32Array;
}

/** Core alone on a whole signal, in offline-sized blocks: figures (finished, unless told) and the listening outputs of A and B. */
function analyzeOffline(samples: Float32Array, channels: string[], finish = true): OfflineCore {
  const block = 4096;
  const a = new Analyzer({ inputRate: ENGINE_RATE, channels, maxBlock: block, listen: true });
  const outA = new Float32Array(samples.length);
  const outB = new Float32Array(samples.length);
  for (let at = 0; at < samples.length; at += block) {
    const n = Math.min(block, samples.length - at);
    a.processBlock(samples.subarray(at, at + n), n);
    outA.set(a.path.output48[0].subarray(0, n), at);
    outB.set(a.path.output48[1].subarray(0, n), at);
  }
  if (finish) a.finish();
  return { analysis: a.snapshot(), outA, outB };
}

/** Two views over one engine: Live (what the talker does now) and Sweep (level sweeps against the mask). */
function viewSwitch(host: HTMLElement): { live: HTMLElement; sweep: HTMLElement } {
  const live = h('div', { class: 'view', 'data-testid': 'view-live' });
  const sweep = h('div', { class: 'view', 'data-testid': 'view-sweep', hidden: true });
  const tabs = (['live', 'sweep'] as const).map((name) => {
    const b = h(
      'button',
      {
        type: 'button',
        class: 'view-tab',
        'data-testid': `view-tab-${name}`,
        'aria-pressed': String(name === 'live'),
      },
      name === 'live' ? 'Live' : 'Sweep',
    );
    b.addEventListener('click', () => {
      live.hidden = name !== 'live';
      sweep.hidden = name !== 'sweep';
      for (const t of tabs) t.setAttribute('aria-pressed', String(t === b));
      window.dispatchEvent(new Event('resize')); // charts take their new box size
    });
    return b;
  });
  host.append(h('nav', { class: 'view-tabs', 'aria-label': 'Views' }, ...tabs), live, sweep);
  return { live, sweep };
}

/** `?record=SECONDS` keeps that much of the received input in the worklet, for tests. */
function recordSeconds(): number {
  const v = Number(new URLSearchParams(location.search).get('record') ?? 0);
  return Number.isFinite(v) && v > 0 ? Math.min(v, 60) : 0;
}

async function main(): Promise<void> {
  const root = document.getElementById('app');
  if (!root) return;
  const engine = new AudioEngine('worklet.js', undefined, recordSeconds());
  window.quantiscope = {
    engine,
    renderOffline: (samples, channels, options) => renderOffline('worklet.js', samples, channels, options),
    analyze: analyzeOffline,
  };
  const layout = pageLayout(root);
  layout.sidebar.append(enginePanel(engine));
  const compute = new ComputeClient();
  const views = viewSwitch(layout.main);
  mountChannelSetup(views.live, { engine, compute });
  mountLive(views.live, { engine, compute });
  mountTradeoff(views.live, { engine, compute });
  views.live.append(presetPanel());
  mountSweepView(views.sweep, { engine, compute });
  const info = await pickBridge().appInfo();
  const shell = document.querySelector<HTMLElement>('[data-testid="shell-info"]');
  if (shell) {
    shell.textContent = `${info.shell} shell · v${info.version}`;
    shell.dataset.shell = info.shell;
  }
  document.body.dataset.ready = 'true';
}

void main();
