// Level/SNR curve on a dBm0 grid: the theory of A and B for a signal model the user
// picks (sine, Gaussian, or Laplacian as a speech-like model), the talker's frame SNRs
// binned by frame level, and, with the sine model only, the G.712 mask (a sine-method
// mask) and the last sine sweep; with the Gaussian model the last noise sweep.
import type uPlot from 'uplot';
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { G712_SINE_MASK, maskLimitAt } from '../../../core/sweep/mask';
import { h } from '../../dom';
import { axis, boxChart, cursorValue, fmt } from '../../charts/chart';
import { legend } from '../../charts/legend';
import { STYLES, slotStyle, styledSeries } from '../../charts/series';
import { shortText, type Store, type TheoryModel } from '../../settings/store';
import type { ComputeClient } from '../../workers/client';
import type { SweepBoard } from '../sweep/sweep-board';
import { ChannelHistory, GRID_MIN_DBM0, GRID_POINTS } from './history';
import { panelBox, type LivePanel } from './panel';

export const MODEL_LABELS: Record<TheoryModel, string> = {
  sine: 'sine',
  gaussian: 'Gaussian',
  laplacian: 'Laplacian (speech-like)',
};

/** The sweep method whose points belong beside a model's theory. */
const SWEEP_OF: Record<TheoryModel, 'sine' | 'noise' | null> = {
  sine: 'sine',
  gaussian: 'noise',
  laplacian: null,
};

// Series: theory A, theory B, frames A, frames B, sweep A, sweep B, mask.
const MASK = 6;

export function levelSnrPanel(store: Store, compute: ComputeClient, sweeps: SweepBoard): LivePanel {
  const model = h(
    'select',
    { 'data-testid': 'level-snr-model', 'aria-label': 'Signal model of the theory lines' },
    ...(['sine', 'gaussian', 'laplacian'] as const).map((m) =>
      h('option', { value: m }, `theory: ${MODEL_LABELS[m]}`),
    ),
  );
  model.addEventListener('change', () => store.setPage({ model: model.value as TheoryModel }));
  const box = panelBox('panel-level-snr', 'Level/SNR curve', model);
  const { el, body } = box;
  const key = legend(
    [
      { label: 'theory A', style: slotStyle(0, 'theory') },
      { label: 'theory B', style: slotStyle(1, 'theory') },
      { label: 'talker frames A', style: slotStyle(0, 'points') },
      { label: 'talker frames B', style: slotStyle(1, 'points') },
      { label: 'sweep A', style: slotStyle(0, 'sweep') },
      { label: 'sweep B', style: slotStyle(1, 'sweep') },
      { label: 'G.712 mask (sine method)', style: STYLES.mask },
    ],
    'legend-level-snr',
  );
  const plotBox = h('div', { class: 'plot' });
  body.append(key.el, plotBox);

  const x = Float64Array.from({ length: GRID_POINTS }, (_, i) => GRID_MIN_DBM0 + i);
  const ys = [0, 1, 2, 3, 4, 5, 6].map(() => new Array<number | null>(GRID_POINTS).fill(null));
  const maskLine = Array.from(x, (l) => maskLimitAt(G712_SINE_MASK, l));
  const hist = [new ChannelHistory(), new ChannelHistory()];
  const texts = ['', ''];
  const theory = new Map<string, (number | null)[]>();
  const asked = new Set<string>();
  let seen = false;
  let drawing: { invalidate(): void } | null = null;

  const readout = (u: uPlot) => {
    const at = cursorValue(u, 0);
    const i = u.cursor.idx;
    if (at === null || i === null || i === undefined) return key.readout('');
    const parts = [
      `${at.toFixed(0)} dBm0: theory A ${fmt(ys[0][i], 1, 'dB')}`,
      `B ${fmt(ys[1][i], 1, 'dB')}`,
    ];
    if (ys[2][i] !== null || ys[3][i] !== null)
      parts.push(`frames A ${fmt(ys[2][i], 1, 'dB')}`, `B ${fmt(ys[3][i], 1, 'dB')}`);
    if (store.page.model === 'sine' && ys[MASK][i] !== null) parts.push(`mask ${fmt(ys[MASK][i], 0, 'dB')}`);
    key.readout(parts.join(' · '));
  };
  const chart = boxChart(
    plotBox,
    {
      scales: { x: { time: false }, y: { range: [-10, 70] } },
      axes: [axis('input level (dBm0)'), axis('SNR (dB)')],
      series: [
        {},
        styledSeries('theory A', slotStyle(0, 'theory')),
        styledSeries('theory B', slotStyle(1, 'theory')),
        styledSeries('frames A', slotStyle(0, 'points')),
        styledSeries('frames B', slotStyle(1, 'points')),
        styledSeries('sweep A', slotStyle(0, 'sweep'), { spanGaps: true }),
        styledSeries('sweep B', slotStyle(1, 'sweep'), { spanGaps: true }),
        styledSeries('mask', STYLES.mask),
      ],
      hooks: { setCursor: [readout] },
    },
    [x, ...ys],
  );

  const theoryKey = (m: TheoryModel, text: string) => `${m}|${text}`;
  const askTheory = (m: TheoryModel, text: string) => {
    const k = theoryKey(m, text);
    if (theory.has(k) || asked.has(k)) return;
    asked.add(k);
    compute
      .run({ kind: 'theory', channel: text, model: m, levelsDbm0: Array.from(x) })
      .then((snr) => {
        theory.set(
          k,
          snr.map((v) => (Number.isFinite(v) ? v : null)),
        );
        el.dataset.theory = String(theory.size);
        drawing?.invalidate();
      })
      .catch(() => {
        // A refused channel has no curve; the channel form says why.
      })
      .finally(() => asked.delete(k));
  };

  const showModel = () => {
    if (model.value !== store.page.model) model.value = store.page.model;
    el.dataset.model = store.page.model;
    drawing?.invalidate();
  };
  store.subscribe(showModel);
  sweeps.onChange(() => drawing?.invalidate());

  const panel: LivePanel = {
    el,
    bind(d) {
      drawing = d;
      showModel();
    },
    take(a: AnalysisSnapshot) {
      for (let c = 0; c < 2; c++) {
        texts[c] = a.channels[c].text;
        hist[c].take(a, c);
      }
      seen = true;
    },
    draw() {
      const m = store.page.model;
      for (let c = 0; c < 2; c++) {
        // Before the first snapshot the theory of the channels asked for is already worth seeing.
        const t = texts[c] || store.audio.channels[c === 0 ? 'a' : 'b'];
        const curve = theory.get(theoryKey(m, t));
        if (!curve) askTheory(m, t);
        for (let i = 0; i < GRID_POINTS; i++) ys[c][i] = curve ? curve[i] : null;
        const hc = hist[c];
        let lowest = -1;
        for (let i = 0; i < GRID_POINTS; i++) {
          const n = hc.binCount[i];
          ys[c + 2][i] = n > 0 ? hc.binSum[i] / n : null;
          if (n > 0 && lowest < 0) lowest = i;
        }
        if (c === 0) el.dataset.lowestLiveDbm0 = lowest < 0 ? '' : String(x[lowest]);
        key.rename(c, `theory ${c === 0 ? 'A' : 'B'} ${shortText(t)}, ${MODEL_LABELS[m]}`);
      }
      const method = SWEEP_OF[m];
      const results = sweeps.results;
      const sweepShown = method !== null && results !== null && results[0]?.stimulus.method === method;
      for (let c = 0; c < 2; c++) {
        const row = ys[4 + c];
        row.fill(null);
        if (!sweepShown) continue;
        const r = results[c];
        if (!r) continue;
        for (const p of r.points) {
          const i = Math.round(p.dbm0 - GRID_MIN_DBM0);
          if (i >= 0 && i < GRID_POINTS && Math.abs(p.dbm0 - x[i]) < 1e-9) row[i] = p.inBandDb;
        }
        key.rename(
          4 + c,
          `sweep ${c === 0 ? 'A' : 'B'} (${method === 'sine' ? 'sine, in-band' : 'noise, in-band'})`,
        );
      }
      const maskShown = m === 'sine';
      for (let i = 0; i < GRID_POINTS; i++) ys[MASK][i] = maskShown ? maskLine[i] : null;
      key.show(4, sweepShown);
      key.show(5, sweepShown);
      key.show(MASK, maskShown);
      el.dataset.mask = String(maskShown);
      el.dataset.sweep = sweepShown ? (results?.[0]?.channel ?? '') : '';
      if (seen) box.waiting(null);
      else box.waiting('Theory shown; talker frames appear once audio runs.');
      chart.plot.setData([x, ...ys]);
    },
    clear() {
      seen = false;
      for (const hc of hist) hc.reset();
    },
  };
  return panel;
}
