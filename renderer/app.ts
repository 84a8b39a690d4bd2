// The page: one instrument. A bar on top (engine, source, monitor, output) and a strip
// under it (channels in one line each, gain, views, theme); the measurements fill the
// rest; channels and input open in drawers on demand. window.quantiscope is the typed
// handle the tests use.
import { Analyzer, type AnalysisSnapshot } from '../core/analysis/analyzer';
import { pickBridge } from './bridge';
import { AudioEngine, ENGINE_RATE } from './audio/engine';
import { renderOffline } from './audio/offline';
import { chartData, pointOnPage } from './charts/chart';
import { palette, type Palette } from './charts/theme';
import { h } from './dom';
import { Store } from './settings/store';
import { TableShelf } from './settings/table-shelf';
import { channelStrip } from './views/bar/channel-strip';
import { faultLine } from './views/bar/fault-line';
import { listenForKeys } from './views/bar/keys';
import { transportBar } from './views/bar/transport';
import { channelDrawer } from './views/channels/channel-drawer';
import { FrameClock } from './views/frame-clock';
import { inputDrawer } from './views/input/input-drawer';
import { mountLive } from './views/live/index';
import { mountSweepView } from './views/sweep/index';
import { SweepBoard } from './views/sweep/sweep-board';
import { TalkerTally } from './views/talker/talker-tally';
import { mountTradeoff } from './views/tradeoff/index';
import { ComputeClient } from './workers/client';
import 'uplot/dist/uPlot.min.css';

export interface QuantiscopeHandle {
  engine: AudioEngine;
  store: Store;
  renderOffline: (
    samples: Float32Array,
    channels?: { a: string; b: string },
    options?: Parameters<typeof renderOffline>[3],
  ) => ReturnType<typeof renderOffline>;
  /** Core's offline analysis in this page's JavaScript engine (for comparing with the worklet). */
  analyze: (samples: Float32Array, channels: string[], finish?: boolean) => OfflineCore;
  /** A copy of the next snapshot's figures (tests; the views never copy whole snapshots). */
  nextSnapshot: () => Promise<AnalysisSnapshot>;
  /** The chart colours of the current theme, as the charts read them. */
  palette: () => Palette;
  /** What the charts inside the element with this data-testid draw (series by series). */
  chartData: (testId: string) => (number | null)[][][];
  /** Where the data point (x, y) of a chart inside the element with this data-testid is on the page. */
  pointOnPage: (testId: string, chart: number, x: number, y: number) => { x: number; y: number } | null;
  tally: TalkerTally;
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

/** `?record=SECONDS` keeps that much of the received input in the worklet, for tests. */
function recordSeconds(): number {
  const v = Number(new URLSearchParams(location.search).get('record') ?? 0);
  return Number.isFinite(v) && v > 0 ? Math.min(v, 60) : 0;
}

async function main(): Promise<void> {
  const root = document.getElementById('app');
  if (!root) return;
  const engine = new AudioEngine('worklet.js', undefined, recordSeconds());
  const tables = new TableShelf();
  const store = new Store(engine, tables);
  const clock = new FrameClock();
  const compute = new ComputeClient();
  const sweeps = new SweepBoard();
  const tally = new TalkerTally(engine);
  window.quantiscope = {
    engine,
    store,
    renderOffline: (samples, channels, options) => renderOffline('worklet.js', samples, channels, options),
    analyze: analyzeOffline,
    nextSnapshot: () =>
      new Promise((resolve) => {
        const off = engine.subscribe((e) => {
          off();
          resolve(structuredClone(e.analysis));
        });
      }),
    palette,
    chartData: (testId) => {
      const el = document.querySelector(`[data-testid="${testId}"]`);
      return el ? chartData(el) : [];
    },
    pointOnPage: (testId, chart, x, y) => {
      const el = document.querySelector(`[data-testid="${testId}"]`);
      return el ? pointOnPage(el, chart, x, y) : null;
    },
    tally,
  };

  const input = inputDrawer(store, clock);
  const channels = channelDrawer(store, compute, tally);
  // The bars stay on top while the page scrolls to the second row; the measurements take
  // the height they leave (styles.css reads it from --head-h and --foot-h).
  const masthead = document.querySelector<HTMLElement>('.masthead');
  const footer = document.querySelector<HTMLElement>('.footnote');
  const bar = transportBar(store, clock, { pickFile: input.pickFile });
  const strip = channelStrip(store, (slot) => channels.focus(slot));
  if (masthead) {
    masthead.dataset.testid = 'listen-bar';
    const brand = masthead.querySelector('h1');
    const row = (cls: string, label: string, ...groups: (Element | null)[]) =>
      h('div', { class: `bar ${cls}`, role: 'toolbar', 'aria-label': label }, ...groups);
    masthead.replaceChildren(
      row(
        'first',
        'Views, engine, source and level',
        brand,
        strip.views,
        bar.engine,
        bar.source,
        strip.level,
        h('div', { class: 'group end' }, strip.theme),
      ),
      row('second', 'Monitor and output', bar.monitor, bar.output),
      row(
        'third',
        'Channels and blind draw',
        strip.channels,
        bar.hidden,
        h('div', { class: 'group end' }, bar.meter),
      ),
      faultLine(store),
    );
  }
  const follow = (el: HTMLElement | null, name: string) => {
    if (!el) return;
    new ResizeObserver(() =>
      document.documentElement.style.setProperty(name, `${Math.ceil(el.getBoundingClientRect().height)}px`),
    ).observe(el);
  };
  follow(masthead, '--head-h');
  follow(footer, '--foot-h');
  const live = h('div', { class: 'view', 'data-testid': 'view-live' });
  const sweep = h('div', { class: 'view', 'data-testid': 'view-sweep', hidden: true });
  const views = h('div', { class: 'views' }, live, sweep);
  root.append(views, channels.el, input.el);
  const { extra } = mountLive(live, { engine, store, compute, clock, sweeps });
  mountTradeoff(extra, { engine, store, compute, tally, clock });
  mountSweepView(sweep, { store, compute, sweeps });
  const showView = () => {
    live.hidden = store.page.view !== 'live';
    sweep.hidden = store.page.view !== 'sweep';
    document.body.dataset.view = store.page.view;
    document.body.dataset.drawer = store.page.drawer;
  };
  store.subscribe(showView);
  showView();
  listenForKeys(store);

  const info = await pickBridge().appInfo();
  const shell = document.querySelector<HTMLElement>('[data-testid="shell-info"]');
  if (shell) {
    shell.textContent = `${info.shell} shell · v${info.version}`;
    shell.dataset.shell = info.shell;
  }
  document.body.dataset.ready = 'true';
}

void main();
