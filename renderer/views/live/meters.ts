// Meters: the talker at channel A's quantizer (peak, RMS, active level in dBov and
// dBm0, activity factor, crest factor) and overloads of A and B with their counts.
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { dbm0FromDbov } from '../../../core/units/levels';
import { h } from '../../dom';
import { fixed, panelBox, type LivePanel } from './panel';

/** An overload lamp stays lit this long after the count last rose (common practice, no source). */
const LAMP_HOLD_MS = 1500;

function cell(testId: string): HTMLElement {
  return h('span', { class: 'meter-value num', 'data-testid': testId }, '—');
}

export function metersPanel(): LivePanel {
  const { el, body } = panelBox('panel-meters', 'Meters');
  const rows: [string, string][] = [
    ['meter-peak', 'Peak'],
    ['meter-rms', 'RMS'],
    ['meter-active', 'Active level (P.56)'],
  ];
  const values = new Map<string, [HTMLElement, HTMLElement]>();
  const grid = h(
    'div',
    { class: 'meter-grid' },
    h('span', {}, ''),
    h('span', { class: 'meter-unit' }, 'dBov'),
    h('span', { class: 'meter-unit' }, 'dBm0'),
  );
  for (const [id, label] of rows) {
    const ov = cell(`${id}-dbov`);
    const m0 = cell(`${id}-dbm0`);
    values.set(id, [ov, m0]);
    grid.append(h('span', { class: 'meter-label' }, label), ov, m0);
  }
  const activity = cell('meter-activity');
  const crest = cell('meter-crest');
  const lamps = (['a', 'b'] as const).map((slot) => {
    const count = h('span', { class: 'num', 'data-testid': `meter-overload-${slot}-count` }, '0');
    const lamp = h(
      'span',
      { class: 'lamp', 'data-testid': `meter-overload-${slot}`, 'data-lit': 'false', role: 'status' },
      `Overload ${slot.toUpperCase()}`,
      count,
    );
    return { lamp, count, last: 0, litUntil: 0 };
  });
  body.append(
    grid,
    h(
      'div',
      { class: 'meter-grid two' },
      h('span', { class: 'meter-label' }, 'Activity factor'),
      activity,
      h('span', { class: 'meter-label' }, 'Crest factor'),
      crest,
    ),
    h('div', { class: 'lamps' }, ...lamps.map((l) => l.lamp)),
    h(
      'p',
      { class: 'hint' },
      'Talker at channel A’s quantizer, after the input gain; peak and RMS over the last interval.',
    ),
  );
  return {
    el,
    update(a: AnalysisSnapshot) {
      const ch = a.channels[0];
      const t = a.talkers[ch.talker];
      const lc = t.loadCapacityDbm0;
      const put = (id: string, dbov: number | null) => {
        const [ov, m0] = values.get(id)!;
        ov.textContent = fixed(dbov, 1, 'dBov');
        m0.textContent = fixed(dbov === null ? null : dbm0FromDbov(dbov, lc), 1, 'dBm0');
        ov.dataset.value = dbov === null ? '' : dbov.toFixed(2);
      };
      put('meter-peak', t.meter.momentaryPeakDbov);
      put('meter-rms', t.meter.momentaryRmsDbov);
      put('meter-active', t.activeWindow.activeLevelDbov);
      const af = t.activeWindow.activityFactor;
      activity.textContent = af === null ? 'no speech' : `${(100 * af).toFixed(0)} %`;
      crest.textContent = fixed(t.meter.crestDb, 1, 'dB');
      const now = performance.now();
      for (let i = 0; i < 2; i++) {
        const l = lamps[i];
        const n = a.channels[i].meter.overloads;
        if (n > l.last) l.litUntil = now + LAMP_HOLD_MS;
        l.last = n;
        l.count.textContent = String(n);
        l.lamp.dataset.lit = String(now < l.litUntil);
      }
    },
  };
}
