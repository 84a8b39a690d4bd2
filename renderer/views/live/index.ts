// The Live view: six panels drawn at display rate from the newest snapshot only.
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import type { SweepResult } from '../../../core/sweep/sweep';
import type { AudioEngine } from '../../audio/engine';
import { h } from '../../dom';
import { ledgerPanel } from './ledger';
import { ComputeClient } from '../../workers/client';
import { levelSnrPanel } from './level-snr';
import { levelSpreadPanel } from './level-spread';
import { listenBar } from './listen';
import { metersPanel } from './meters';
import type { LiveContext, LivePanel } from './panel';
import { snrTracePanel } from './snr-trace';
import { transferPanel } from './transfer';

export interface LiveView {
  el: HTMLElement;
  /** Shows a sweep result on the Level/SNR curve (null clears it). */
  showSweep(result: SweepResult | null): void;
}

/** Performance measure name around each frame's drawing (for the bench). */
export const DRAW_MEASURE = 'qs-live-draw';

export function mountLive(
  container: HTMLElement,
  deps: { engine: AudioEngine; compute?: ComputeClient },
): LiveView {
  const { engine } = deps;
  const levelSnr = levelSnrPanel(deps.compute ?? new ComputeClient());
  const panels: LivePanel[] = [
    levelSpreadPanel(),
    ledgerPanel(),
    metersPanel(),
    snrTracePanel(),
    levelSnr,
    transferPanel(),
  ];
  const grid = h('div', { class: 'live-grid' }, ...panels.map((p) => p.el));
  const el = h('div', { class: 'live-view', 'data-testid': 'live-view' }, listenBar(engine), grid);
  container.append(el);

  const ctx: LiveContext = { active: 0 };
  engine.onChange((s) => {
    const slot = s.monitor === 'b' ? 1 : s.monitor === 'error' && s.errorOf === 'b' ? 1 : 0;
    ctx.active = slot;
  });
  let drawn: AnalysisSnapshot | null = null;
  let frames = 0;
  const frame = () => {
    requestAnimationFrame(frame);
    const a = engine.lastAnalysis;
    if (!a || a === drawn || a.channels.length < 2) return;
    drawn = a;
    performance.mark('qs-live-draw-start');
    for (const p of panels) p.update(a, ctx);
    // uPlot commits its redraws in microtasks queued by the updates above; measuring in a
    // microtask queued after them takes the drawing in as well as the script.
    queueMicrotask(() => {
      performance.measure(DRAW_MEASURE, 'qs-live-draw-start');
      performance.clearMarks('qs-live-draw-start');
    });
    if (++frames % 5000 === 0) performance.clearMeasures(DRAW_MEASURE);
    el.dataset.frames = String(frames);
  };
  requestAnimationFrame(frame);
  // A sweep view elsewhere on the page announces its result with this event.
  document.addEventListener('quantiscope:sweep', (e) =>
    levelSnr.showSweep((e as CustomEvent<SweepResult>).detail),
  );
  return { el, showSweep: (r) => levelSnr.showSweep(r) };
}
