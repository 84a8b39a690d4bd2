// Level/SNR curve on a dBm0 grid: theory of A and B (Laplacian talker), the live
// signal's frame SNRs binned by frame level, the last sweep if one ran, and the
// acceptance mask (G.712 sine method unless replaced).
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { G712_SINE_MASK, maskLimitAt, type Mask } from '../../../core/sweep/mask';
import type { SweepResult } from '../../../core/sweep/sweep';
import { axis, liveChart, stroke, withUnit } from '../charts';
import { ChannelHistory, GRID_MIN_DBM0, GRID_POINTS } from './history';
import { panelBox, type LivePanel } from './panel';
import type { ComputeClient } from '../../workers/client';

export interface LevelSnrPanel extends LivePanel {
  showSweep(result: SweepResult | null): void;
  setMask(mask: Mask): void;
}

/** Theory curves come from the compute worker: 65536-cell uniform tables take a while. */
export function levelSnrPanel(compute: ComputeClient): LevelSnrPanel {
  const { el, body } = panelBox('panel-level-snr', 'Level / SNR curve');
  const x = Float64Array.from({ length: GRID_POINTS }, (_, i) => GRID_MIN_DBM0 + i);
  // theory A, theory B, measured A, measured B, sweep, mask
  const ys = [0, 1, 2, 3, 4, 5].map(() => new Array<number | null>(GRID_POINTS).fill(null));
  const hist = [new ChannelHistory(), new ChannelHistory()];
  const texts = ['', ''];
  let sweepLabel = 'last sweep';
  const dots = (size: number) => ({ show: true, size, width: 1 });
  const chart = liveChart(
    body,
    {
      scales: { x: { time: false }, y: { range: [-10, 70] } },
      axes: [axis('input level (dBm0)'), axis('SNR (dB)')],
      series: [
        { label: 'level', value: withUnit('dBm0', 0) },
        {
          label: 'theory A',
          stroke: stroke('a'),
          width: 1.5,
          value: withUnit('dB'),
          points: { show: false },
        },
        {
          label: 'theory B',
          stroke: stroke('b'),
          width: 1.5,
          value: withUnit('dB'),
          points: { show: false },
        },
        {
          label: 'live A',
          stroke: stroke('a'),
          width: 0,
          paths: () => null,
          points: dots(5),
          value: withUnit('dB'),
        },
        {
          label: 'live B',
          stroke: stroke('b'),
          width: 0,
          paths: () => null,
          points: dots(5),
          value: withUnit('dB'),
        },
        {
          label: sweepLabel,
          stroke: stroke('reference'),
          width: 1,
          points: dots(6),
          value: withUnit('dB'),
          spanGaps: true,
        },
        {
          label: 'mask',
          stroke: stroke('mask'),
          width: 2,
          dash: [6, 3],
          value: withUnit('dB'),
          points: { show: false },
        },
      ],
    },
    [x, ...ys],
  );
  const setMask = (mask: Mask) => {
    for (let i = 0; i < GRID_POINTS; i++) ys[5][i] = maskLimitAt(mask, x[i]);
  };
  setMask(G712_SINE_MASK);
  const asked = ['', ''];
  const theoryFor = (c: number, text: string) => {
    ys[c].fill(null);
    asked[c] = text;
    compute
      .run({ kind: 'theory', channel: text, levelsDbm0: Array.from(x) })
      .then((snr) => {
        if (asked[c] !== text) return; // the channel changed again meanwhile
        for (let i = 0; i < GRID_POINTS; i++) ys[c][i] = Number.isFinite(snr[i]) ? snr[i] : null;
        el.dataset.theory = String(Number(el.dataset.theory ?? 0) + 1);
      })
      .catch(() => {
        // A refused channel has no curve; the setup form says why.
      });
  };
  return {
    el,
    setMask,
    showSweep(result: SweepResult | null) {
      ys[4].fill(null);
      if (!result) return;
      for (const p of result.points) {
        const i = Math.round(p.dbm0 - GRID_MIN_DBM0);
        if (i >= 0 && i < GRID_POINTS) ys[4][i] = p.inBandDb;
      }
      sweepLabel = `sweep ${result.channel}`;
      el.dataset.sweep = result.channel;
    },
    update(a: AnalysisSnapshot) {
      for (let c = 0; c < 2; c++) {
        const text = a.channels[c].text;
        if (texts[c] !== text) {
          texts[c] = text;
          theoryFor(c, text);
        }
        const hc = hist[c];
        hc.take(a, c);
        let lowest = -1;
        for (let i = 0; i < GRID_POINTS; i++) {
          const n = hc.binCount[i];
          ys[c + 2][i] = n > 0 ? hc.binSum[i] / n : null;
          if (n > 0 && lowest < 0) lowest = i;
        }
        if (c === 0) el.dataset.lowestLiveDbm0 = lowest < 0 ? '' : String(x[lowest]);
      }
      chart.plot.setData([x, ...ys]);
    },
  };
}
