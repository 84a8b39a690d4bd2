// The trade-off panel: for the talker measured so far, what each candidate channel
// costs (bit rate) against the share of active frames predicted to reach the target
// SNR (core's recommender, in the compute worker), with A and B picked out.
import type { CandidateVerdict, Recommendation } from '../../../core/design/index';
import type { AudioEngine } from '../../audio/engine';
import { h } from '../../dom';
import { ComputeClient } from '../../workers/client';
import { watchTalkerFrames } from '../setup/talker-frames';
import { TradeoffChart } from './tradeoff-chart';

export interface TradeoffOptions {
  engine: AudioEngine;
  compute?: ComputeClient;
  /** Seconds between automatic updates while the talker goes on (0: only on request). */
  refreshSeconds?: number;
}

function line(testId: string, label: string, v: CandidateVerdict | null, r: Recommendation): HTMLElement {
  const text =
    v === null
      ? `${label}: not among the candidates (tandem or table)`
      : `${label}: ${v.id}, ${(v.bitRate / 1000).toFixed(0)} kbit/s, ${(v.predictedShare * 100).toFixed(1)} % of frames at or above ${r.targetSnrDb} dB ` +
        `(${(r.share * 100).toFixed(1)} % reach ${v.snrAtShareDb.toFixed(1)} dB) — ${v.meets ? 'meets' : 'falls short'}`;
  return h('p', { 'data-testid': testId, 'data-meets': v === null ? 'none' : String(v.meets) }, text);
}

export function mountTradeoff(container: HTMLElement, options: TradeoffOptions): { destroy(): void } {
  const { engine } = options;
  const compute = options.compute ?? new ComputeClient();
  const ownCompute = options.compute === undefined;
  const refreshMs = (options.refreshSeconds ?? 10) * 1000;
  const target = h('input', {
    type: 'number',
    step: 1,
    value: 30,
    'data-testid': 'tradeoff-target',
    size: 5,
  });
  const share = h('input', {
    type: 'number',
    step: 0.5,
    value: 95,
    'data-testid': 'tradeoff-share',
    size: 5,
  });
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
  const status = h(
    'p',
    { class: 'hint', role: 'status', 'data-testid': 'tradeoff-status' },
    'Waiting for the talker…',
  );
  const chartHost = h('div', { class: 'tradeoff-chart', 'data-testid': 'tradeoff-chart' });
  const lines = h('div', { 'data-testid': 'tradeoff-lines' });
  const chart = new TradeoffChart(chartHost);
  let busy = false;
  let lastFrames = 0;
  let lastRun = 0;
  let alive = true;

  const read = (): { targetSnrDb: number; share: number } | null => {
    const t = Number(target.value);
    const s = Number(share.value);
    const tOk = target.value.trim() !== '' && Number.isFinite(t) && t > -10 && t < 120;
    const sOk = share.value.trim() !== '' && Number.isFinite(s) && s > 0 && s <= 100;
    targetError.textContent = tOk ? '' : 'target SNR must be a number of dB between -10 and 120';
    shareError.textContent = sOk ? '' : 'share must be a percentage above 0 and at most 100';
    target.setAttribute('aria-invalid', String(!tOk));
    share.setAttribute('aria-invalid', String(!sOk));
    return tOk && sOk ? { targetSnrDb: t, share: s / 100 } : null;
  };

  const predict = () => {
    const goal = read();
    const frames = talker.levels();
    if (!goal || busy) return;
    if (!frames) {
      status.textContent = 'No active frames yet: start audio and let the talker talk.';
      return;
    }
    busy = true;
    lastRun = performance.now();
    lastFrames = talker.frames;
    const { a, b } = engine.state().channels;
    status.dataset.state = 'running';
    status.textContent = `Predicting for ${talker.frames} active frames…`;
    compute
      .run({ kind: 'recommend', frames, ...goal, channels: [a, b] })
      .then(({ recommendation: r, highlight }) => {
        if (!alive) return;
        chart.show(r, highlight, [`A ${a}`, `B ${b}`]);
        const chosen = r.chosen >= 0 ? r.candidates[r.chosen] : null;
        lines.replaceChildren(
          h(
            'p',
            { 'data-testid': 'tradeoff-chosen' },
            chosen
              ? `Cheapest meeting the target: ${chosen.id} at ${(chosen.bitRate / 1000).toFixed(0)} kbit/s`
              : 'No candidate meets the target.',
          ),
          line('tradeoff-a', 'A', highlight[0] >= 0 ? r.candidates[highlight[0]] : null, r),
          line('tradeoff-b', 'B', highlight[1] >= 0 ? r.candidates[highlight[1]] : null, r),
        );
        status.dataset.state = 'done';
        status.textContent =
          `${r.candidates.length} candidates for ${r.frames} active frames (Laplacian frames, ${r.rateHz} Hz)` +
          (compute.inWorker ? '' : ' (computed in the page)');
      })
      .catch((err: Error) => {
        if (!alive) return;
        status.dataset.state = 'error';
        status.textContent = `Prediction refused: ${err.message}`;
      })
      .finally(() => (busy = false));
  };

  const talker = watchTalkerFrames(engine, (n) => {
    // Follow the talker, but not faster than the refresh interval.
    if (refreshMs > 0 && n > lastFrames && performance.now() - lastRun > refreshMs) predict();
  });
  update.addEventListener('click', predict);
  target.addEventListener('change', predict);
  share.addEventListener('change', predict);

  const root = h(
    'section',
    { class: 'panel tradeoff', 'data-testid': 'tradeoff-panel' },
    h('h2', {}, 'Trade-off'),
    h(
      'div',
      { class: 'output-row' },
      h('label', { class: 'field' }, h('span', {}, 'Target SNR (dB)'), target, targetError),
      h('label', { class: 'field' }, h('span', {}, 'Share of active frames (%)'), share, shareError),
      update,
    ),
    status,
    chartHost,
    lines,
  );
  container.append(root);
  return {
    destroy: () => {
      alive = false;
      talker.destroy();
      chart.destroy();
      if (ownCompute) compute.destroy();
      root.remove();
    },
  };
}
