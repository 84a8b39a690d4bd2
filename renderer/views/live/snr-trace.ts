// SNR trace: frame SNR of A and B over the last 60 s, with the Reference level (frame
// level at the quantizer's input) in a strip underneath, cursors in step.
import type uPlot from 'uplot';
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { h } from '../../dom';
import { axis, boxChart, cursorValue, fmt } from '../../charts/chart';
import { legend } from '../../charts/legend';
import { STYLES, styledSeries } from '../../charts/series';
import { shortText } from '../../settings/store';
import { ChannelHistory, TRACE_FRAMES } from './history';
import { panelBox, type LivePanel } from './panel';

export function snrTracePanel(): LivePanel {
  const box = panelBox('panel-snr-trace', 'SNR trace, last 60 s');
  const { el, body } = box;
  const key = legend(
    [
      { label: 'A', style: STYLES.a },
      { label: 'B', style: STYLES.b },
      { label: 'Reference level', style: STYLES.reference },
    ],
    'legend-snr-trace',
  );
  const top = h('div', { class: 'plot tall' });
  const bottom = h('div', { class: 'plot short' });
  body.append(key.el, top, bottom);
  const hist = [new ChannelHistory(), new ChannelHistory()];
  const texts = ['', ''];
  const x = Float64Array.from({ length: TRACE_FRAMES }, (_, i) => (i - TRACE_FRAMES + 1) * 0.02);
  const ys = [0, 1, 2].map(() => new Array<number | null>(TRACE_FRAMES).fill(null));
  const cursor = { sync: { key: 'snr-trace' } };
  const readout = (u: uPlot) => {
    const t = cursorValue(u, 0);
    const i = u.cursor.idx;
    if (t === null || i === null || i === undefined) return key.readout('');
    key.readout(
      `${t.toFixed(2)} s: A ${fmt(ys[0][i], 1, 'dB')} · B ${fmt(ys[1][i], 1, 'dB')} · Ref ${fmt(ys[2][i], 1, 'dBov')}`,
    );
  };
  const snr = boxChart(
    top,
    {
      cursor,
      scales: { x: { time: false }, y: { range: [-10, 70] } },
      axes: [axis('', { size: 18, values: () => [] }), axis('SNR (dB)')],
      series: [
        {},
        styledSeries('A', STYLES.a, { spanGaps: false }),
        styledSeries('B', STYLES.b, { spanGaps: false }),
      ],
      hooks: { setCursor: [readout] },
    },
    [x, ys[0], ys[1]],
  );
  const level = boxChart(
    bottom,
    {
      cursor,
      scales: { x: { time: false }, y: { range: [-70, 0] } },
      axes: [axis('seconds'), axis('dBov')],
      series: [{}, styledSeries('Reference level', STYLES.reference)],
      hooks: { setCursor: [readout] },
    },
    [x, ys[2]],
  );
  let seen = false;
  return {
    el,
    take(a: AnalysisSnapshot) {
      for (let c = 0; c < 2; c++) {
        hist[c].take(a, c);
        texts[c] = a.channels[c].text;
      }
      seen = true;
    },
    draw() {
      if (!seen) return;
      box.waiting(null);
      key.rename(0, `A ${shortText(texts[0])}`);
      key.rename(1, `B ${shortText(texts[1])}`);
      const h0 = hist[0];
      for (let i = 0; i < TRACE_FRAMES; i++) {
        for (let c = 0; c < 2; c++) {
          const hc = hist[c];
          const v = hc.snr[(hc.head + i) % TRACE_FRAMES];
          ys[c][i] = Number.isNaN(v) ? null : v;
        }
        const lv = h0.level[(h0.head + i) % TRACE_FRAMES];
        ys[2][i] = Number.isNaN(lv) ? null : Math.max(-70, lv);
      }
      const last = (TRACE_FRAMES + h0.head - 1) % TRACE_FRAMES;
      el.dataset.lastLevel = Number.isNaN(h0.level[last]) ? '' : h0.level[last].toFixed(2);
      const lastA = ys[0][TRACE_FRAMES - 1];
      el.dataset.lastSnrA = lastA === null ? '' : lastA.toFixed(2);
      snr.plot.setData([x, ys[0], ys[1]]);
      level.plot.setData([x, ys[2]]);
    },
    clear() {
      seen = false;
      for (const hc of hist) hc.reset();
      box.waiting('Waiting for audio: press Start audio.');
    },
  };
}
