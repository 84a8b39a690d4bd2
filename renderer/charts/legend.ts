// Legends of our own: a wrapping row of swatches (each drawn in its series' colour, dash
// and marker) and one readout line for the value under the cursor. They wrap inside their
// panel instead of running out of it, and show nothing but names before there is data.
import { h } from '../dom';
import { onThemeChange, palette } from './theme';
import type { SeriesStyle } from './series';

const SVG = 'http://www.w3.org/2000/svg';

function svg<K extends keyof SVGElementTagNameMap>(tag: K, attrs: Record<string, string | number>) {
  const el = document.createElementNS(SVG, tag);
  for (const [k, v] of Object.entries(attrs)) el.setAttribute(k, String(v));
  return el;
}

/** A 28 x 12 picture of a series: its line with its dash, and its marker in the middle. */
export function swatch(style: SeriesStyle): SVGSVGElement {
  const s = svg('svg', {
    width: 28,
    height: 12,
    viewBox: '0 0 28 12',
    'aria-hidden': 'true',
    class: 'swatch',
  });
  const paint = () => {
    const p = palette();
    const colour = p[style.colour];
    s.replaceChildren();
    if (style.width > 0)
      s.append(
        svg('line', {
          x1: 1,
          y1: 6,
          x2: 27,
          y2: 6,
          stroke: colour,
          'stroke-width': Math.max(1.25, style.width),
          'stroke-dasharray': style.dash.length ? style.dash.join(' ') : 'none',
        }),
      );
    if (style.marker !== 'none')
      s.append(
        svg('circle', {
          cx: 14,
          cy: 6,
          r: Math.min(4.5, style.markerSize / 2 + 0.5),
          stroke: colour,
          'stroke-width': 1.25,
          fill: style.marker === 'filled' ? colour : p.panel,
        }),
      );
  };
  paint();
  onThemeChange(paint);
  return s;
}

export interface LegendEntry {
  label: string;
  style: SeriesStyle;
}

export interface Legend {
  el: HTMLElement;
  /** Replaces an entry's label (for example when a channel changes). */
  rename(index: number, label: string): void;
  /** Shows or hides an entry (a series with nothing to show). */
  show(index: number, visible: boolean): void;
  /** The line under the legend: the values at the cursor, or '' to hide it. */
  readout(text: string): void;
}

export function legend(entries: readonly LegendEntry[], testId?: string): Legend {
  const labels = entries.map((e) => h('span', { class: 'legend-label' }, e.label));
  const items = entries.map((e, i) => h('span', { class: 'legend-item' }, swatch(e.style), labels[i]));
  const line = h('span', { class: 'legend-readout', 'aria-live': 'off' });
  const el = h(
    'div',
    { class: 'legend', 'data-testid': testId, role: 'list' },
    ...items.map((i) => {
      i.setAttribute('role', 'listitem');
      return i;
    }),
    line,
  );
  return {
    el,
    rename: (i, label) => {
      if (labels[i].textContent !== label) labels[i].textContent = label;
    },
    show: (i, visible) => {
      items[i].hidden = !visible;
    },
    readout: (text) => {
      if (line.textContent !== text) line.textContent = text;
    },
  };
}
