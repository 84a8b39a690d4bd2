// Float quantizers (quantizeBlock on Float32Array), each against a yardstick
// measured in the same run.
import { createG711MuQuantizer } from '../../core/quantizers/g711';
import { createQuantizer } from '../../core/quantizers/index';
import { compareThroughput, registerFigure } from './harness';
import { BLOCK, speechLikeFloat } from './signals';

const MSPS = 'Msamples/s';
const input = speechLikeFloat(BLOCK, 255);
const out = new Float32Array(BLOCK);
const copy = new Float32Array(BLOCK);
let sink = 0;

const companded = createQuantizer({ law: 'mu', mu: 255, bits: 8 });
const g711mu = createG711MuQuantizer();

// Reference: the table-driven G.711 mu-law quantizer, the cheapest 8-bit mu-law
// path we have, so the ratio shows what the exact continuous law costs.
registerFigure({
  name: 'companded mu=255 8-bit quantizeBlock',
  unit: MSPS,
  measure() {
    const r = compareThroughput(
      () => {
        sink += companded.quantizeBlock(input, out);
      },
      () => {
        sink += g711mu.quantizeBlock(input, out);
      },
      BLOCK,
    );
    return { value: r.ours, reference: { name: 'g711-mu quantizeBlock', value: r.theirs, unit: MSPS } };
  },
});

// Reference: a plain Float32Array copy loop, the floor any per-sample pass pays.
registerFigure({
  name: 'g711-mu float quantizeBlock',
  unit: MSPS,
  measure() {
    const r = compareThroughput(
      () => {
        sink += g711mu.quantizeBlock(input, out);
      },
      () => {
        for (let i = 0; i < BLOCK; i++) copy[i] = input[i];
        sink += copy[sink & 1023];
      },
      BLOCK,
    );
    return { value: r.ours, reference: { name: 'Float32Array copy loop', value: r.theirs, unit: MSPS } };
  },
});

export const quantizerSink = (): number => sink;
