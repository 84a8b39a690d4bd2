// When panels draw. Snapshots arrive ~25 times a second and views take what they keep at
// once; drawing waits for an animation frame and happens only for a panel whose data
// changed since it last drew and that is on screen. While the document is hidden nothing
// draws (measuring goes on); on return every panel that missed data draws once. With no
// data arriving the clock asks for no frames at all.

/** Performance measure around each frame's drawing (read by the bench). */
export const DRAW_MEASURE = 'qs-live-draw';

export interface Drawable {
  el: HTMLElement;
  draw(): void;
}

export interface Drawing {
  /** The panel's data changed: draw it at the next frame it is shown. */
  invalidate(): void;
  dispose(): void;
}

interface Entry {
  d: Drawable;
  dirty: boolean;
  onScreen: boolean;
  minInterval: number;
  last: number;
  draws: number;
}

export class FrameClock {
  private readonly entries = new Map<Element, Entry>();
  private frame = 0;
  private timer = 0;
  private readonly seen: IntersectionObserver;
  /** Animation frames in which at least one panel drew. */
  frames = 0;
  onFrame: ((frames: number) => void) | null = null;

  constructor() {
    // The bottom 40 px do not count: the sticky footer covers them, so a panel that only
    // peeks out under it is not shown.
    this.seen = new IntersectionObserver(
      (records) => {
        for (const r of records) {
          const e = this.entries.get(r.target);
          if (e) e.onScreen = r.isIntersecting;
        }
        this.schedule();
      },
      { rootMargin: '0px 0px -40px 0px' },
    );
    document.addEventListener('visibilitychange', () => this.schedule());
  }

  add(d: Drawable, minIntervalMs = 0): Drawing {
    const e: Entry = { d, dirty: true, onScreen: false, minInterval: minIntervalMs, last: 0, draws: 0 };
    this.entries.set(d.el, e);
    this.seen.observe(d.el);
    return {
      invalidate: () => {
        e.dirty = true;
        if (e.onScreen) this.schedule();
      },
      dispose: () => {
        this.seen.unobserve(d.el);
        this.entries.delete(d.el);
      },
    };
  }

  private schedule(): void {
    if (this.frame || document.hidden) return;
    for (const e of this.entries.values()) {
      if (e.dirty && e.onScreen) {
        this.frame = requestAnimationFrame((t) => this.tick(t));
        return;
      }
    }
  }

  private tick(now: number): void {
    this.frame = 0;
    if (document.hidden) return;
    let drew = false;
    let wait = Infinity;
    performance.mark('qs-live-draw-start');
    for (const e of this.entries.values()) {
      if (!e.dirty || !e.onScreen) continue;
      const due = e.last + e.minInterval - now;
      if (due > 0) {
        wait = Math.min(wait, due);
        continue;
      }
      e.dirty = false;
      e.last = now;
      e.d.draw();
      e.draws++;
      e.d.el.dataset.draws = String(e.draws);
      drew = true;
    }
    if (drew) {
      this.frames++;
      // uPlot commits its redraws in microtasks queued by the draws above; measuring in a
      // microtask queued after them takes the drawing in as well as the script.
      queueMicrotask(() => {
        performance.measure(DRAW_MEASURE, 'qs-live-draw-start');
        performance.clearMarks('qs-live-draw-start');
      });
      if (this.frames % 5000 === 0) performance.clearMeasures(DRAW_MEASURE);
      this.onFrame?.(this.frames);
    } else performance.clearMarks('qs-live-draw-start');
    if (wait < Infinity && !this.timer)
      this.timer = window.setTimeout(() => {
        this.timer = 0;
        this.schedule();
      }, wait);
  }
}
