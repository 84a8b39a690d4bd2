// Segment ledger: for A and B side by side, each segment's share of samples and its
// SNR; the segment holding the most samples is highlighted in each channel.
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { h } from '../../dom';
import { panelBox, type LivePanel } from './panel';

interface Side {
  label: string;
  caption: HTMLElement;
  body: HTMLTableSectionElement;
  rows: {
    tr: HTMLTableRowElement;
    range: HTMLElement;
    bar: HTMLElement;
    share: HTMLElement;
    snr: HTMLElement;
  }[];
  text: string;
}

const rangeText = (lo: number, hi: number) =>
  `${Number.isFinite(lo) ? lo.toFixed(0) : '−∞'} … ${hi.toFixed(0)}`;

function side(slot: 'a' | 'b'): { table: HTMLElement; s: Side } {
  const caption = h('caption', {}, slot.toUpperCase());
  const body = h('tbody', {});
  const table = h(
    'table',
    { class: `ledger ledger-${slot}`, 'data-testid': `ledger-${slot}` },
    caption,
    h(
      'thead',
      {},
      h(
        'tr',
        {},
        h('th', {}, 'Seg'),
        h('th', {}, 'Range (dBov)'),
        h('th', { class: 'num' }, 'Share'),
        h('th', { class: 'num' }, 'SNR'),
      ),
    ),
    body,
  );
  return { table, s: { label: slot.toUpperCase(), caption, body, rows: [], text: '' } };
}

function rebuild(s: Side, edges: Float64Array, text: string): void {
  s.rows = [];
  s.body.replaceChildren();
  s.caption.textContent = `${s.label}: ${text}`;
  for (let k = edges.length - 2; k >= 0; k--) {
    const bar = h('span', { class: 'bar' });
    const share = h('span', { class: 'share-text' }, '—');
    const row = {
      tr: h('tr', { 'data-segment': k }),
      range: h('td', {}, rangeText(edges[k], edges[k + 1])),
      bar,
      share,
      snr: h('td', { class: 'num' }, '—'),
    };
    row.tr.append(
      h('td', { class: 'num' }, k),
      row.range,
      h('td', { class: 'num share-cell' }, bar, share),
      row.snr,
    );
    s.rows[k] = row;
    s.body.append(row.tr);
  }
  s.text = text;
}

export function ledgerPanel(): LivePanel {
  const a = side('a');
  const b = side('b');
  const { el, body } = panelBox('panel-ledger', 'Segment ledger');
  body.classList.add('ledger-pair');
  body.append(a.table, b.table);
  const sides = [a.s, b.s];
  return {
    el,
    update(snap: AnalysisSnapshot) {
      for (let i = 0; i < 2; i++) {
        const s = sides[i];
        const ch = snap.channels[i];
        const seg = ch.meter.segments;
        if (s.text !== ch.text || s.rows.length !== seg.counts.length) rebuild(s, seg.edgesDbov, ch.text);
        let total = 0;
        let top = -1;
        for (let k = 0; k < seg.counts.length; k++) {
          total += seg.counts[k];
          if (top < 0 || seg.counts[k] > seg.counts[top]) top = k;
        }
        for (let k = 0; k < seg.counts.length; k++) {
          const r = s.rows[k];
          const pct = total > 0 ? (100 * seg.counts[k]) / total : 0;
          r.share.textContent = total > 0 ? `${pct.toFixed(1)} %` : '—';
          r.bar.style.width = `${pct.toFixed(1)}%`;
          const snr = seg.snrDb[k];
          r.snr.textContent = Number.isNaN(snr)
            ? '—'
            : snr === Infinity
              ? 'no error'
              : `${snr.toFixed(1)} dB`;
          r.tr.classList.toggle('top', total > 0 && k === top);
        }
        const table = i === 0 ? a.table : b.table;
        table.dataset.topSegment = total > 0 ? String(top) : '';
        table.dataset.topShare = total > 0 ? ((100 * seg.counts[top]) / total).toFixed(2) : '';
      }
    },
  };
}
