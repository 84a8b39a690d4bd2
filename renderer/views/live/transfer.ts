// Transfer curve: the compressor characteristics of A and B on |x| / overload point;
// drag to zoom, and the quantizer's staircase appears once its steps can be seen.
import type uPlot from 'uplot';
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { axis, liveChart, stroke, vline, withUnit } from '../charts';
import { palette } from '../theme';
import { panelBox, type LivePanel } from './panel';
import { compressorAt, firstStage } from './theory';

const POINTS = 600;
/** The staircase is drawn when the view holds fewer cells than this (common practice, no source). */
const STEPS_VISIBLE = 80;

interface Curve {
  text: string;
  decisions: Float64Array;
  v: number;
}

export function transferPanel(): LivePanel {
  const { el, body } = panelBox('panel-transfer', 'Transfer curve (drag to zoom, double-click to reset)');
  const x = new Float64Array(POINTS);
  const ys = [0, 1, 2, 3].map(() => new Array<number | null>(POINTS).fill(null));
  const curves: Curve[] = [
    { text: '', decisions: new Float64Array(0), v: 1 },
    { text: '', decisions: new Float64Array(0), v: 1 },
  ];
  const out = { smooth: 0, step: 0 };
  let activeX: number | null = null;
  let busy = false;

  const fill = (from: number, to: number) => {
    let cellsInView = Infinity;
    for (let c = 0; c < 2; c++) {
      const cv = curves[c];
      if (cv.decisions.length === 0) continue;
      const n = cv.decisions.length + 1;
      cellsInView = Math.min(cellsInView, ((to - from) * n) / 2);
    }
    // Zooming in on either channel shows both staircases on the same view.
    const steps = cellsInView < STEPS_VISIBLE;
    for (let i = 0; i < POINTS; i++) {
      x[i] = from + ((to - from) * i) / (POINTS - 1);
      for (let c = 0; c < 2; c++) {
        const cv = curves[c];
        if (cv.decisions.length === 0) continue;
        compressorAt(cv.decisions, cv.v, x[i] * cv.v, out);
        ys[c][i] = out.smooth;
        ys[c + 2][i] = steps ? out.step : null;
      }
    }
    el.dataset.staircase = String(steps);
  };

  const chart = liveChart(
    body,
    {
      scales: { x: { time: false, auto: false, range: (_u, min, max) => [min, max] }, y: { auto: true } },
      axes: [axis('input |x| / overload point'), axis('compressed (±1)')],
      series: [
        { label: 'x', value: withUnit('', 4) },
        { label: 'A', stroke: stroke('a'), width: 1.5, value: withUnit('', 4), points: { show: false } },
        { label: 'B', stroke: stroke('b'), width: 1.5, value: withUnit('', 4), points: { show: false } },
        {
          label: 'A steps',
          stroke: stroke('a'),
          width: 1,
          dash: [4, 2],
          value: withUnit('', 4),
          points: { show: false },
        },
        {
          label: 'B steps',
          stroke: stroke('b'),
          width: 1,
          dash: [4, 2],
          value: withUnit('', 4),
          points: { show: false },
        },
      ],
      hooks: {
        draw: [(u: uPlot) => activeX !== null && vline(u, activeX, palette().mark, 'talker RMS', [4, 3])],
        setSelect: [
          (u: uPlot) => {
            if (u.select.width < 4) return;
            const from = Math.max(0, u.posToVal(u.select.left, 'x'));
            const to = Math.min(1, u.posToVal(u.select.left + u.select.width, 'x'));
            u.setSelect({ left: 0, top: 0, width: 0, height: 0 }, false);
            zoom(u, from, to);
          },
        ],
      },
      cursor: { drag: { x: true, y: false, setScale: false } },
    },
    [x, ...ys],
  );
  const zoom = (u: uPlot, from: number, to: number) => {
    if (busy || !(to > from)) return;
    busy = true;
    fill(from, to);
    u.setData([x, ...ys], false);
    u.setScale('x', { min: from, max: to });
    el.dataset.view = `${from.toFixed(5)}..${to.toFixed(5)}`;
    busy = false;
  };
  chart.plot.over.addEventListener('dblclick', () => zoom(chart.plot, 0, 1));

  return {
    el,
    update(a: AnalysisSnapshot) {
      let changed = false;
      for (let c = 0; c < 2; c++) {
        const text = a.channels[c].text;
        if (curves[c].text === text) continue;
        const q = firstStage(text);
        curves[c] = { text, decisions: q.table().decisions, v: q.overloadPoint };
        changed = true;
      }
      const t = a.talkers[a.channels[0].talker];
      const rms = t.meter.momentaryRms / t.overloadPoint;
      const before = activeX;
      activeX = rms > 0 ? rms : null;
      el.dataset.talkerRms = activeX === null ? '' : activeX.toFixed(5);
      if (changed) zoom(chart.plot, 0, 1);
      else if (before !== activeX) chart.plot.redraw(false);
    },
  };
}
