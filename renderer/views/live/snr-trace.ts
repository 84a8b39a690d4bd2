// SNR trace: frame SNR of A and B over the last 60 s, with the Reference level
// (frame level at the quantizer's input) in a strip underneath, cursors in step.
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { h } from '../../dom';
import { axis, liveChart, stroke, withUnit } from '../charts';
import { ChannelHistory, TRACE_FRAMES } from './history';
import { panelBox, type LivePanel } from './panel';

export function snrTracePanel(): LivePanel {
  const { el, body } = panelBox('panel-snr-trace', 'SNR trace (last 60 s)');
  const top = h('div', { class: 'chart-box tall' });
  const bottom = h('div', { class: 'chart-box short' });
  body.append(top, bottom);
  const hist = [new ChannelHistory(), new ChannelHistory()];
  const x = Float64Array.from({ length: TRACE_FRAMES }, (_, i) => (i - TRACE_FRAMES + 1) * 0.02);
  const ys = [0, 1, 2].map(() => new Array<number | null>(TRACE_FRAMES).fill(null));
  const cursor = { sync: { key: 'snr-trace' } };
  const snr = liveChart(
    top,
    {
      cursor,
      scales: { x: { time: false }, y: { range: [-10, 70] } },
      axes: [axis('', { size: 20 }), axis('SNR (dB)')],
      series: [
        { label: 't', value: withUnit('s') },
        {
          label: 'A',
          stroke: stroke('a'),
          width: 1.5,
          value: withUnit('dB'),
          spanGaps: false,
          points: { show: false },
        },
        {
          label: 'B',
          stroke: stroke('b'),
          width: 1.5,
          value: withUnit('dB'),
          spanGaps: false,
          points: { show: false },
        },
      ],
    },
    [x, ys[0], ys[1]],
  );
  const level = liveChart(
    bottom,
    {
      cursor,
      scales: { x: { time: false }, y: { range: [-70, 0] } },
      axes: [axis('seconds'), axis('Ref (dBov)')],
      series: [
        { label: 't', value: withUnit('s') },
        {
          label: 'Reference level',
          stroke: stroke('reference'),
          width: 1,
          value: withUnit('dBov'),
          points: { show: false },
        },
      ],
    },
    [x, ys[2]],
  );
  return {
    el,
    update(a: AnalysisSnapshot) {
      for (let c = 0; c < 2; c++) hist[c].take(a, c);
      const h0 = hist[0];
      for (let i = 0; i < TRACE_FRAMES; i++) {
        const at = (h0.head + i) % TRACE_FRAMES;
        for (let c = 0; c < 2; c++) {
          const hc = hist[c];
          const v = hc.snr[(hc.head + i) % TRACE_FRAMES];
          ys[c][i] = Number.isNaN(v) ? null : v;
        }
        const lv = h0.level[at];
        ys[2][i] = Number.isNaN(lv) ? null : Math.max(-70, lv);
      }
      const last = (TRACE_FRAMES + h0.head - 1) % TRACE_FRAMES;
      el.dataset.lastLevel = Number.isNaN(h0.level[last]) ? '' : h0.level[last].toFixed(2);
      el.dataset.lastSnrA = ys[0][TRACE_FRAMES - 1] === null ? '' : ys[0][TRACE_FRAMES - 1]!.toFixed(2);
      snr.plot.setData([x, ys[0], ys[1]]);
      level.plot.setData([x, ys[2]]);
    },
  };
}
