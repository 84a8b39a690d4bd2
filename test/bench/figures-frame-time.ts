// Script-plus-draw time of the Live view per animation frame on the demo talker, at 1920x1080
// in headless Chromium: the performance measures the view takes around each redraw (its panel
// updates and the uPlot redraws they commit), median and 95th percentile over about 5 s. Panels
// draw only while shown, so it is measured twice: on the first screen (Level spread, ledger,
// meters, SNR trace, Level/SNR curve), and scrolled to the second row (Transfer curve, Trade-off,
// with the part of the first row still shown). The reference is the frame interval of the same
// page while idle, measured in the same run: the budget each frame's drawing has to fit in.
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
  const span = async () => {
    performance.clearMeasures('qs-live-draw');
    await new Promise((r) => setTimeout(r, 5000));
    const d = performance.getEntriesByName('qs-live-draw').map((e) => e.duration).sort((a, b) => a - b);
    if (d.length < 20) throw new Error('the Live view drew only ' + d.length + ' frames');
    return { median: d[d.length >> 1], p95: d[Math.floor(d.length * 0.95)] };
  };
  const first = await span();
  document.querySelector('[data-testid="panel-transfer"]').scrollIntoView({ block: 'center' });
  await new Promise((r) => setTimeout(r, 1000));
  const second = await span();
  return { first, second, idle: median(intervals) };
`;

interface Span {
  median: number;
  p95: number;
}

interface FrameTimes {
  first: Span;
  second: Span;
  idle: number;
}

let cached: FrameTimes | null = null;
const measureOnce = (): FrameTimes =>
  (cached ??= runInPage<FrameTimes>(SCRIPT, { viewport: { width: 1920, height: 1080 } }));

for (const [name, row, key] of [
  ['Live view frame time at 1920x1080, first screen, median', 'first', 'median'],
  ['Live view frame time at 1920x1080, first screen, 95th percentile', 'first', 'p95'],
  ['Live view frame time at 1920x1080, second row, median', 'second', 'median'],
  ['Live view frame time at 1920x1080, second row, 95th percentile', 'second', 'p95'],
] as const) {
  registerFigure({
    name,
    unit: 'ms',
    measure() {
      const r = measureOnce();
      return {
        value: r[row][key],
        reference: { name: 'frame interval of the idle page', value: r.idle, unit: 'ms' },
      };
    },
  });
}
