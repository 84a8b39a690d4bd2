// The Sweep view: a sine or noise sweep of channels A and B (core's runSweep in the
// compute worker), drawn with its mask and judged level by level.
import type { SweepMethod } from '../../../core/sweep/index';
import type { AudioEngine } from '../../audio/engine';
import { h } from '../../dom';
import { ComputeClient } from '../../workers/client';
import { SweepChart } from './sweep-chart';
import { sweepSummary, sweepTable } from './sweep-table';

export interface SweepViewOptions {
  engine: AudioEngine;
  compute?: ComputeClient;
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
  const { engine } = options;
  const compute = options.compute ?? new ComputeClient();
  const ownCompute = options.compute === undefined;
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
  tableHost.style.maxHeight = '24rem';
  tableHost.style.overflowY = 'auto';
  tableHost.tabIndex = 0;
  const chart = new SweepChart(chartHost);
  let alive = true;

  run.addEventListener('click', () => {
    const { a, b } = engine.state().channels;
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
    status.textContent = `Sweeping A ${a} and B ${b}…`;
    const started = performance.now();
    compute
      .run(request)
      .then((results) => {
        if (!alive) return;
        chart.show(results);
        // The Live view's Level/SNR curve shows the last sweep of channel A.
        document.dispatchEvent(new CustomEvent('quantiscope:sweep', { detail: results[0] }));
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
    { class: 'panel sweep-view', 'data-testid': 'sweep-view' },
    h('h2', {}, 'Sweep'),
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
    chartHost,
    summaries,
    tableHost,
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
      if (ownCompute) compute.destroy();
      root.remove();
    },
  };
}
