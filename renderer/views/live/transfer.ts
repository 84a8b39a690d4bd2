// Transfer curve: the compressor characteristics of A and B on |x| / overload point;
// drag to zoom, and the quantizer's staircase appears once its steps can be seen.
import type uPlot from 'uplot';
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { h } from '../../dom';
import { axis, boxChart, cursorValue, fmt, vline } from '../../charts/chart';
import { legend } from '../../charts/legend';
import { STYLES, slotStyle, styledSeries } from '../../charts/series';
import { palette } from '../../charts/theme';
import { shortText } from '../../settings/store';
import { panelBox, type LivePanel } from './panel';
import { compressorAt, firstStage } from './transfer-geometry';

const POINTS = 600;
/** The staircase is drawn when the view holds fewer cells than this (common practice, no source). */
const STEPS_VISIBLE = 80;

interface Curve {
  text: string;
  decisions: Float64Array;
  v: number;
}

export function transferPanel(): LivePanel {
  const reset = h(
    'button',
    { type: 'button', class: 'toggle', 'data-testid': 'transfer-reset' },
    'Whole range',
  );
  const box = panelBox('panel-transfer', 'Transfer curve', reset);
  const { el, body } = box;
  const key = legend(
    [
      { label: 'A', style: slotStyle(0, 'line') },
      { label: 'B', style: slotStyle(1, 'line') },
      { label: 'steps', style: STYLES.limit },
      { label: 'talker RMS', style: STYLES.mark },
    ],
    'legend-transfer',
  );
  const hint = h(
    'p',
    { class: 'hint' },
    'Drag across the chart to zoom in; the steps show once they can be told apart.',
  );
  const plotBox = h('div', { class: 'plot' });
  body.append(key.el, plotBox, hint);
  const x = new Float64Array(POINTS);
  const ys = [0, 1, 2, 3].map(() => new Array<number | null>(POINTS).fill(null));
  const curves: Curve[] = [
    { text: '', decisions: new Float64Array(0), v: 1 },
    { text: '', decisions: new Float64Array(0), v: 1 },
  ];
  const out = { smooth: 0, step: 0 };
  let talkerX: number | null = null;
  let drawnX: number | null = null;
  let pendingTexts: [string, string] = ['', ''];
  let busy = false;

  const fill = (from: number, to: number) => {
    let cellsInView = Infinity;
    for (const cv of curves) {
      if (cv.decisions.length === 0) continue;
      cellsInView = Math.min(cellsInView, ((to - from) * (cv.decisions.length + 1)) / 2);
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
    key.show(2, steps);
  };

  const chart = boxChart(
    plotBox,
    {
      scales: { x: { time: false, auto: false, range: (_u, min, max) => [min, max] }, y: { auto: true } },
      axes: [axis('input |x| / overload point'), axis('compressed (±1)')],
      series: [
        {},
        styledSeries('A', slotStyle(0, 'line')),
        styledSeries('B', slotStyle(1, 'line')),
        styledSeries('A steps', { ...STYLES.limit, colour: 'a' }),
        styledSeries('B steps', { ...STYLES.limit, colour: 'b' }),
      ],
      hooks: {
        draw: [
          (u: uPlot) => talkerX !== null && vline(u, talkerX, palette().mark, 'talker RMS', STYLES.mark.dash),
        ],
        setSelect: [
          (u: uPlot) => {
            if (u.select.width < 4) return;
            const from = Math.max(0, u.posToVal(u.select.left, 'x'));
            const to = Math.min(1, u.posToVal(u.select.left + u.select.width, 'x'));
            u.setSelect({ left: 0, top: 0, width: 0, height: 0 }, false);
            zoom(from, to);
          },
        ],
        setCursor: [
          (u: uPlot) => {
            const at = cursorValue(u, 0);
            key.readout(
              at === null
                ? ''
                : `|x| ${at.toFixed(4)}: A ${fmt(cursorValue(u, 1), 4, '')} · B ${fmt(cursorValue(u, 2), 4, '')}`,
            );
          },
        ],
      },
      cursor: { drag: { x: true, y: false, setScale: false } },
    },
    [x, ...ys],
  );
  const zoom = (from: number, to: number) => {
    if (busy || !(to > from)) return;
    busy = true;
    fill(from, to);
    chart.plot.setData([x, ...ys], false);
    chart.plot.setScale('x', { min: from, max: to });
    el.dataset.view = `${from.toFixed(5)}..${to.toFixed(5)}`;
    busy = false;
  };
  chart.plot.over.addEventListener('dblclick', () => zoom(0, 1));
  reset.addEventListener('click', () => zoom(0, 1));
  let seen = false;

  return {
    el,
    take(a: AnalysisSnapshot) {
      pendingTexts = [a.channels[0].text, a.channels[1].text];
      const t = a.talkers[a.channels[0].talker];
      const rms = t.meter.momentaryRms / t.overloadPoint;
      talkerX = rms > 0 ? rms : null;
      seen = true;
    },
    draw() {
      if (!seen) return;
      box.waiting(null);
      let changed = false;
      for (let c = 0; c < 2; c++) {
        const text = pendingTexts[c];
        if (curves[c].text === text) continue;
        const q = firstStage(text);
        curves[c] = { text, decisions: q.table().decisions, v: q.overloadPoint };
        key.rename(c, `${c === 0 ? 'A' : 'B'} ${shortText(text)}`);
        changed = true;
      }
      el.dataset.talkerRms = talkerX === null ? '' : talkerX.toFixed(5);
      if (changed) zoom(0, 1);
      else if (drawnX !== talkerX) chart.plot.redraw(false);
      drawnX = talkerX;
    },
    clear() {
      seen = false;
      box.waiting('Waiting for audio: press Start audio.');
    },
  };
}
