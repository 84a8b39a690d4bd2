// The Trade-off: for the talker's active frames from the current source, what each
// candidate channel costs (bit rate) against the share of frames predicted to reach the
// target SNR (core's recommender, in the compute worker), with A and B picked out.
import type { CandidateVerdict, Recommendation } from '../../../core/design/index';
import type { AudioEngine } from '../../audio/engine';
import { h } from '../../dom';
import { shortText, type Store } from '../../settings/store';
import type { ComputeClient } from '../../workers/client';
import type { FrameClock } from '../frame-clock';
import type { TalkerTally, TallyStatus } from '../talker/talker-tally';
import { candidateTable } from './candidate-table';
import { TradeoffChart } from './tradeoff-chart';

export interface TradeoffDeps {
  engine: AudioEngine;
  store: Store;
  compute: ComputeClient;
  tally: TalkerTally;
  clock: FrameClock;
  /** Seconds between automatic updates while the talker goes on (0: only on request). */
  refreshSeconds?: number;
}

/** Frames must grow by this share before an automatic update (common practice, no source). */
const REFRESH_GROWTH = 0.05;

export function tallyText(s: TallyStatus): string {
  if (s.excluded) return `Source: ${s.label}: a test signal, not a talker, so no frames are counted.`;
  const pass = s.complete === null ? '' : s.complete ? ' (one whole pass)' : ' (first pass, counting)';
  const stopped = s.stopped ? `; stopped: ${s.stopped}` : '';
  return `${s.frames} active frames from ${s.label}${pass}${stopped}.`;
}

function line(testId: string, label: string, v: CandidateVerdict | null, r: Recommendation): HTMLElement {
  const text =
    v === null
      ? `${label}: not among the candidates (tandem or stored table)`
      : `${label}: ${v.id}, ${(v.bitRate / 1000).toFixed(0)} kbit/s, ${(v.predictedShare * 100).toFixed(1)} % of frames at or above ${r.targetSnrDb} dB ` +
        `(${(r.share * 100).toFixed(1)} % reach ${v.snrAtShareDb.toFixed(1)} dB): ${v.meets ? 'meets' : 'falls short'}`;
  return h('p', { 'data-testid': testId, 'data-meets': v === null ? 'none' : String(v.meets) }, text);
}

export function mountTradeoff(container: HTMLElement, deps: TradeoffDeps): { el: HTMLElement } {
  const { store, tally, compute } = deps;
  const refreshMs = (deps.refreshSeconds ?? 10) * 1000;
  const target = h('input', { type: 'number', step: 1, 'data-testid': 'tradeoff-target', size: 4 });
  const share = h('input', { type: 'number', step: 0.5, 'data-testid': 'tradeoff-share', size: 4 });
  const targetError = h('span', {
    class: 'field-error',
    role: 'alert',
    'data-testid': 'tradeoff-target-error',
  });
  const shareError = h('span', {
    class: 'field-error',
    role: 'alert',
    'data-testid': 'tradeoff-share-error',
  });
  const update = h('button', { type: 'button', 'data-testid': 'tradeoff-update' }, 'Predict');
  const reset = h('button', { type: 'button', 'data-testid': 'talker-reset' }, 'Reset frames');
  const counted = h('p', { class: 'hint', role: 'status', 'data-testid': 'talker-frames' }, '');
  const status = h(
    'p',
    { class: 'hint', role: 'status', 'data-testid': 'tradeoff-status' },
    'No prediction yet.',
  );
  const chartHost = h('div', { class: 'tradeoff-chart', 'data-testid': 'tradeoff-chart' });
  const lines = h('div', { class: 'tradeoff-lines', 'data-testid': 'tradeoff-lines' });
  const table = candidateTable();
  const el = h(
    'section',
    { class: 'live-panel tradeoff', 'data-testid': 'tradeoff-panel', 'aria-label': 'Trade-off' },
    h(
      'header',
      { class: 'panel-head' },
      h('h2', {}, 'Trade-off: bit rate against quality'),
      h('label', { class: 'field' }, h('span', {}, 'Target SNR (dB)'), target, targetError),
      h('label', { class: 'field' }, h('span', {}, 'of active frames (%)'), share, shareError),
      update,
      reset,
    ),
    h('div', { class: 'panel-body tradeoff-body' }, counted, status, chartHost, lines, table.el),
  );
  container.append(el);
  const chart = new TradeoffChart(chartHost);
  let busy = false;
  // A press while a prediction runs is kept and run after it; a result for frames since
  // forgotten (new source, reset) is dropped rather than shown as the current talker's.
  let again = false;
  let generation = 0;
  let lastFrames = 0;
  let lastRun = -Infinity;

  const showSettings = () => {
    if (document.activeElement !== target) target.value = String(store.page.targetSnrDb);
    if (document.activeElement !== share) share.value = String(store.page.sharePct);
  };
  store.subscribe(showSettings);
  showSettings();

  const read = (): { targetSnrDb: number; share: number } | null => {
    const t = Number(target.value);
    const s = Number(share.value);
    const tOk = target.value.trim() !== '' && Number.isFinite(t) && t > -10 && t < 120;
    const sOk = share.value.trim() !== '' && Number.isFinite(s) && s > 0 && s <= 100;
    targetError.textContent = tOk ? '' : 'target SNR must be a number of dB between -10 and 120';
    shareError.textContent = sOk ? '' : 'share must be a percentage above 0 and at most 100';
    target.setAttribute('aria-invalid', String(!tOk));
    share.setAttribute('aria-invalid', String(!sOk));
    if (tOk && sOk && (t !== store.page.targetSnrDb || s !== store.page.sharePct))
      store.setPage({ targetSnrDb: t, sharePct: s });
    return tOk && sOk ? { targetSnrDb: t, share: s / 100 } : null;
  };

  const predict = () => {
    const goal = read();
    const frames = tally.levels();
    if (!goal) return;
    if (busy) {
      again = true;
      return;
    }
    if (!frames) {
      showEmpty();
      return;
    }
    busy = true;
    const ran = generation;
    lastRun = performance.now();
    lastFrames = tally.frames;
    const { a, b } = store.audio.channels;
    status.dataset.state = 'running';
    status.textContent = `Predicting for ${tally.frames} active frames…`;
    compute
      .run({ kind: 'recommend', frames, ...goal, channels: [a, b] })
      .then(({ recommendation: r, highlight }) => {
        if (ran !== generation) return;
        chart.show(r, highlight);
        table.show(r, highlight);
        const chosen = r.chosen >= 0 ? r.candidates[r.chosen] : null;
        lines.replaceChildren(
          h(
            'p',
            { 'data-testid': 'tradeoff-chosen', 'data-chosen': chosen?.id ?? '' },
            chosen
              ? `Cheapest meeting the target: ${chosen.id} at ${(chosen.bitRate / 1000).toFixed(0)} kbit/s`
              : 'No candidate meets the target.',
          ),
          line('tradeoff-a', `A ${shortText(a)}`, highlight[0] >= 0 ? r.candidates[highlight[0]] : null, r),
          line('tradeoff-b', `B ${shortText(b)}`, highlight[1] >= 0 ? r.candidates[highlight[1]] : null, r),
        );
        status.dataset.state = 'done';
        status.textContent =
          `${r.candidates.length} candidates for ${r.frames} active frames (${r.frameShape} frames at ${r.rateHz} Hz)` +
          (compute.inWorker ? '' : ' (computed in the page)');
      })
      .catch((err: Error) => {
        if (ran !== generation) return;
        status.dataset.state = 'error';
        status.textContent = `Prediction refused: ${err.message}`;
      })
      .finally(() => {
        busy = false;
        if (again) {
          again = false;
          predict();
        }
      });
  };

  const showEmpty = () => {
    status.dataset.state = 'empty';
    status.textContent = tally.status().excluded
      ? 'Choose a talker (demo talker, microphone or file): test signals are not counted.'
      : 'No active frames yet: start audio and let the talker talk.';
  };
  // Frames forgotten (another source, or Reset): a prediction under way is for frames gone.
  const forget = () => {
    generation++;
    lastFrames = 0;
  };

  // Follow the talker while the panel is on screen: not faster than the refresh interval,
  // and only once the frames have grown enough to move the prediction.
  const follow = {
    el,
    draw: () => {
      counted.textContent = tallyText(tally.status());
      const n = tally.frames;
      const grown = n > 0 && (lastFrames === 0 || n >= lastFrames * (1 + REFRESH_GROWTH));
      if (refreshMs > 0 && grown && performance.now() - lastRun > refreshMs) predict();
    },
  };
  const drawing = deps.clock.add(follow, 1000);
  tally.onChange(() => {
    if (tally.frames < lastFrames || (tally.frames === 0 && lastFrames > 0)) {
      forget();
      showEmpty();
    }
    drawing.invalidate();
  });
  update.addEventListener('click', predict);
  target.addEventListener('change', predict);
  share.addEventListener('change', predict);
  reset.addEventListener('click', () => {
    tally.reset();
    forget();
    status.dataset.state = 'reset';
    status.textContent = 'Frames forgotten; counting afresh.';
  });
  return { el };
}
