// The npm package alawmulaw (6.x) as an independent oracle for G.711.
import { describe, it, expect } from 'vitest';
import { alaw, mulaw } from 'alawmulaw';
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

const ALL_CODES = Uint8Array.from({ length: 256 }, (_, i) => i);
const ALL_INT16 = Int16Array.from({ length: 65536 }, (_, i) => i - 32768);

describe('decoding tables match alawmulaw for all 256 codes', () => {
  // Source: npm alawmulaw mulaw.decode / decodeSample.
  it('mu-law', () => {
    expect(Array.from(decodeMuLawBlock(ALL_CODES))).toEqual(Array.from(mulaw.decode(ALL_CODES)));
    // decodeSample returns the JS number -0 for -0 (0x7f); as int16 it is 0.
    for (let c = 0; c < 256; c++) expect(muLawToLinear(c)).toBe(mulaw.decodeSample(c) + 0);
  });

  // Source: npm alawmulaw alaw.decode / decodeSample.
  it('A-law', () => {
    expect(Array.from(decodeALawBlock(ALL_CODES))).toEqual(Array.from(alaw.decode(ALL_CODES)));
    for (let c = 0; c < 256; c++) expect(aLawToLinear(c)).toBe(alaw.decodeSample(c) + 0);
  });
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
  // Source: npm alawmulaw mulaw.encode; ties from G.711 Table 2 decision values (from memory).
  it('mu-law', () => {
    const diffs = checkEncoder(MU_REF, encodeMuLawBlock(ALL_INT16), mulaw.encode(ALL_INT16), muLawToLinear);
    expect(diffs.length).toBe(EXPECTED_TIES);
    expect(diffs).toEqual(MU_REF.decisions16.map((d) => -d).sort((x, y) => x - y));
    expect(diffs.slice(-3)).toEqual([-20, -12, -4]);
    expect(diffs[0]).toBe(-31612);
    expect(scalarMismatches(MU_REF, linearToMuLaw, mulaw.encodeSample)).toEqual([]);
  });

  // Source: npm alawmulaw alaw.encode; ties from G.711 Table 1 decision values (from memory).
  it('A-law', () => {
    const diffs = checkEncoder(A_REF, encodeALawBlock(ALL_INT16), alaw.encode(ALL_INT16), aLawToLinear);
    expect(diffs.length).toBe(EXPECTED_TIES);
    expect(diffs).toEqual(A_REF.decisions16.map((d) => -d).sort((x, y) => x - y));
    expect(diffs.slice(-3)).toEqual([-48, -32, -16]);
    expect(diffs[0]).toBe(-31744);
    expect(scalarMismatches(A_REF, linearToALaw, alaw.encodeSample)).toEqual([]);
  });
});
