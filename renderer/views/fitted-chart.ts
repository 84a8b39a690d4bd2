// A uPlot chart that takes its host's width (and a height in proportion, within limits)
// and follows it when the layout changes. The views' one-off charts build on it.
import type uPlot from 'uplot';

export class FittedChart {
  protected plot: uPlot | null = null;
  private readonly resize: ResizeObserver;

  constructor(
    protected readonly host: HTMLElement,
    private readonly minHeight: number,
    private readonly maxHeight: number,
  ) {
    // The chart takes the host's width, so the host must not take the chart's (CSSOM, allowed by the CSP).
    host.style.minWidth = '0';
    host.style.overflow = 'hidden';
    this.resize = new ResizeObserver(() => this.fit());
    this.resize.observe(host);
  }

  protected size(): { width: number; height: number } {
    const width = Math.max(320, Math.floor(this.host.clientWidth));
    return { width, height: Math.max(this.minHeight, Math.min(this.maxHeight, Math.round(width * 0.4))) };
  }

  private fit(): void {
    if (!this.plot) return;
    const s = this.size();
    if (s.width !== this.plot.width || s.height !== this.plot.height) this.plot.setSize(s);
  }

  destroy(): void {
    this.resize.disconnect();
    this.plot?.destroy();
    this.plot = null;
  }
}
