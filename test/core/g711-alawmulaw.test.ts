// The npm package alawmulaw (6.x) as an independent oracle for G.711.
import { describe, it, expect } from 'vitest';
import { alaw, mulaw } from 'alawmulaw';
import type { LawReference } from './g711-reference';
import { A_LAW, ALL_CODES, ALL_INT16, MU_LAW } from './g711-laws';

describe('decoding tables match alawmulaw for all 256 codes', () => {
  // Source: npm alawmulaw mulaw.decode / decodeSample and alaw.decode / decodeSample.
  const cases = [
    { law: MU_LAW, oracle: mulaw },
    { law: A_LAW, oracle: alaw },
  ];
  for (const { law, oracle } of cases) {
    it(law.name, () => {
      expect(Array.from(law.decodeBlock(ALL_CODES))).toEqual(Array.from(oracle.decode(ALL_CODES)));
      // decodeSample returns the JS number -0 for -0 (mu-law 0x7f); as int16 it is 0.
      for (let c = 0; c < 256; c++) expect(law.toLinear(c)).toBe(oracle.decodeSample(c) + 0);
    });
  }
});

// Documented ties: alawmulaw quantizes the magnitude, so a negative input
// exactly on a decision value gets the larger magnitude; our convention
// (g711.ts header) gives it the smaller one. Those are the only differences:
// mu-law at -4 * d for the 127 mu-law decision values d = 1, 3, ..., 31, 35,
// ..., 7903 (14-bit; -4, -12, ..., -31612 in 16-bit), A-law at -8 * d for the
// 127 A-law decision values d = 2, 4, ..., 32, 34, ..., 3968 (13-bit; -16,
// -32, ..., -31744 in 16-bit). Decision values from G.711 Tables 1/2 (from
// memory), see g711-reference.ts.
const EXPECTED_TIES = 127;

function checkEncoder(
  ref: LawReference,
  ours: Uint8Array,
  theirs: Uint8Array,
  decode: (c: number) => number,
): number[] {
  const tieInputs = new Set(ref.decisions16.map((d) => -d));
  const differences: number[] = [];
  const notTies: number[] = [];
  for (let i = 0; i < 65536; i++) {
    if (ours[i] === theirs[i]) continue;
    const n = ALL_INT16[i];
    differences.push(n);
    const a = decode(ours[i]);
    const b = decode(theirs[i]);
    // Must be a negative tie, where ours is the smaller-magnitude neighbour
    // and theirs the next level down (one magnitude step apart).
    const k = ref.magnitude16.indexOf(-a);
    const isTie = tieInputs.has(n) && a <= 0 && k >= 0 && ref.magnitude16[k + 1] === -b;
    if (!isTie) notTies.push(n);
  }
  expect(notTies).toEqual([]);
  return differences;
}

/** Scalar encoders against alawmulaw's encodeSample, ties excluded. */
function scalarMismatches(
  ref: LawReference,
  ours: (n: number) => number,
  theirs: (n: number) => number,
): number[] {
  const ties = new Set(ref.decisions16.map((d) => -d));
  const bad: number[] = [];
  for (let n = -32768; n < 32768; n++) {
    if (!ties.has(n) && ours(n) !== (theirs(n) & 0xff)) bad.push(n);
  }
  return bad;
}

describe('encoding matches alawmulaw on all 65536 inputs except documented ties', () => {
  // Source: npm alawmulaw mulaw.encode / alaw.encode; ties from the decision values of
  // G.711 Table 2 (mu-law) / Table 1 (A-law) (from memory). The first and last three
  // ties are -4 * d (mu-law) and -8 * d (A-law) for the largest and smallest d listed above.
  const cases = [
    { law: MU_LAW, oracle: mulaw, firstTie: -31612, lastTies: [-20, -12, -4] },
    { law: A_LAW, oracle: alaw, firstTie: -31744, lastTies: [-48, -32, -16] },
  ];
  for (const { law, oracle, firstTie, lastTies } of cases) {
    it(law.name, () => {
      const diffs = checkEncoder(law.ref, law.encodeBlock(ALL_INT16), oracle.encode(ALL_INT16), law.toLinear);
      expect(diffs.length).toBe(EXPECTED_TIES);
      expect(diffs).toEqual(law.ref.decisions16.map((d) => -d).sort((x, y) => x - y));
      expect(diffs.slice(-3)).toEqual(lastTies);
      expect(diffs[0]).toBe(firstTie);
      expect(scalarMismatches(law.ref, law.fromLinear, oracle.encodeSample)).toEqual([]);
    });
  }
});
