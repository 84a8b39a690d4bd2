// The accumulators at an 8 kHz channel: talker statistics (level spread, meters,
// P.56) and one channel meter (SNR, segment ledger, codes, segmental SNR, spectra),
// fed 20 ms blocks of a G.711 mu-law channel quantized beforehand, against a bare
// loop that sums signal and error energy over the same data (the floor of any
// SNR measurement). 1 Msample/s is 125 times real time at 8 kHz.
import { ChannelMeter } from '../../core/measure/channel-meter';
import { TalkerMeter } from '../../core/measure/talker-meter';
import { createQuantizer } from '../../core/quantizers/index';
import { compareThroughput, registerFigure } from './harness';
import { BLOCK, speechLikeFloat } from './signals';

const MSPS = 'Msamples/s';
const RATE = 8000;
const FRAME = 160;
/** Whole 20 ms blocks out of the shared bench length. */
const LENGTH = Math.floor(BLOCK / FRAME) * FRAME;

const q = createQuantizer('g711-mu');
const input = Float64Array.from(speechLikeFloat(LENGTH, 56));
const output = new Float64Array(LENGTH);
const codes = new Uint8Array(LENGTH);
const segments = new Uint8Array(LENGTH);
q.quantizeBlock(input, output, codes, segments);
let sink = 0;

function bareLoop(): void {
  let s = 0;
  let e = 0;
  for (let i = 0; i < LENGTH; i++) {
    const x = input[i];
    const d = output[i] - x;
    s += x * x;
    e += d * d;
  }
  sink += s / e;
}

function accumulatorFigure(name: string, weighting: boolean): void {
  registerFigure({
    name,
    unit: MSPS,
    measure() {
      const talker = new TalkerMeter({ rate: RATE, overloadPoint: q.overloadPoint });
      const channel = new ChannelMeter({ quantizer: q, rate: RATE, weighting });
      const snapshot = channel.createSnapshot();
      const r = compareThroughput(
        () => {
          for (let i = 0; i < LENGTH; i += FRAME) {
            talker.add(input, i, i + FRAME);
            channel.add(input, output, codes, segments, i, i + FRAME);
          }
          sink += channel.snapshot(snapshot).errorPower;
        },
        bareLoop,
        LENGTH,
      );
      return {
        value: r.ours,
        reference: { name: 'bare signal/error energy loop', value: r.theirs, unit: MSPS },
      };
    },
  });
}

accumulatorFigure('accumulators, 8 kHz channel', false);
accumulatorFigure('accumulators, 8 kHz channel, O.41 weighting on', true);

export const measureSink = (): number => sink;
