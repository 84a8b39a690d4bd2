// Designing a quantizer for the talker: a Lloyd-Max table for the active frames of the
// current source (the same frames and the same design as `quantiscope design --bits`),
// kept on the shelf under a short name and usable as A or B at once.
import { MAX_DESIGN_BITS, MIN_DESIGN_BITS } from '../../../core/design/index';
import { parseStage } from '../../../core/spec/parse';
import { storedTable } from '../../../core/spec/tables';
import { h } from '../../dom';
import type { Store } from '../../settings/store';
import type { ComputeClient } from '../../workers/client';
import type { TalkerTally } from '../talker/talker-tally';
import { tallyText } from '../tradeoff/index';
import { useTable } from './table-list';

export function talkerDesign(store: Store, compute: ComputeClient, tally: TalkerTally): HTMLElement {
  const bits = h('input', {
    type: 'number',
    min: MIN_DESIGN_BITS,
    max: MAX_DESIGN_BITS,
    step: 1,
    value: 5,
    'data-testid': 'design-bits',
    size: 3,
  });
  const run = h('button', { type: 'button', 'data-testid': 'design-run' }, 'Design from the talker');
  const frames = h('p', { class: 'hint', role: 'status', 'data-testid': 'design-frames' });
  const status = h('p', { class: 'hint', role: 'status', 'data-testid': 'design-status' });
  const useA = h('button', { type: 'button', 'data-testid': 'design-use-a', hidden: true }, 'Use as A');
  const useB = h('button', { type: 'button', 'data-testid': 'design-use-b', hidden: true }, 'Use as B');
  let designed = '';
  useA.addEventListener('click', () => useTable(store, 'a', designed));
  useB.addEventListener('click', () => useTable(store, 'b', designed));
  const showFrames = () => (frames.textContent = tallyText(tally.status()));
  tally.onChange(showFrames);
  showFrames();

  run.addEventListener('click', () => {
    const n = Number(bits.value);
    if (!Number.isInteger(n) || n < MIN_DESIGN_BITS || n > MAX_DESIGN_BITS) {
      status.dataset.state = 'error';
      status.textContent = `bits must be a whole number from ${MIN_DESIGN_BITS} to ${MAX_DESIGN_BITS}`;
      return;
    }
    const levels = tally.levels();
    if (!levels) {
      status.dataset.state = 'error';
      status.textContent = tally.status().excluded
        ? 'Choose a talker (demo talker, microphone or file): test signals are not a talker.'
        : 'No active frames yet: start audio and let the talker talk.';
      return;
    }
    const t = tally.status();
    run.disabled = true;
    status.dataset.state = 'running';
    status.textContent = `Designing ${n} bits for ${t.frames} active frames…`;
    compute
      .run({ kind: 'design', frames: levels, bits: n })
      .then((r) => {
        const stage = parseStage(r.stage);
        if (stage.law !== 'table') throw new Error('the design gave no table');
        const name = store.tables.freeName(`talker-${n}b`);
        store.tables.put(
          storedTable(
            { ...stage, name },
            {
              note: `Lloyd-Max for ${t.frames} active frames of ${t.label}`,
              created: new Date().toISOString(),
            },
          ),
        );
        designed = name;
        useA.hidden = false;
        useB.hidden = false;
        status.dataset.state = 'done';
        status.dataset.table = name;
        status.textContent = `Stored as table:${name}, predicted ${r.predictedSnrDb.toFixed(2)} dB for these frames.`;
      })
      .catch((err: Error) => {
        status.dataset.state = 'error';
        status.textContent = err.message;
      })
      .finally(() => (run.disabled = false));
  });

  return h(
    'section',
    { class: 'drawer-section', 'data-testid': 'talker-design' },
    h('h3', {}, 'Design from the talker'),
    frames,
    h('div', { class: 'row' }, h('label', { class: 'field' }, h('span', {}, 'Bits'), bits), run, useA, useB),
    status,
  );
}
