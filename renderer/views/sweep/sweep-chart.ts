// The chart of a sweep: in-band figures of A and B, their exact theory (wideband) where
// it exists, and the acceptance mask, in the styles every chart shares.
import type uPlot from 'uplot';
import { SWEEP_CEILING_DB, SWEEP_FLOOR_DB, maskLimitAt, type SweepResult } from '../../../core/sweep/index';
import { h } from '../../dom';
import { axis, boxChart, cursorValue, fmt, type BoxChart } from '../../charts/chart';
import { legend, type Legend } from '../../charts/legend';
import { STYLES, slotStyle, styledSeries } from '../../charts/series';
import { shortText } from '../../settings/store';

/** The sweep's floor (silent output) and ceiling (no error) are not figures to draw. */
const drawn = (v: number | null) => (v === null || v <= SWEEP_FLOOR_DB || v >= SWEEP_CEILING_DB ? null : v);

export class SweepChart {
  private readonly key: Legend;
  private readonly chart: BoxChart;

  constructor(host: HTMLElement) {
    this.key = legend(
      [
        { label: 'A, in-band', style: slotStyle(0, 'sweep') },
        { label: 'B, in-band', style: slotStyle(1, 'sweep') },
        { label: 'A theory (wideband)', style: slotStyle(0, 'theory') },
        { label: 'B theory (wideband)', style: slotStyle(1, 'theory') },
        { label: 'mask', style: STYLES.mask },
      ],
      'legend-sweep',
    );
    const plot = h('div', { class: 'plot' });
    host.append(this.key.el, plot);
    const readout = (u: uPlot) => {
      const at = cursorValue(u, 0);
      this.key.readout(
        at === null
          ? ''
          : `${at.toFixed(1)} dBm0: A ${fmt(cursorValue(u, 1), 1, 'dB')} · B ${fmt(cursorValue(u, 2), 1, 'dB')} · mask ${fmt(cursorValue(u, 5), 1, 'dB')}`,
      );
    };
    this.chart = boxChart(
      plot,
      {
        scales: {
          x: { time: false },
          y: {
            range: (_u, lo, hi) => [
              Math.max(-10, Math.floor((lo ?? 0) / 10) * 10),
              Math.ceil((hi ?? 60) / 10) * 10,
            ],
          },
        },
        axes: [axis('level at the quantizer input (dBm0)'), axis('signal to total distortion (dB)')],
        series: [
          {},
          styledSeries('A', slotStyle(0, 'sweep')),
          styledSeries('B', slotStyle(1, 'sweep')),
          styledSeries('A theory', slotStyle(0, 'theory')),
          styledSeries('B theory', slotStyle(1, 'theory')),
          styledSeries('mask', STYLES.mask),
        ],
        hooks: { setCursor: [readout] },
      },
      [[], [], [], [], [], []],
    );
  }

  show(results: readonly SweepResult[]): void {
    const [a, b] = results;
    const x = a.points.map((p) => p.dbm0);
    const mask = a.judgement?.mask ?? null;
    const method = a.stimulus.method === 'sine' ? 'sine' : 'noise';
    this.key.rename(0, `A ${shortText(a.channel)}, in-band (${method})`);
    this.key.rename(1, `B ${shortText(b.channel)}, in-band (${method})`);
    this.key.rename(4, mask ? `${mask.name} mask` : 'no mask');
    this.key.show(4, mask !== null);
    this.chart.plot.setData([
      x,
      a.points.map((p) => drawn(p.inBandDb)),
      b.points.map((p) => drawn(p.inBandDb)),
      a.points.map((p) => drawn(p.theoryDb)),
      b.points.map((p) => drawn(p.theoryDb)),
      x.map((l) => (mask ? maskLimitAt(mask, l) : null)),
    ]);
  }

  destroy(): void {
    this.chart.destroy();
  }
}
