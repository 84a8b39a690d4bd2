// Every candidate of a prediction in a table the user can sort by any column, with the
// details the chart's hover shows (law, parameter, bits, rate, bit rate, predicted share).
import type { CandidateVerdict, Recommendation } from '../../../core/design/index';
import { h } from '../../dom';

export const FAMILY_LABELS: Record<CandidateVerdict['family'], string> = {
  uniform: 'uniform',
  mu: 'mu-law',
  a: 'A-law',
  g711: 'G.711',
  designed: 'designed for the talker',
};

/** The candidate's law parameter in words: mu, A, the uniform form, or the table's name. */
export function parameterOf(c: CandidateVerdict): string {
  const s = c.stage;
  switch (s.law) {
    case 'mu':
      return `mu = ${s.mu}`;
    case 'a':
      return `A = ${s.a}`;
    case 'uniform':
      return s.form === 'rise' ? 'mid-rise' : 'mid-tread';
    case 'g711-mu':
      return 'mu = 255 (segmented)';
    case 'g711-a':
      return 'A = 87.6 (segmented)';
    case 'table':
      return s.name ?? 'table';
  }
}

export function describeCandidate(c: CandidateVerdict, r: Recommendation): string {
  return (
    `${c.id}: ${FAMILY_LABELS[c.family]}, ${parameterOf(c)}, ${c.bits} bits at ${r.rateHz} Hz = ` +
    `${(c.bitRate / 1000).toFixed(0)} kbit/s; predicted ${(100 * c.predictedShare).toFixed(1)} % of frames ` +
    `at or above ${r.targetSnrDb} dB${c.meets ? ' (meets)' : ''}`
  );
}

type Column = {
  key: string;
  label: string;
  num: boolean;
  value: (c: CandidateVerdict, r: Recommendation) => string | number;
  text: (c: CandidateVerdict, r: Recommendation) => string;
};

const COLUMNS: readonly Column[] = [
  { key: 'channel', label: 'Channel', num: false, value: (c) => c.id, text: (c) => c.id },
  {
    key: 'family',
    label: 'Law',
    num: false,
    value: (c) => FAMILY_LABELS[c.family],
    text: (c) => FAMILY_LABELS[c.family],
  },
  { key: 'parameter', label: 'Parameter', num: false, value: parameterOf, text: parameterOf },
  { key: 'bits', label: 'Bits', num: true, value: (c) => c.bits, text: (c) => String(c.bits) },
  {
    key: 'rate',
    label: 'Rate (Hz)',
    num: true,
    value: (_c, r) => r.rateHz,
    text: (_c, r) => String(r.rateHz),
  },
  {
    key: 'bitrate',
    label: 'kbit/s',
    num: true,
    value: (c) => c.bitRate,
    text: (c) => (c.bitRate / 1000).toFixed(0),
  },
  {
    key: 'share',
    label: 'Predicted share',
    num: true,
    value: (c) => c.predictedShare,
    text: (c) => `${(100 * c.predictedShare).toFixed(1)} %`,
  },
  {
    key: 'snr',
    label: 'SNR at share',
    num: true,
    value: (c) => c.snrAtShareDb,
    text: (c) => `${c.snrAtShareDb.toFixed(1)} dB`,
  },
  {
    key: 'meets',
    label: 'Meets',
    num: false,
    value: (c) => (c.meets ? 1 : 0),
    text: (c) => (c.meets ? 'yes' : ''),
  },
];

export interface CandidateTable {
  el: HTMLElement;
  show(r: Recommendation, inUse: readonly number[]): void;
}

export function candidateTable(): CandidateTable {
  let sortKey = 'bitrate';
  let ascending = true;
  let shown: { r: Recommendation; inUse: readonly number[] } | null = null;
  const heads = COLUMNS.map((col) => {
    const b = h('button', { type: 'button', class: 'sort', 'data-sort': col.key }, col.label);
    b.addEventListener('click', () => {
      ascending = sortKey === col.key ? !ascending : true;
      sortKey = col.key;
      render();
    });
    return h('th', { class: col.num ? 'num' : '', scope: 'col' }, b);
  });
  const body = h('tbody', {});
  const table = h(
    'table',
    { class: 'candidates', 'data-testid': 'tradeoff-table' },
    h('thead', {}, h('tr', {}, ...heads)),
    body,
  );
  const el = h('div', { class: 'candidates-box', tabindex: 0 }, table);

  const render = () => {
    COLUMNS.forEach((col, i) =>
      heads[i].setAttribute(
        'aria-sort',
        col.key === sortKey ? (ascending ? 'ascending' : 'descending') : 'none',
      ),
    );
    table.dataset.sort = `${sortKey}:${ascending ? 'asc' : 'desc'}`;
    if (!shown) return;
    const { r, inUse } = shown;
    const col = COLUMNS.find((c) => c.key === sortKey) ?? COLUMNS[0];
    const order = r.candidates.map((_, i) => i);
    order.sort((i, j) => {
      const a = col.value(r.candidates[i], r);
      const b = col.value(r.candidates[j], r);
      const d = typeof a === 'number' && typeof b === 'number' ? a - b : String(a).localeCompare(String(b));
      return (ascending ? d : -d) || i - j;
    });
    body.replaceChildren(
      ...order.map((i) => {
        const c = r.candidates[i];
        const tr = h(
          'tr',
          { 'data-candidate': c.id, title: describeCandidate(c, r) },
          ...COLUMNS.map((col) => h('td', { class: col.num ? 'num' : '' }, col.text(c, r))),
        );
        tr.classList.toggle('chosen', i === r.chosen);
        tr.classList.toggle('in-use', inUse.includes(i));
        return tr;
      }),
    );
  };
  render();
  return {
    el,
    show: (r, inUse) => {
      shown = { r, inUse };
      render();
    },
  };
}
