// Shared uPlot helpers: themed axes and series, a chart that follows its box's size,
// and formatting of values with their units for axes and cursor readouts.
import uPlot from 'uplot';
import { onThemeChange, palette, type Palette } from './theme';

export type Colour = keyof Palette;

/** A series stroke that follows the theme. */
export const stroke = (c: Colour) => (): string => palette()[c];

export const withUnit =
  (unit: string, digits = 1) =>
  (_u: uPlot, v: number | null | undefined): string =>
    v === null || v === undefined || !Number.isFinite(v) ? '—' : `${v.toFixed(digits)} ${unit}`;

export function axis(label: string, extra: Partial<uPlot.Axis> = {}): uPlot.Axis {
  return {
    label,
    stroke: () => palette().mutedInk,
    grid: { stroke: () => palette().grid, width: 1 },
    ticks: { stroke: () => palette().grid, width: 1 },
    labelSize: 18,
    size: 42,
    font: '11px system-ui, sans-serif',
    labelFont: '11px system-ui, sans-serif',
    ...extra,
  };
}

export interface LiveChart {
  plot: uPlot;
  destroy(): void;
}

/** A uPlot inside `box`, resized with it and repainted on theme changes. */
export function liveChart(
  box: HTMLElement,
  opts: Omit<uPlot.Options, 'width' | 'height'>,
  data: uPlot.AlignedData,
): LiveChart {
  const size = () => ({
    width: Math.max(160, Math.floor(box.clientWidth)),
    height: Math.max(120, Math.floor(box.clientHeight) - 28),
  });
  const plot = new uPlot({ ...opts, ...size() }, data, box);
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
    destroy: () => {
      observer.disconnect();
      off();
      plot.destroy();
    },
  };
}

/** Draws a vertical line at x (scale units) over the plot area, with a short label. */
export function vline(u: uPlot, x: number, colour: string, label: string, dash: number[] = []): void {
  if (!Number.isFinite(x)) return;
  const px = u.valToPos(x, 'x', true);
  const { top, height, left, width } = u.bbox;
  if (px < left || px > left + width) return;
  const ctx = u.ctx;
  ctx.save();
  ctx.strokeStyle = colour;
  ctx.fillStyle = colour;
  ctx.lineWidth = devicePixelRatio;
  ctx.setLineDash(dash.map((d) => d * devicePixelRatio));
  ctx.beginPath();
  ctx.moveTo(px, top);
  ctx.lineTo(px, top + height);
  ctx.stroke();
  if (label) {
    ctx.font = `${10 * devicePixelRatio}px system-ui, sans-serif`;
    ctx.fillText(label, px + 3 * devicePixelRatio, top + 11 * devicePixelRatio);
  }
  ctx.restore();
}
