// The frame every Live panel sits in, and what a panel does: take() copies what it keeps
// from each snapshot (once per snapshot, before the envelope goes back to the audio
// thread); draw() paints from that copy, when the frame clock says the panel is shown.
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { h } from '../../dom';

export interface LiveContext {
  /** The channel whose segment edges the level spread shows (the one being monitored). */
  active: 0 | 1;
}

export interface LivePanel {
  el: HTMLElement;
  take(a: AnalysisSnapshot, ctx: LiveContext): void;
  draw(): void;
  /** Back to the state before any snapshot (figures restarted elsewhere). */
  clear?(): void;
  /** Given the panel's drawing, for data that arrives other than by snapshot (worker results). */
  bind?(drawing: { invalidate(): void }): void;
}

export interface PanelBox {
  el: HTMLElement;
  body: HTMLElement;
  /** A line in place of the panel's content until data comes (null removes it). */
  waiting(text: string | null): void;
}

export function panelBox(testId: string, title: string, ...tools: HTMLElement[]): PanelBox {
  const body = h('div', { class: 'panel-body' });
  const note = h('p', { class: 'panel-waiting', role: 'status' }, 'Waiting for audio: press Start audio.');
  const el = h(
    'section',
    { class: 'live-panel', 'data-testid': testId, 'aria-label': title },
    h('header', { class: 'panel-head' }, h('h2', {}, title), ...tools),
    body,
    note,
  );
  return {
    el,
    body,
    waiting: (text) => {
      note.hidden = text === null;
      if (text !== null) note.textContent = text;
      el.dataset.waiting = String(text !== null);
    },
  };
}

export const fixed = (v: number | null, digits: number, unit: string): string =>
  v === null || !Number.isFinite(v) ? '—' : `${v.toFixed(digits)} ${unit}`;
