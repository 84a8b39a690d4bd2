// OfflineAudioContext rendering of 60 s through the engine's full graph in headless
// Chromium (channel worklet: Reference, A = G.711 mu-law, B = G.711 A-law, every
// accumulator) as a real-time factor, against the bare graph without the worklet
// (source -> gain -> destination) rendered in the same browser in the same run.
import { runInPage } from './chromium-page';
import { registerFigure } from './harness';

const SCRIPT = `
  // 60 s of seeded noise at -20 dBFS-ish: the graph's cost does not depend on the content.
  const n = 60 * 48000;
  const x = new Float32Array(n);
  let s = 12345;
  for (let i = 0; i < n; i++) { s = (s * 16807) % 2147483647; x[i] = (s / 2147483647 - 0.5) * 0.2; }
  const q = window.quantiscope;
  const full = await q.renderOffline(x, { a: 'g711-mu', b: 'g711-a' }, { record: false });
  const bare = await q.renderOffline(x, undefined, { worklet: false, record: false });
  return { full: full.realTimeFactor, bare: bare.realTimeFactor };
`;

registerFigure({
  name: 'offline render 60 s in Chromium, full graph (Ref + G.711 mu and A)',
  unit: 'x real time',
  measure() {
    const r = runInPage<{ full: number; bare: number }>(SCRIPT);
    return {
      value: r.full,
      reference: { name: 'bare graph without the worklet', value: r.bare, unit: 'x real time' },
    };
  },
});
