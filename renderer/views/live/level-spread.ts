// Level spread: share of samples per 0.5 dB of instantaneous level (dBov below, dBm0
// above), the monitored channel's segment edges, the talker's active level and 0 dBm0
// marked. "This moment" differences whole-run counts over the last 3 s.
import type uPlot from 'uplot';
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { LEVEL_BIN_COUNT, LEVEL_BIN_DB, LEVEL_MIN_DBOV } from '../../../core/measure/levels';
import { SINE_CREST_DB } from '../../../core/units/levels';
import { h } from '../../dom';
import { axis, boxChart, cursorValue, fmt, vline } from '../../charts/chart';
import { legend } from '../../charts/legend';
import { STYLES, styledSeries, type SeriesStyle } from '../../charts/series';
import { palette } from '../../charts/theme';
import type { Store } from '../../settings/store';
import { HistogramRing } from './history';
import { panelBox, type LiveContext, type LivePanel } from './panel';

/** Snapshots kept for "this moment": about 3 s at 25 per second. */
const MOMENT_DEPTH = 75;

const SHARE: SeriesStyle = { colour: 'reference', dash: [], width: 1.5, marker: 'none', markerSize: 0 };
const ACTIVE: SeriesStyle = { colour: 'mark', dash: [], width: 1.25, marker: 'none', markerSize: 0 };

export function levelSpreadPanel(store: Store): LivePanel {
  const span = (value: 'moment' | 'whole', text: string) => {
    const b = h('button', { type: 'button', class: 'toggle', 'data-testid': `spread-${value}` }, text);
    b.addEventListener('click', () => store.setPage({ spread: value }));
    return b;
  };
  const moment = span('moment', 'Last 3 s');
  const whole = span('whole', 'Whole run');
  const tools = h('div', { class: 'toggle-group', role: 'group', 'aria-label': 'Span' }, moment, whole);
  const box = panelBox('panel-level-spread', 'Level spread', tools);
  const { el, body } = box;
  const showSpan = () => {
    const w = store.page.spread === 'whole';
    moment.setAttribute('aria-pressed', String(!w));
    whole.setAttribute('aria-pressed', String(w));
    el.dataset.span = store.page.spread;
  };
  store.subscribe(showSpan);
  showSpan();

  const key = legend(
    [
      { label: 'share of samples', style: SHARE },
      { label: 'segment edges', style: STYLES.limit },
      { label: '0 dBm0', style: STYLES.mark },
      { label: 'active level', style: ACTIVE },
    ],
    'legend-level-spread',
  );
  const plotBox = h('div', { class: 'plot' });
  body.append(key.el, plotBox);

  const x = Float64Array.from(
    { length: LEVEL_BIN_COUNT },
    (_, k) => LEVEL_MIN_DBOV + (k + 0.5) * LEVEL_BIN_DB,
  );
  const share = new Float64Array(LEVEL_BIN_COUNT);
  const counts = new Float64Array(LEVEL_BIN_COUNT);
  const recent = new Float64Array(LEVEL_BIN_COUNT);
  let total = 0;
  const ring = new HistogramRing(LEVEL_BIN_COUNT, MOMENT_DEPTH);
  let edges = new Float64Array(0);
  let activeDbov: number | null = null;
  let zeroDbm0Dbov = NaN;
  let lc = 0;
  let edgesOf = 'A';
  let seen = false;

  const marks = (u: uPlot) => {
    const p = palette();
    for (let i = 1; i < edges.length - 1; i++) vline(u, edges[i], p.axisInk, '', STYLES.limit.dash);
    vline(u, zeroDbm0Dbov, p.mark, '0 dBm0', STYLES.mark.dash, 0);
    if (activeDbov !== null) vline(u, activeDbov, p.mark, `active ${activeDbov.toFixed(1)} dBov`, [], 1);
  };
  const chart = boxChart(
    plotBox,
    {
      scales: {
        x: { time: false, range: [-80, 0] },
        y: { range: (_u, _min, max) => [0, Math.max(0.5, max * 1.1)] },
      },
      axes: [
        axis('dBov'),
        axis('% of samples', { values: (_u, v) => v.map((t) => t.toFixed(1)) }),
        axis('dBm0', {
          scale: 'x',
          side: 0,
          // Round dBm0 figures, placed on the dBov scale below.
          splits: (_u, _i, min, max) => {
            const off = SINE_CREST_DB + lc;
            const out: number[] = [];
            for (let d = Math.ceil((min + off) / 10) * 10; d <= max + off; d += 10) out.push(d - off);
            return out;
          },
          values: (_u, v) => v.map((t) => (t + SINE_CREST_DB + lc).toFixed(0)),
          grid: { show: false },
        }),
      ],
      series: [{}, styledSeries('share', SHARE, { fill: () => palette().fill })],
      hooks: {
        draw: [marks],
        setCursor: [
          (u) => {
            const v = cursorValue(u, 1);
            const at = cursorValue(u, 0);
            key.readout(v === null || at === null ? '' : `${at.toFixed(1)} dBov: ${fmt(v, 2, '%')}`);
          },
        ],
      },
    },
    [x, share],
  );

  return {
    el,
    take(a: AnalysisSnapshot, ctx: LiveContext) {
      const ch = a.channels[ctx.active];
      const talker = a.talkers[ch.talker];
      const lv = talker.levels;
      ring.push(lv.counts, lv.total, `${ch.talker}:${ch.text}`);
      counts.set(lv.counts);
      total = lv.total;
      if (edges.length !== ch.meter.segments.edgesDbov.length)
        edges = new Float64Array(ch.meter.segments.edgesDbov.length);
      edges.set(ch.meter.segments.edgesDbov);
      lc = talker.loadCapacityDbm0;
      zeroDbm0Dbov = -SINE_CREST_DB - lc;
      activeDbov = talker.activeWindow.activeLevelDbov;
      edgesOf = ctx.active === 0 ? 'A' : 'B';
      seen = true;
    },
    draw() {
      if (!seen) return;
      box.waiting(null);
      let n = total;
      if (store.page.spread === 'whole') recent.set(counts);
      else n = ring.recent(recent);
      let best = -1;
      let bestShare = 0;
      for (let k = 0; k < LEVEL_BIN_COUNT; k++) {
        share[k] = n > 0 ? (100 * recent[k]) / n : 0;
        if (share[k] > bestShare) {
          bestShare = share[k];
          best = k;
        }
      }
      key.rename(1, `segment edges (${edgesOf})`);
      el.dataset.edgesOf = edgesOf;
      el.dataset.modeDbov = best < 0 ? '' : x[best].toFixed(2);
      el.dataset.edges = Array.from(edges.subarray(1), (e) => e.toFixed(2)).join(',');
      el.dataset.activeDbov = activeDbov === null ? '' : activeDbov.toFixed(2);
      chart.plot.setData([x, share]);
    },
    clear() {
      seen = false;
      box.waiting('Waiting for audio: press Start audio.');
    },
  };
}
