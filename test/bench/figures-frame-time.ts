// Script-plus-draw time of the Live view per animation frame, with every panel live on
// the demo talker, in headless Chromium: the performance measures the view takes around
// each redraw (its panel updates and the uPlot redraws they commit), median and 95th
// percentile over about 5 s. The reference is the frame interval of the same page while
// idle, measured in the same run: the budget each frame's drawing has to fit in.
import { runInPage } from './chromium-page';
import { registerFigure } from './harness';

const SCRIPT = `
  const median = (v) => { const s = [...v].sort((a, b) => a - b); return s[s.length >> 1]; };
  const intervals = await new Promise((done) => {
    const t = [];
    let last = 0;
    const step = (now) => {
      if (last) t.push(now - last);
      last = now;
      if (t.length < 120) requestAnimationFrame(step); else done(t);
    };
    requestAnimationFrame(step);
  });
  document.querySelector('[data-testid="engine-start"]').click();
  await new Promise((r) => setTimeout(r, 3000));
  performance.clearMeasures('qs-live-draw');
  await new Promise((r) => setTimeout(r, 5000));
  const d = performance.getEntriesByName('qs-live-draw').map((e) => e.duration).sort((a, b) => a - b);
  if (d.length < 20) throw new Error('the Live view drew only ' + d.length + ' frames');
  return { median: d[d.length >> 1], p95: d[Math.floor(d.length * 0.95)], frames: d.length, idle: median(intervals) };
`;

interface FrameTimes {
  median: number;
  p95: number;
  frames: number;
  idle: number;
}

let cached: FrameTimes | null = null;
const measureOnce = (): FrameTimes => (cached ??= runInPage<FrameTimes>(SCRIPT));

for (const [name, key] of [
  ['Live view frame time, median (all panels, demo talker)', 'median'],
  ['Live view frame time, 95th percentile (all panels, demo talker)', 'p95'],
] as const) {
  registerFigure({
    name,
    unit: 'ms',
    measure() {
      const r = measureOnce();
      return {
        value: r[key],
        reference: { name: 'frame interval of the idle page', value: r.idle, unit: 'ms' },
      };
    },
  });
}
