// Offline analysis of 5 minutes of 48 kHz mono audio through the whole measurement
// engine (channel path to 8 kHz, two G.711 channels, talker statistics, P.56, level
// spread, segment ledgers, segmental SNR, O.41-weighted SNR and both spectra) as a
// real-time factor, against the bare G.711 quantize loop (both laws' quantizeBlock
// over the same 48 kHz samples) timed in the same run. The 5 minutes are a seeded
// 10 s speech-like buffer fed 30 times: the cost does not depend on the content.
import { Analyzer } from '../../core/analysis/index';
import { createQuantizer } from '../../core/quantizers/index';
import { registerFigure } from './harness';
import { speechLikeFloat } from './signals';

const RATE = 48000;
const PIECE = speechLikeFloat(10 * RATE, 300);
const PIECES = 30;
const SECONDS = (PIECE.length * PIECES) / RATE;
const REPEATS = 3;
let sink = 0;

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  return s[s.length >> 1];
}

/** Seconds of audio per second of work, median of a few whole runs. */
function realTimeFactor(run: () => void): number {
  const rates: number[] = [];
  for (let r = 0; r < REPEATS; r++) {
    const t0 = performance.now();
    run();
    rates.push(SECONDS / ((performance.now() - t0) / 1000));
  }
  return median(rates);
}

registerFigure({
  name: 'offline analysis 5 min, 2 x G.711 at 8 kHz, all accumulators',
  unit: 'x real time',
  measure() {
    const mu = createQuantizer('g711-mu');
    const a = createQuantizer('g711-a');
    const out = new Float32Array(PIECE.length);
    const bare = realTimeFactor(() => {
      for (let p = 0; p < PIECES; p++) {
        sink += mu.quantizeBlock(PIECE, out);
        sink += a.quantizeBlock(PIECE, out);
      }
    });
    const ours = realTimeFactor(() => {
      const analyzer = new Analyzer({
        inputRate: RATE,
        channels: ['g711-mu', 'g711-a'],
        maxBlock: 4096,
        meter: { weighting: true },
      });
      for (let p = 0; p < PIECES; p++) analyzer.process(PIECE);
      analyzer.finish();
      sink += analyzer.snapshot().channels[0].meter.samples;
    });
    return {
      value: ours,
      reference: { name: 'bare G.711 quantize loop, both laws', value: bare, unit: 'x real time' },
    };
  },
});

export function analysisSink(): number {
  return sink;
}
