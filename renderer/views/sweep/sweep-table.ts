// The pass/fail table of a sweep: one row per level, A and B side by side.
import { SWEEP_CEILING_DB, SWEEP_FLOOR_DB, type SweepResult } from '../../../core/sweep/index';
import { h } from '../../dom';
import { shortText } from '../../settings/store';

const db = (v: number | null) => (v === null ? '—' : `${v.toFixed(1)} dB`);
/** The sweep holds a silent output at its floor and an error-free one at its ceiling. */
const figure = (v: number | null) =>
  v === null ? '—' : v <= SWEEP_FLOOR_DB ? 'no output' : v >= SWEEP_CEILING_DB ? 'no error' : db(v);

function verdictCell(r: SweepResult, i: number, slot: string): HTMLTableCellElement {
  const v = r.judgement?.verdicts[i];
  const pass = v?.pass ?? null;
  const text = pass === null ? '—' : pass ? 'pass' : 'fail';
  return h(
    'td',
    {
      class: `verdict ${pass === null ? 'none' : pass ? 'pass' : 'fail'}`,
      'data-testid': `sweep-${slot}-verdict`,
      'data-pass': pass === null ? 'none' : String(pass),
      title: v?.marginDb == null ? undefined : `margin ${v.marginDb.toFixed(2)} dB`,
    },
    text,
  );
}

export function sweepTable(results: SweepResult[]): HTMLTableElement {
  const [a, b] = results;
  const head = h(
    'tr',
    {},
    h('th', { class: 'num' }, 'Level (dBm0)'),
    h('th', { class: 'num' }, 'Mask (dB)'),
    h('th', { class: 'num' }, `A in-band`),
    h('th', {}, 'A'),
    h('th', { class: 'num' }, `B in-band`),
    h('th', {}, 'B'),
  );
  const rows = a.points.map((p, i) =>
    h(
      'tr',
      { 'data-testid': 'sweep-row', 'data-dbm0': p.dbm0 },
      h('td', { class: 'num' }, p.dbm0.toFixed(1)),
      h('td', { class: 'num' }, db(a.judgement?.verdicts[i]?.requiredDb ?? null)),
      h('td', { class: 'num', 'data-testid': 'sweep-a-snr' }, figure(p.inBandDb)),
      verdictCell(a, i, 'a'),
      h('td', { class: 'num', 'data-testid': 'sweep-b-snr' }, figure(b.points[i]?.inBandDb ?? null)),
      verdictCell(b, i, 'b'),
    ),
  );
  return h(
    'table',
    { class: 'sweep-table', 'data-testid': 'sweep-table' },
    h(
      'caption',
      {},
      `A ${shortText(a.channel)} · B ${shortText(b.channel)}: in-band signal to total distortion`,
    ),
    h('thead', {}, head),
    h('tbody', {}, ...rows),
  );
}

/** One line per channel: the verdict over the mask and its worst margin. */
export function sweepSummary(r: SweepResult, slot: string): HTMLElement {
  const j = r.judgement;
  const text =
    j === null || j.judged === 0
      ? `${slot.toUpperCase()} ${shortText(r.channel)}: no mask applies`
      : `${slot.toUpperCase()} ${shortText(r.channel)}: ${j.pass ? 'PASS' : 'FAIL'} against ${j.mask.name} ` +
        `(${j.failed} of ${j.judged} levels fail; worst margin ${j.worstMarginDb?.toFixed(2)} dB at ${j.worstDbm0} dBm0)`;
  return h(
    'p',
    {
      class: `sweep-summary ${j === null || j.judged === 0 ? 'none' : j.pass ? 'pass' : 'fail'}`,
      'data-testid': `sweep-summary-${slot}`,
      'data-pass': j === null || j.judged === 0 ? 'none' : String(j.pass),
    },
    text,
  );
}
