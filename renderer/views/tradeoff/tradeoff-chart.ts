// Bit rate against the predicted share of active frames meeting the target: one point per
// candidate, by law family, the channels in use ringed, the required share as a line.
// Hovering a point names the candidate in full.
import uPlot from 'uplot';
import type { CandidateFamily, Recommendation } from '../../../core/design/index';
import { h } from '../../dom';
import { axis, boxChart, type BoxChart } from '../../charts/chart';
import { legend, type Legend } from '../../charts/legend';
import { STYLES, styledSeries, type SeriesStyle } from '../../charts/series';
import { FAMILY_LABELS, describeCandidate } from './candidate-table';

const FAMILIES: readonly CandidateFamily[] = ['uniform', 'mu', 'a', 'g711', 'designed'];

/** Family colours come from the theme; filled and hollow markers alternate so greyscale still tells them apart. */
const FAMILY_STYLES: Record<CandidateFamily, SeriesStyle> = {
  uniform: { colour: 'familyUniform', dash: [], width: 0, marker: 'hollow', markerSize: 7 },
  mu: { colour: 'familyMu', dash: [], width: 0, marker: 'filled', markerSize: 7 },
  a: { colour: 'familyA', dash: [], width: 0, marker: 'hollow', markerSize: 9 },
  g711: { colour: 'familyG711', dash: [], width: 0, marker: 'filled', markerSize: 9 },
  designed: { colour: 'familyDesigned', dash: [], width: 0, marker: 'filled', markerSize: 5 },
};
const RING: Record<'a' | 'b', SeriesStyle> = {
  a: { colour: 'a', dash: [], width: 0, marker: 'hollow', markerSize: 16 },
  b: { colour: 'b', dash: [], width: 0, marker: 'hollow', markerSize: 20 },
};

/** Pixels within which the cursor picks a point (common practice, no source). */
const PICK_PX = 10;

export class TradeoffChart {
  readonly key: Legend;
  readonly hover: HTMLElement;
  private chart: BoxChart | null = null;
  private shown: { r: Recommendation; inUse: readonly number[] } | null = null;

  constructor(private readonly host: HTMLElement) {
    this.key = legend(
      [
        ...FAMILIES.map((f) => ({ label: FAMILY_LABELS[f], style: FAMILY_STYLES[f] })),
        { label: 'A in use', style: RING.a },
        { label: 'B in use', style: RING.b },
        { label: 'required share', style: STYLES.limit },
      ],
      'legend-tradeoff',
    );
    this.hover = h('p', {
      class: 'chart-hover',
      'data-testid': 'tradeoff-hover',
      role: 'status',
      hidden: true,
    });
    const plot = h('div', { class: 'plot' });
    host.append(this.key.el, plot, this.hover);
    this.chart = boxChart(
      plot,
      {
        scales: { x: { time: false }, y: { range: [0, 100] } },
        axes: [axis('bit rate (kbit/s)'), axis('predicted share (%)')],
        series: [
          {},
          ...FAMILIES.map((f) => styledSeries(FAMILY_LABELS[f], FAMILY_STYLES[f])),
          styledSeries('A in use', RING.a),
          styledSeries('B in use', RING.b),
          styledSeries('required share', STYLES.limit),
        ],
        hooks: { setCursor: [(u) => this.pick(u)] },
      },
      [[], ...FAMILIES.map(() => []), [], [], []],
    );
  }

  show(r: Recommendation, inUse: readonly number[]): void {
    this.shown = { r, inUse };
    const c = r.candidates;
    const share = (i: number) => c[i].predictedShare * 100;
    const data: uPlot.AlignedData = [
      c.map((v) => v.bitRate / 1000),
      ...FAMILIES.map((f) => c.map((v, i) => (v.family === f ? share(i) : null))),
      ...[0, 1].map((slot) => c.map((_v, i) => (inUse[slot] === i ? share(i) : null))),
      c.map(() => r.share * 100),
    ];
    this.chart?.plot.setData(data);
    this.host.dataset.points = String(c.length);
  }

  /** The candidate nearest the cursor, within a few pixels, named in the hover line. */
  private pick(u: uPlot): void {
    const s = this.shown;
    const left = u.cursor.left ?? -1;
    const top = u.cursor.top ?? -1;
    if (!s || left < 0 || top < 0) {
      this.hover.hidden = true;
      return;
    }
    let best = -1;
    let bestD = PICK_PX * PICK_PX;
    s.r.candidates.forEach((c, i) => {
      const dx = u.valToPos(c.bitRate / 1000, 'x') - left;
      const dy = u.valToPos(c.predictedShare * 100, 'y') - top;
      const d = dx * dx + dy * dy;
      if (d <= bestD) {
        bestD = d;
        best = i;
      }
    });
    if (best < 0) {
      this.hover.hidden = true;
      delete this.hover.dataset.candidate;
      return;
    }
    const c = s.r.candidates[best];
    this.hover.hidden = false;
    this.hover.textContent = describeCandidate(c, s.r);
    this.hover.dataset.candidate = c.id;
  }

  destroy(): void {
    this.chart?.destroy();
    this.chart = null;
  }
}
