// Series styles for every chart: a channel keeps its colour AND its line pattern and
// marker everywhere, so a chart reads in greyscale print and without telling teal from
// orange. Channel A: solid, filled markers; channel B: dashed, hollow markers; the
// Reference: dotted; theory: the channel's pattern, drawn thin; the mask: dash-dot, heavy.
import type uPlot from 'uplot';
import { palette, type Palette } from './theme';

export type Marker = 'none' | 'filled' | 'hollow';

export interface SeriesStyle {
  colour: keyof Palette;
  /** Dash pattern in CSS pixels; empty for a solid line. */
  dash: readonly number[];
  /** Line width in CSS pixels; 0 draws markers only. */
  width: number;
  marker: Marker;
  markerSize: number;
}

const DASH_B = [7, 4];
const DOTTED = [2, 3];
const DASH_DOT = [10, 3, 2, 3];

export const STYLES = {
  a: { colour: 'a', dash: [], width: 1.75, marker: 'none', markerSize: 0 },
  b: { colour: 'b', dash: DASH_B, width: 1.75, marker: 'none', markerSize: 0 },
  reference: { colour: 'reference', dash: DOTTED, width: 1.25, marker: 'none', markerSize: 0 },
  theoryA: { colour: 'a', dash: [], width: 1, marker: 'none', markerSize: 0 },
  theoryB: { colour: 'b', dash: DASH_B, width: 1, marker: 'none', markerSize: 0 },
  pointsA: { colour: 'a', dash: [], width: 0, marker: 'filled', markerSize: 5 },
  pointsB: { colour: 'b', dash: [], width: 0, marker: 'hollow', markerSize: 5 },
  sweepA: { colour: 'a', dash: [], width: 1, marker: 'filled', markerSize: 7 },
  sweepB: { colour: 'b', dash: DASH_B, width: 1, marker: 'hollow', markerSize: 7 },
  mask: { colour: 'mask', dash: DASH_DOT, width: 2, marker: 'none', markerSize: 0 },
  mark: { colour: 'mark', dash: [6, 3], width: 1, marker: 'none', markerSize: 0 },
  limit: { colour: 'axisInk', dash: [4, 4], width: 1, marker: 'none', markerSize: 0 },
} as const satisfies Record<string, SeriesStyle>;

export type StyleName = keyof typeof STYLES;

/** The style of channel slot 0 (A) or 1 (B) in a given use. */
export const slotStyle = (slot: number, use: 'line' | 'theory' | 'points' | 'sweep'): SeriesStyle => {
  const b = slot === 1;
  switch (use) {
    case 'line':
      return b ? STYLES.b : STYLES.a;
    case 'theory':
      return b ? STYLES.theoryB : STYLES.theoryA;
    case 'points':
      return b ? STYLES.pointsB : STYLES.pointsA;
    case 'sweep':
      return b ? STYLES.sweepB : STYLES.sweepA;
  }
};

const px = (v: number) => v * (globalThis.devicePixelRatio || 1);

/** A uPlot series drawn in a style; colours are read at draw time, so a theme switch repaints it. */
export function styledSeries(
  label: string,
  style: SeriesStyle,
  extra: Partial<uPlot.Series> = {},
): uPlot.Series {
  const colour = () => palette()[style.colour];
  const series: uPlot.Series = {
    label,
    stroke: colour,
    width: style.width,
    dash: style.dash.map(px),
    points:
      style.marker === 'none'
        ? { show: false }
        : {
            show: true,
            size: style.markerSize,
            width: 1.25,
            stroke: colour,
            fill: style.marker === 'filled' ? colour : () => palette().panel,
          },
    ...extra,
  };
  if (style.width === 0) series.paths = () => null;
  return series;
}
