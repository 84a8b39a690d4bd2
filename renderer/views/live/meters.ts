// Meters: the talker at channel A's quantizer (peak, RMS, active level in dBov and
// dBm0, activity factor, crest factor) and overloads of A and B with their counts.
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { dbm0FromDbov } from '../../../core/units/levels';
import { h } from '../../dom';
import { fixed, panelBox, type LivePanel } from './panel';

/** An overload lamp stays lit this long after the count last rose (common practice, no source). */
const LAMP_HOLD_MS = 1500;

function cell(testId: string): HTMLElement {
  return h('span', { class: 'meter-value num', 'data-testid': testId }, '');
}

const ROWS = [
  ['meter-peak', 'Peak'],
  ['meter-rms', 'RMS'],
  ['meter-active', 'Active (P.56)'],
] as const;

export function metersPanel(): LivePanel {
  const box = panelBox('panel-meters', 'Meters');
  const grid = h(
    'div',
    { class: 'meter-grid' },
    h('span', {}, ''),
    h('span', { class: 'meter-unit' }, 'dBov'),
    h('span', { class: 'meter-unit' }, 'dBm0'),
  );
  const cells = ROWS.map(([id, label]) => {
    const ov = cell(`${id}-dbov`);
    const m0 = cell(`${id}-dbm0`);
    grid.append(h('span', { class: 'meter-label' }, label), ov, m0);
    return [ov, m0] as const;
  });
  const activity = cell('meter-activity');
  const crest = cell('meter-crest');
  const lamps = (['a', 'b'] as const).map((slot) => {
    const count = h('span', { class: 'num', 'data-testid': `meter-overload-${slot}-count` }, '0');
    const lamp = h(
      'span',
      { class: 'lamp', 'data-testid': `meter-overload-${slot}`, 'data-lit': 'false', role: 'status' },
      `Overload ${slot.toUpperCase()} `,
      count,
    );
    return { lamp, count, last: 0, litUntil: 0 };
  });
  box.body.append(
    grid,
    h(
      'div',
      { class: 'meter-grid two' },
      h('span', { class: 'meter-label' }, 'Activity'),
      activity,
      h('span', { class: 'meter-label' }, 'Crest factor'),
      crest,
    ),
    h('div', { class: 'lamps' }, ...lamps.map((l) => l.lamp)),
    h(
      'p',
      { class: 'hint' },
      'Talker at A’s quantizer, after the input gain; peak and RMS over the last 0.1 s.',
    ),
  );
  const v = { peak: null as number | null, rms: null as number | null, active: null as number | null };
  let lc = 0;
  let af: number | null = null;
  let crestDb: number | null = null;
  const overloads = [0, 0];
  let seen = false;
  return {
    el: box.el,
    take(a: AnalysisSnapshot) {
      const t = a.talkers[a.channels[0].talker];
      lc = t.loadCapacityDbm0;
      v.peak = t.meter.momentaryPeakDbov;
      v.rms = t.meter.momentaryRmsDbov;
      v.active = t.activeWindow.activeLevelDbov;
      af = t.activeWindow.activityFactor;
      crestDb = t.meter.crestDb;
      const now = performance.now();
      for (let i = 0; i < 2; i++) {
        const n = a.channels[i].meter.overloads;
        if (n > overloads[i]) lamps[i].litUntil = now + LAMP_HOLD_MS;
        overloads[i] = n;
      }
      seen = true;
    },
    draw() {
      if (!seen) return;
      box.waiting(null);
      const values = [v.peak, v.rms, v.active];
      cells.forEach(([ov, m0], i) => {
        const dbov = values[i];
        ov.textContent = fixed(dbov, 1, 'dBov');
        m0.textContent = fixed(dbov === null ? null : dbm0FromDbov(dbov, lc), 1, 'dBm0');
        ov.dataset.value = dbov === null ? '' : dbov.toFixed(2);
      });
      activity.textContent = af === null ? 'no speech' : `${(100 * af).toFixed(0)} %`;
      crest.textContent = fixed(crestDb, 1, 'dB');
      const now = performance.now();
      lamps.forEach((l, i) => {
        l.count.textContent = String(overloads[i]);
        l.lamp.dataset.lit = String(now < l.litUntil);
      });
    },
    clear() {
      seen = false;
      box.waiting('Waiting for audio: press Start audio.');
    },
  };
}
