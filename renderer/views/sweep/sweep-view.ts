// The Sweep view: a sine or noise sweep of channels A and B (core's runSweep in the
// compute worker), drawn with its mask and judged level by level.
import type { SweepMethod } from '../../../core/sweep/index';
import { h } from '../../dom';
import type { Store } from '../../settings/store';
import type { ComputeClient } from '../../workers/client';
import { SweepChart } from './sweep-chart';
import type { SweepBoard } from './sweep-board';
import { sweepSummary, sweepTable } from './sweep-table';

export interface SweepViewOptions {
  store: Store;
  compute: ComputeClient;
  sweeps: SweepBoard;
}

function numberField(
  testId: string,
  label: string,
  value: number,
  step: number,
): [HTMLElement, HTMLInputElement] {
  const input = h('input', { type: 'number', step, value, 'data-testid': testId, size: 5 });
  return [h('label', { class: 'field' }, h('span', {}, label), input), input];
}

export function mountSweepView(container: HTMLElement, options: SweepViewOptions): { destroy(): void } {
  const { store, compute, sweeps } = options;
  const method = h(
    'select',
    { 'data-testid': 'sweep-method', 'aria-label': 'Sweep stimulus' },
    h('option', { value: 'sine' }, 'Sine 1020 Hz (G.712 mask)'),
    h('option', { value: 'noise' }, 'Band noise 350-550 Hz (no mask)'),
  );
  const [fromField, from] = numberField('sweep-from', 'From (dBm0)', -60, 1);
  const [toField, to] = numberField('sweep-to', 'To (dBm0)', 3, 1);
  const [stepField, step] = numberField('sweep-step', 'Step (dB)', 1, 0.5);
  const run = h('button', { type: 'button', 'data-testid': 'sweep-run' }, 'Run sweep on A and B');
  const status = h('p', { class: 'hint', role: 'status', 'data-testid': 'sweep-status' }, 'No sweep yet.');
  const chartHost = h('div', { class: 'sweep-chart', 'data-testid': 'sweep-chart' });
  const summaries = h('div', { class: 'sweep-summaries', 'data-testid': 'sweep-summaries' });
  const tableHost = h('div', { class: 'sweep-table-host', 'data-testid': 'sweep-table-host' });
  // 64 rows by default: the table scrolls beside a chart that stays in view.
  tableHost.tabIndex = 0;
  const chart = new SweepChart(chartHost);
  let alive = true;

  run.addEventListener('click', () => {
    const { a, b } = store.audio.channels;
    const request = {
      kind: 'sweep' as const,
      channels: [a, b],
      method: method.value as SweepMethod,
      fromDbm0: Number(from.value),
      toDbm0: Number(to.value),
      stepDb: Number(step.value),
    };
    run.disabled = true;
    status.dataset.state = 'running';
    status.textContent = 'Sweeping A and B…';
    const started = performance.now();
    compute
      .run(request)
      .then((results) => {
        if (!alive) return;
        chart.show(results);
        // The Live view's Level/SNR curve shows the last sweep beside the theory of its model.
        sweeps.put(results);
        summaries.replaceChildren(sweepSummary(results[0], 'a'), sweepSummary(results[1], 'b'));
        tableHost.replaceChildren(sweepTable(results));
        status.dataset.state = 'done';
        status.textContent =
          `${results[0].points.length} levels, ${results[0].samplesPerPoint} samples each at ` +
          `${results[0].rateHz} Hz, in ${Math.round(performance.now() - started)} ms` +
          (compute.inWorker ? '' : ' (computed in the page)');
      })
      .catch((err: Error) => {
        if (!alive) return;
        status.dataset.state = 'error';
        status.textContent = `Sweep refused: ${err.message}`;
      })
      .finally(() => (run.disabled = false));
  });

  const root = h(
    'section',
    { class: 'sweep-view', 'data-testid': 'sweep-view', 'aria-label': 'Sweep' },
    h('h2', {}, 'Level sweep of A and B'),
    h(
      'div',
      { class: 'output-row' },
      h('label', { class: 'field' }, h('span', {}, 'Stimulus'), method),
      fromField,
      toField,
      stepField,
      run,
    ),
    status,
    h('div', { class: 'sweep-grid' }, chartHost, h('div', { class: 'sweep-side' }, summaries, tableHost)),
    h(
      'p',
      { class: 'hint' },
      'Level at the first quantizer input in dBm0; the mask is held against the in-band figure (300-3400 Hz, tone removed); theory is the wideband exact figure.',
    ),
  );
  container.append(root);
  return {
    destroy: () => {
      alive = false;
      chart.destroy();
      root.remove();
    },
  };
}
