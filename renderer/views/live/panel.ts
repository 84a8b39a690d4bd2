// The frame every Live panel sits in: a titled box with a body that charts fill.
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { h } from '../../dom';

export interface LiveContext {
  /** The channel whose segment edges the level spread shows (the one being monitored). */
  active: 0 | 1;
}

export interface LivePanel {
  el: HTMLElement;
  update(a: AnalysisSnapshot, ctx: LiveContext): void;
}

export function panelBox(
  testId: string,
  title: string,
  ...tools: HTMLElement[]
): { el: HTMLElement; body: HTMLElement } {
  const body = h('div', { class: 'live-body' });
  const el = h(
    'section',
    { class: 'live-panel', 'data-testid': testId, 'aria-label': title },
    h('header', { class: 'live-head' }, h('h2', {}, title), ...tools),
    body,
  );
  return { el, body };
}

export const fixed = (v: number | null, digits: number, unit: string): string =>
  v === null || !Number.isFinite(v) ? '—' : `${v.toFixed(digits)} ${unit}`;
