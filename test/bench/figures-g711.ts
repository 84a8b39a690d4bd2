// G.711 codec throughput against the npm package alawmulaw's block functions,
// on the same Int16Array / Uint8Array data in the same run.
import { alaw, mulaw } from './alawmulaw';
import {
  decodeALawBlock,
  decodeMuLawBlock,
  encodeALawBlock,
  encodeMuLawBlock,
} from '../../core/quantizers/g711';
import { compareThroughput, registerFigure } from './harness';
import { BLOCK, speechLikeInt16 } from './signals';

const TARGET = 3;
const MSPS = 'Msamples/s';

const pcm = speechLikeInt16(BLOCK, 711);
const muCodes = encodeMuLawBlock(pcm);
const aCodes = encodeALawBlock(pcm);

// Our block functions are called without an output array, so they allocate a
// fresh one per call exactly as alawmulaw does: the same work on both sides.
// A sink keeps the results alive so the calls cannot be optimised away.
let sink = 0;

function codecFigure(
  name: string,
  refName: string,
  ours: () => ArrayLike<number>,
  theirs: () => ArrayLike<number>,
): void {
  registerFigure({
    name,
    unit: MSPS,
    targetRatio: TARGET,
    measure() {
      const r = compareThroughput(
        () => {
          sink ^= ours()[sink & 1023];
        },
        () => {
          sink ^= theirs()[sink & 1023];
        },
        BLOCK,
      );
      return { value: r.ours, reference: { name: refName, value: r.theirs, unit: MSPS } };
    },
  });
}

codecFigure(
  'g711 mu-law encode',
  'alawmulaw mulaw.encode',
  () => encodeMuLawBlock(pcm),
  () => mulaw.encode(pcm),
);
codecFigure(
  'g711 mu-law decode',
  'alawmulaw mulaw.decode',
  () => decodeMuLawBlock(muCodes),
  () => mulaw.decode(muCodes),
);
codecFigure(
  'g711 A-law encode',
  'alawmulaw alaw.encode',
  () => encodeALawBlock(pcm),
  () => alaw.encode(pcm),
);
codecFigure(
  'g711 A-law decode',
  'alawmulaw alaw.decode',
  () => decodeALawBlock(aCodes),
  () => alaw.decode(aCodes),
);

/** Read by the entry so the sink is observable. */
export const g711Sink = (): number => sink;
