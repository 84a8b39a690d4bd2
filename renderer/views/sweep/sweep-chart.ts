// The Level/SNR chart of a sweep: in-band figures of A and B, their exact theory
// (wideband) where it exists, and the acceptance mask. Cursor values show in the legend.
import uPlot from 'uplot';
import { FittedChart } from '../fitted-chart';
import { SWEEP_CEILING_DB, SWEEP_FLOOR_DB, maskLimitAt, type SweepResult } from '../../../core/sweep/index';

/** Our own palette: A blue, B amber, theory lighter, mask grey. */
const COLORS = { a: '#2b6cb0', b: '#c26a1b', aTheory: '#8fb3db', bTheory: '#e5b78c', mask: '#7a7a7a' };

/** The sweep's floor (silent output) and ceiling (no error) are not figures to draw. */
const drawn = (v: number | null) => (v === null || v <= SWEEP_FLOOR_DB || v >= SWEEP_CEILING_DB ? null : v);

const dbValue = (_u: uPlot, v: number | null) => (v === null ? '—' : `${v.toFixed(1)} dB`);

export class SweepChart extends FittedChart {
  constructor(host: HTMLElement) {
    super(host, 240, 480);
  }

  show(results: SweepResult[]): void {
    const [a, b] = results;
    const x = a.points.map((p) => p.dbm0);
    const mask = a.judgement?.mask ?? null;
    const data: uPlot.AlignedData = [
      x,
      a.points.map((p) => drawn(p.inBandDb)),
      b.points.map((p) => drawn(p.inBandDb)),
      a.points.map((p) => drawn(p.theoryDb)),
      b.points.map((p) => drawn(p.theoryDb)),
      x.map((l) => (mask ? maskLimitAt(mask, l) : null)),
    ];
    this.plot?.destroy();
    this.plot = new uPlot(
      {
        ...this.size(),
        title: 'SNR versus input level',
        scales: {
          x: { time: false },
          y: {
            range: (_u, lo, hi) => [
              Math.max(-10, Math.floor((lo ?? 0) / 10) * 10),
              Math.ceil((hi ?? 60) / 10) * 10,
            ],
          },
        },
        axes: [
          { label: 'Level at the quantizer input (dBm0)' },
          { label: 'Signal to total distortion (dB)', values: (_u, v) => v.map((t) => `${t} dB`) },
        ],
        series: [
          { label: 'Level', value: (_u, v) => (v === null ? '—' : `${v.toFixed(1)} dBm0`) },
          { label: `A ${a.channel}`, stroke: COLORS.a, width: 2, value: dbValue, points: { show: true } },
          { label: `B ${b.channel}`, stroke: COLORS.b, width: 2, value: dbValue, points: { show: true } },
          {
            label: 'A theory',
            stroke: COLORS.aTheory,
            dash: [6, 4],
            value: dbValue,
            points: { show: false },
          },
          {
            label: 'B theory',
            stroke: COLORS.bTheory,
            dash: [6, 4],
            value: dbValue,
            points: { show: false },
          },
          {
            label: mask ? mask.name : 'no mask',
            stroke: COLORS.mask,
            width: 2,
            dash: [2, 3],
            value: dbValue,
            points: { show: false },
          },
        ],
      },
      data,
      this.host,
    );
  }
}
