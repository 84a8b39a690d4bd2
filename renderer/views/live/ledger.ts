// Segment ledger: for A and B side by side, each segment's share of samples and its
// SNR; the segment holding the most samples is marked in each channel.
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { h } from '../../dom';
import { shortText } from '../../settings/store';
import { panelBox, type LivePanel } from './panel';

interface Row {
  tr: HTMLTableRowElement;
  bar: HTMLElement;
  share: HTMLElement;
  snr: HTMLElement;
}

interface Side {
  slot: 'a' | 'b';
  table: HTMLTableElement;
  caption: HTMLElement;
  body: HTMLTableSectionElement;
  rows: Row[];
  /** The channel the rows were built for. */
  built: string;
  text: string;
  edges: Float64Array;
  counts: Float64Array;
  snr: Float64Array;
}

const edge = (v: number) => (Number.isFinite(v) ? v.toFixed(0) : '−∞');

function side(slot: 'a' | 'b'): Side {
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
        h('th', { class: 'num', title: 'segment' }, 'Seg'),
        h('th', { class: 'range' }, 'dBov'),
        h('th', { class: 'num' }, 'Share'),
        h('th', { class: 'num' }, 'SNR'),
      ),
    ),
    body,
  );
  const none = new Float64Array(0);
  return { slot, table, caption, body, rows: [], built: '', text: '', edges: none, counts: none, snr: none };
}

function rebuild(s: Side): void {
  s.rows = [];
  s.body.replaceChildren();
  const e = s.edges;
  for (let k = e.length - 2; k >= 0; k--) {
    const row: Row = {
      tr: h('tr', { 'data-segment': k }),
      bar: h('span', { class: 'bar' }),
      share: h('span', { class: 'share-text' }, ''),
      snr: h('td', { class: 'num' }, ''),
    };
    row.tr.append(
      h('td', { class: 'num' }, k),
      h(
        'td',
        { class: 'range', title: `${edge(e[k])} to ${edge(e[k + 1])} dBov` },
        `${edge(e[k])}…${edge(e[k + 1])}`,
      ),
      h('td', { class: 'num share-cell' }, row.bar, row.share),
      row.snr,
    );
    s.rows[k] = row;
    s.body.append(row.tr);
  }
  s.built = s.text;
}

export function ledgerPanel(): LivePanel {
  const sides = [side('a'), side('b')];
  const box = panelBox('panel-ledger', 'Segment ledger');
  box.body.classList.add('ledger-pair');
  box.body.append(sides[0].table, sides[1].table);
  let seen = false;
  return {
    el: box.el,
    take(snap: AnalysisSnapshot) {
      for (let i = 0; i < 2; i++) {
        const s = sides[i];
        const ch = snap.channels[i];
        const seg = ch.meter.segments;
        if (s.counts.length !== seg.counts.length) {
          s.counts = new Float64Array(seg.counts.length);
          s.snr = new Float64Array(seg.counts.length);
        }
        if (s.text !== ch.text) {
          s.text = ch.text;
          s.edges = Float64Array.from(seg.edgesDbov);
        }
        s.counts.set(seg.counts);
        s.snr.set(seg.snrDb);
      }
      seen = true;
    },
    draw() {
      if (!seen) return;
      box.waiting(null);
      for (const s of sides) {
        if (s.built !== s.text || s.rows.length !== s.counts.length) rebuild(s);
        s.caption.textContent = `${s.slot.toUpperCase()}: ${shortText(s.text)}`;
        let total = 0;
        let top = -1;
        for (let k = 0; k < s.counts.length; k++) {
          total += s.counts[k];
          if (top < 0 || s.counts[k] > s.counts[top]) top = k;
        }
        for (let k = 0; k < s.counts.length; k++) {
          const r = s.rows[k];
          const pct = total > 0 ? (100 * s.counts[k]) / total : 0;
          r.share.textContent = total > 0 ? `${pct.toFixed(1)} %` : '';
          r.bar.style.width = `${pct.toFixed(1)}%`;
          const snr = s.snr[k];
          r.snr.textContent = Number.isNaN(snr) ? '' : snr === Infinity ? 'no error' : `${snr.toFixed(1)} dB`;
          r.tr.classList.toggle('top', total > 0 && k === top);
        }
        s.table.dataset.topSegment = total > 0 ? String(top) : '';
        s.table.dataset.topShare = total > 0 ? ((100 * s.counts[top]) / total).toFixed(2) : '';
      }
    },
    clear() {
      seen = false;
      box.waiting('Waiting for audio: press Start audio.');
    },
  };
}
