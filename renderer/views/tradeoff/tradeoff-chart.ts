// Bit rate against predicted share of active frames meeting the target, one point per
// candidate channel, by family; A and B ringed; the required share as a line.
import uPlot from 'uplot';
import { FittedChart } from '../fitted-chart';
import type { CandidateFamily, Recommendation } from '../../../core/design/index';

const FAMILIES: readonly CandidateFamily[] = ['uniform', 'mu', 'a', 'g711', 'designed'];
const FAMILY_LABELS: Record<CandidateFamily, string> = {
  uniform: 'Uniform',
  mu: 'mu-law',
  a: 'A-law',
  g711: 'G.711',
  designed: 'Designed for talker',
};
/** Our own palette. */
const FAMILY_COLORS: Record<CandidateFamily, string> = {
  uniform: '#6b7a8f',
  mu: '#3f8f6b',
  a: '#8a5fb0',
  g711: '#b8a12a',
  designed: '#c2415d',
};
const A_COLOR = '#2b6cb0';
const B_COLOR = '#c26a1b';

const noPath = () => null;
const pct = (_u: uPlot, v: number | null) => (v === null ? '—' : `${v.toFixed(1)} %`);

export class TradeoffChart extends FittedChart {
  constructor(host: HTMLElement) {
    super(host, 220, 420);
  }

  show(r: Recommendation, highlight: number[], labels: string[]): void {
    const c = r.candidates;
    const x = c.map((v) => v.bitRate / 1000);
    const share = (v: (typeof c)[number]) => v.predictedShare * 100;
    const data: uPlot.AlignedData = [
      x,
      ...FAMILIES.map((f) => c.map((v) => (v.family === f ? share(v) : null))),
      ...highlight.map((k) => c.map((v, i) => (i === k ? share(v) : null))),
      c.map(() => r.share * 100),
    ];
    const point = (stroke: string, size: number) => ({
      stroke,
      fill: stroke,
      paths: noPath,
      points: { show: true, size, stroke, fill: stroke },
      value: pct,
    });
    this.plot?.destroy();
    this.plot = new uPlot(
      {
        ...this.size(),
        title: `Share of active frames at or above ${r.targetSnrDb} dB (${r.frames} frames)`,
        scales: { x: { time: false }, y: { range: [0, 100] } },
        axes: [
          { label: 'Bit rate (kbit/s)' },
          { label: 'Predicted share (%)', values: (_u, v) => v.map((t) => `${t} %`) },
        ],
        series: [
          { label: 'Bit rate', value: (_u, v) => (v === null ? '—' : `${v.toFixed(0)} kbit/s`) },
          ...FAMILIES.map((f) => ({ label: FAMILY_LABELS[f], ...point(FAMILY_COLORS[f], 6) })),
          ...highlight.map((_, i) => ({
            label: labels[i],
            ...point(i === 0 ? A_COLOR : B_COLOR, 14),
            fill: 'transparent',
            points: {
              show: true,
              size: 14,
              stroke: i === 0 ? A_COLOR : B_COLOR,
              fill: 'transparent',
              width: 2,
            },
          })),
          { label: 'Required share', stroke: '#7a7a7a', dash: [4, 4], points: { show: false }, value: pct },
        ],
      },
      data,
      this.host,
    );
  }
}
