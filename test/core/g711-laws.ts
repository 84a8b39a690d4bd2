// The two laws of core/quantizers/g711.ts side by side with the independent
// reference of each (g711-reference.ts), so one test runs over both, and the
// complete input sets the exhaustive checks walk.
import {
  aLawToLinear,
  decodeALawBlock,
  decodeMuLawBlock,
  encodeALawBlock,
  encodeMuLawBlock,
  linearToALaw,
  linearToMuLaw,
  muLawToLinear,
} from '../../core/quantizers/g711';
import { A_REF, MU_REF, type LawReference } from './g711-reference';

/** Every 8-bit line character. */
export const ALL_CODES = Uint8Array.from({ length: 256 }, (_, i) => i);
/** Every 16-bit linear input. */
export const ALL_INT16 = Int16Array.from({ length: 65536 }, (_, i) => i - 32768);

export interface G711Law {
  name: 'mu-law' | 'A-law';
  ref: LawReference;
  toLinear(code: number): number;
  fromLinear(n: number): number;
  decodeBlock(codes: Uint8Array): Int16Array;
  encodeBlock(input: Int16Array): Uint8Array;
}

export const MU_LAW: G711Law = {
  name: 'mu-law',
  ref: MU_REF,
  toLinear: muLawToLinear,
  fromLinear: (n) => linearToMuLaw(n),
  decodeBlock: (codes) => decodeMuLawBlock(codes),
  encodeBlock: (input) => encodeMuLawBlock(input),
};

export const A_LAW: G711Law = {
  name: 'A-law',
  ref: A_REF,
  toLinear: aLawToLinear,
  fromLinear: linearToALaw,
  decodeBlock: (codes) => decodeALawBlock(codes),
  encodeBlock: (input) => encodeALawBlock(input),
};
