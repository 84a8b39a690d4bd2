// Cost of watching: CPU time of all of the browser's processes together (main thread, compute
// worker, raster, compositor, audio thread), as a share of one core over 15 s each, read from
// /proc, with the page at 1280x800 on the demo talker: before Start, while monitoring, and while
// monitoring with the page hidden (another tab in front). The reference is the same browser on
// about:blank over the same time, measured first in the same run: the floor the page adds to.
import { runInPage } from './chromium-page';
import { registerFigure } from './harness';

const SPAN_S = 15;

const SCRIPT = `
  const wait = (ms) => new Promise((r) => setTimeout(r, ms));
  const share = async (seconds) => {
    const t0 = performance.now();
    const c0 = await qsCpuSeconds();
    await wait(seconds * 1000);
    return ((await qsCpuSeconds()) - c0) / ((performance.now() - t0) / 1000);
  };
  await wait(2000);
  const idle = await share(${SPAN_S});
  document.querySelector('[data-testid="engine-start"]').click();
  await wait(3000);
  if (!window.quantiscope.engine.state().running) throw new Error('the engine did not start');
  const monitoring = await share(${SPAN_S});
  const state = await qsHide(true);
  if (state !== 'hidden') throw new Error('the page did not become hidden: ' + state);
  await wait(1000);
  const hidden = await share(${SPAN_S});
  await qsHide(false);
  return { idle, monitoring, hidden, blank: await qsBlankShare() };
`;

interface Shares {
  idle: number;
  monitoring: number;
  hidden: number;
  blank: number;
}

let cached: Shares | null = null;
const measureOnce = (): Shares =>
  (cached ??= runInPage<Shares>(SCRIPT, { blankSeconds: SPAN_S, viewport: { width: 1280, height: 800 } }));

for (const [name, key] of [
  ['Cost of watching, before Start (all browser processes, % of one core)', 'idle'],
  ['Cost of watching, monitoring (all browser processes, % of one core)', 'monitoring'],
  ['Cost of watching, monitoring while hidden (all browser processes, % of one core)', 'hidden'],
] as const) {
  registerFigure({
    name,
    unit: '%',
    measure() {
      const r = measureOnce();
      return {
        value: r[key] * 100,
        reference: { name: 'the same browser on about:blank', value: r.blank * 100, unit: '%' },
      };
    },
  });
}
