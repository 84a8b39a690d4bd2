// uPlot in a box: the chart takes its box's size (and follows it), draws axes, ticks and
// grid in the theme's colours, and repaints on a theme change. uPlot's own legend stays
// off; every chart has a legend of ours (legend.ts) that wraps inside its panel.
import uPlot from 'uplot';
import { h } from '../dom';
import { onThemeChange, palette } from './theme';

export const AXIS_FONT = '11px system-ui, sans-serif';

export function axis(label: string, extra: Partial<uPlot.Axis> = {}): uPlot.Axis {
  return {
    label,
    stroke: () => palette().axisInk,
    grid: { stroke: () => palette().grid, width: 1 },
    ticks: { stroke: () => palette().grid, width: 1 },
    labelSize: 16,
    size: 40,
    font: AXIS_FONT,
    labelFont: AXIS_FONT,
    ...extra,
  };
}

/** Every chart on the page by the box it fills, so tests can read what a panel draws. */
const charts = new Map<HTMLElement, uPlot>();

/** The data of every chart inside `root`, in document order (copies, for tests). */
export function chartData(root: Element): (number | null)[][][] {
  const out: (number | null)[][][] = [];
  for (const [box, plot] of charts)
    if (root.contains(box)) out.push(plot.data.map((s) => Array.from(s as ArrayLike<number | null>)));
  return out;
}

/** Where a data point of the `chart`-th chart inside `root` sits on the page (client pixels), for tests. */
export function pointOnPage(
  root: Element,
  chart: number,
  x: number,
  y: number,
): { x: number; y: number } | null {
  const plot = [...charts].filter(([box]) => root.contains(box))[chart]?.[1];
  if (!plot) return null;
  const r = plot.over.getBoundingClientRect();
  return { x: r.left + plot.valToPos(x, 'x'), y: r.top + plot.valToPos(y, 'y') };
}

export interface BoxChart {
  plot: uPlot;
  /** The element the chart sits in (absolutely placed inside, so it never sizes its box). */
  box: HTMLElement;
  destroy(): void;
}

/**
 * A uPlot filling `box`. The box needs a size from its layout (flex or grid); the chart is
 * placed absolutely inside it, so a chart can never push its panel larger.
 */
export function boxChart(
  box: HTMLElement,
  opts: Omit<uPlot.Options, 'width' | 'height'>,
  data: uPlot.AlignedData,
): BoxChart {
  box.classList.add('chart-box');
  const inner = h('div', { class: 'chart-inner' });
  box.append(inner);
  const size = () => ({
    width: Math.max(120, Math.floor(box.clientWidth)),
    height: Math.max(40, Math.floor(box.clientHeight)),
  });
  const plot = new uPlot({ legend: { show: false }, ...opts, ...size() }, data, inner);
  charts.set(box, plot);
  let pending = 0;
  const observer = new ResizeObserver(() => {
    if (pending) return;
    pending = requestAnimationFrame(() => {
      pending = 0;
      const s = size();
      if (s.width !== plot.width || s.height !== plot.height) plot.setSize(s);
    });
  });
  observer.observe(box);
  const off = onThemeChange(() => plot.redraw(false));
  return {
    plot,
    box,
    destroy: () => {
      observer.disconnect();
      off();
      charts.delete(box);
      plot.destroy();
      inner.remove();
    },
  };
}

/** Draws a vertical line at x (scale units) over the plot area, with a short label. */
export function vline(
  u: uPlot,
  x: number,
  colour: string,
  label: string,
  dash: readonly number[] = [],
  labelRow = 0,
): void {
  if (!Number.isFinite(x)) return;
  const px = u.valToPos(x, 'x', true);
  const { top, height, left, width } = u.bbox;
  if (px < left || px > left + width) return;
  const r = devicePixelRatio || 1;
  const ctx = u.ctx;
  ctx.save();
  ctx.strokeStyle = colour;
  ctx.lineWidth = r;
  ctx.setLineDash(dash.map((d) => d * r));
  ctx.beginPath();
  ctx.moveTo(px, top);
  ctx.lineTo(px, top + height);
  ctx.stroke();
  if (label) {
    ctx.font = `${10 * r}px system-ui, sans-serif`;
    const w = ctx.measureText(label).width;
    // Keep the label inside the plot: to the right of the line, or to its left near the edge.
    const x0 = px + 3 * r + w > left + width ? px - 3 * r - w : px + 3 * r;
    const y0 = top + (11 + 12 * labelRow) * r;
    ctx.fillStyle = palette().panel;
    ctx.fillRect(x0 - r, y0 - 9 * r, w + 2 * r, 11 * r);
    ctx.fillStyle = palette().axisInk;
    ctx.fillText(label, x0, y0);
  }
  ctx.restore();
}

/** Value of series `s` at the cursor, or null. */
export function cursorValue(u: uPlot, s: number): number | null {
  const i = u.cursor.idx;
  if (i === null || i === undefined) return null;
  const v = u.data[s]?.[i];
  return v === null || v === undefined || !Number.isFinite(v) ? null : v;
}

export const fmt = (v: number | null, digits: number, unit: string): string =>
  v === null || !Number.isFinite(v) ? '—' : `${v.toFixed(digits)} ${unit}`;
