// Level spread: share of samples per 0.5 dB of instantaneous level (dBov below,
// dBm0 above), the monitored channel's segment edges, the talker's active level and
// 0 dBm0 marked. "This moment" differences whole-session counts over the last 3 s.
import type uPlot from 'uplot';
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { LEVEL_BIN_COUNT, LEVEL_BIN_DB, LEVEL_MIN_DBOV } from '../../../core/measure/levels';
import { SINE_CREST_DB } from '../../../core/units/levels';
import { h } from '../../dom';
import { axis, liveChart, stroke, vline, withUnit } from '../charts';
import { palette } from '../theme';
import { HistogramRing } from './history';
import { panelBox, type LiveContext, type LivePanel } from './panel';

/** Snapshots kept for "this moment": about 3 s at 25 per second. */
const MOMENT_DEPTH = 75;

export function levelSpreadPanel(): LivePanel {
  const moment = h(
    'button',
    { type: 'button', 'data-testid': 'spread-moment', 'aria-pressed': 'true' },
    'This moment',
  );
  const session = h(
    'button',
    { type: 'button', 'data-testid': 'spread-session', 'aria-pressed': 'false' },
    'Whole session',
  );
  const tools = h(
    'div',
    { class: 'seg-toggle', role: 'group', 'aria-label': 'Level spread span' },
    moment,
    session,
  );
  const { el, body } = panelBox('panel-level-spread', 'Level spread', tools);
  let whole = false;
  const choose = (w: boolean) => {
    whole = w;
    moment.setAttribute('aria-pressed', String(!w));
    session.setAttribute('aria-pressed', String(w));
    el.dataset.span = w ? 'session' : 'moment';
  };
  moment.addEventListener('click', () => choose(false));
  session.addEventListener('click', () => choose(true));
  choose(false);

  const x = Float64Array.from(
    { length: LEVEL_BIN_COUNT },
    (_, k) => LEVEL_MIN_DBOV + (k + 0.5) * LEVEL_BIN_DB,
  );
  const share = new Float64Array(LEVEL_BIN_COUNT);
  const recent = new Float64Array(LEVEL_BIN_COUNT);
  const ring = new HistogramRing(LEVEL_BIN_COUNT, MOMENT_DEPTH);
  let edges: Float64Array = new Float64Array(0);
  let activeDbov: number | null = null;
  let zeroDbm0Dbov = NaN;
  let lc = 0;

  const draw = (u: uPlot) => {
    const p = palette();
    for (let i = 1; i < edges.length - 1; i++) vline(u, edges[i], p.mutedInk, '', [3, 3]);
    vline(u, zeroDbm0Dbov, p.mark, '0 dBm0', [6, 3]);
    if (activeDbov !== null) vline(u, activeDbov, p.a, `active ${activeDbov.toFixed(1)} dBov`);
  };
  const chart = liveChart(
    body,
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
          values: (_u, v) => v.map((t) => (t + SINE_CREST_DB + lc).toFixed(0)),
          grid: { show: false },
        }),
      ],
      series: [
        { label: 'level', value: withUnit('dBov') },
        {
          label: 'share',
          stroke: stroke('a'),
          fill: () => palette().grid,
          width: 1.5,
          value: withUnit('%', 2),
          points: { show: false },
        },
      ],
      hooks: { draw: [draw] },
      legend: { live: true },
    },
    [x, share],
  );

  return {
    el,
    update(a: AnalysisSnapshot, ctx: LiveContext) {
      const ch = a.channels[ctx.active];
      const talker = a.talkers[ch.talker];
      const lv = talker.levels;
      ring.push(lv.counts, lv.total, `${ch.talker}:${ch.text}`);
      let total = lv.total;
      if (whole) recent.set(lv.counts);
      else total = ring.recent(recent);
      let best = -1;
      let bestShare = 0;
      for (let k = 0; k < LEVEL_BIN_COUNT; k++) {
        share[k] = total > 0 ? (100 * recent[k]) / total : 0;
        if (share[k] > bestShare) {
          bestShare = share[k];
          best = k;
        }
      }
      edges = ch.meter.segments.edgesDbov;
      lc = talker.loadCapacityDbm0;
      zeroDbm0Dbov = -SINE_CREST_DB - lc;
      activeDbov = talker.activeWindow.activeLevelDbov;
      el.dataset.edgesOf = ctx.active === 0 ? 'A' : 'B';
      el.dataset.modeDbov = best < 0 ? '' : x[best].toFixed(2);
      el.dataset.edges = Array.from(edges.subarray(1), (e) => e.toFixed(2)).join(',');
      chart.plot.setData([x, share]);
    },
  };
}
