// The Live view: the measurements first. The first screen holds the Level spread, the
// Segment ledger, the Meters, the SNR trace and the Level/SNR curve; the Transfer curve
// and the Trade-off sit on the row below. Each snapshot goes to every panel once (they
// copy what they keep); each panel draws when its data changed and it is on screen.
import type { AudioEngine } from '../../audio/engine';
import type { ChannelSlot } from '../../audio/worklet/messages';
import { h } from '../../dom';
import type { Store } from '../../settings/store';
import type { ComputeClient } from '../../workers/client';
import type { FrameClock } from '../frame-clock';
import type { SweepBoard } from '../sweep/sweep-board';
import { ledgerPanel } from './ledger';
import { levelSnrPanel } from './level-snr';
import { levelSpreadPanel } from './level-spread';
import { metersPanel } from './meters';
import type { LiveContext, LivePanel } from './panel';
import { snrTracePanel } from './snr-trace';
import { transferPanel } from './transfer';

export interface LiveDeps {
  engine: AudioEngine;
  store: Store;
  compute: ComputeClient;
  clock: FrameClock;
  sweeps: SweepBoard;
}

/** Minimum time between two draws of a panel, ms: the eye gains nothing above ~12 a second here (common practice, no source). */
const DRAW_INTERVAL_MS: Record<string, number> = {
  'panel-transfer': 250,
  'panel-meters': 80,
};

export function mountLive(container: HTMLElement, deps: LiveDeps): { el: HTMLElement; extra: HTMLElement } {
  const { engine, store, clock } = deps;
  const spread = levelSpreadPanel(store);
  const ledger = ledgerPanel();
  const meters = metersPanel();
  const trace = snrTracePanel();
  const curve = levelSnrPanel(store, deps.compute, deps.sweeps);
  const transfer = transferPanel();
  const panels: LivePanel[] = [spread, ledger, meters, trace, curve, transfer];
  const first = h(
    'div',
    { class: 'live-first', 'data-testid': 'live-first' },
    h('div', { class: 'live-row top' }, spread.el, ledger.el, meters.el),
    h('div', { class: 'live-row bottom' }, trace.el, curve.el),
  );
  const extra = h('div', { class: 'live-row extra', 'data-testid': 'live-extra' }, transfer.el);
  const el = h('div', { class: 'live-view', 'data-testid': 'live-view' }, first, extra);
  container.append(el);

  const drawings = panels.map((p) => {
    const d = clock.add(p, DRAW_INTERVAL_MS[p.el.dataset.testid ?? ''] ?? 0);
    p.bind?.(d);
    return d;
  });
  const ctx: LiveContext = { active: 0 };
  const activeOf = (): ChannelSlot => {
    const s = store.audio;
    return s.monitor === 'b' || (s.monitor === 'error' && s.errorOf === 'b') ? 'b' : 'a';
  };
  engine.subscribe((envelope) => {
    const a = envelope.analysis;
    if (a.channels.length < 2) return;
    ctx.active = activeOf() === 'b' ? 1 : 0;
    for (const p of panels) p.take(a, ctx);
    for (const d of drawings) d.invalidate();
  });
  clock.onFrame = (n) => (el.dataset.frames = String(n));
  // Spans and models are page settings: a change redraws from what the panels hold.
  store.subscribe(() => {
    for (const d of drawings) d.invalidate();
  });
  return { el, extra };
}
