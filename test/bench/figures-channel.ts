// The channel path (48 kHz -> 8 kHz, two G.711 channels) as a real-time factor,
// against the bare quantizer loop (both G.711 quantizers' quantizeBlock) on the
// same 48 kHz samples, measured in the same run. The live figure runs 128-sample
// blocks, the AudioWorklet's size, with the 48 kHz listening outputs; the analysis
// figure runs 4096-sample blocks without them, as an offline pass would.
import { ChannelPath } from '../../core/channel/path';
import { createQuantizer } from '../../core/quantizers/index';
import { compareThroughput, registerFigure } from './harness';
import { BLOCK, speechLikeFloat } from './signals';

const RATE = 48000;
const UNIT = 'x real time';
const input = speechLikeFloat(BLOCK, 48);
const mu = createQuantizer('g711-mu');
const a = createQuantizer('g711-a');
const out = new Float32Array(BLOCK);
let sink = 0;

const bare = (): void => {
  sink += mu.quantizeBlock(input, out);
  sink += a.quantizeBlock(input, out);
};

/** Msamples/s of input to seconds of audio per second. */
const realTime = (msps: number): number => (msps * 1e6) / RATE;

function pathFigure(name: string, block: number, listen: boolean): void {
  registerFigure({
    name,
    unit: UNIT,
    measure() {
      const blocks = Array.from({ length: BLOCK / block }, (_, b) =>
        input.subarray(b * block, (b + 1) * block),
      );
      const path = new ChannelPath({
        inputRate: RATE,
        channels: ['g711-mu', 'g711-a'],
        maxBlock: block,
        listen,
      });
      const r = compareThroughput(
        () => {
          for (let b = 0; b < blocks.length; b++) path.process(blocks[b], block);
          sink += path.atRate[0].output[0];
        },
        bare,
        BLOCK,
      );
      // Keeps the results observable, so the calls cannot be optimised away.
      if (Number.isNaN(sink)) console.error('bench: channel sink is NaN');
      return {
        value: realTime(r.ours),
        reference: {
          name: 'bare g711-mu + g711-a quantizeBlock, same samples',
          value: realTime(r.theirs),
          unit: UNIT,
        },
      };
    },
  });
}

pathFigure('channel path 48k->8k, 2 channels', 128, true);
pathFigure('channel path 48k->8k, 2 channels, analysis (no 48 kHz outputs, 4096 blocks)', 4096, false);
