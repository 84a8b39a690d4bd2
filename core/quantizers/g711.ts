// ITU-T G.711 mu-law and A-law, bit-exact and table driven.
//
// Linear side: 16-bit integers, the G.711 uniform value shifted left by 2
// (mu-law, 14-bit) or 3 (A-law, 13-bit). Code side: the 8-bit character as
// sent on the line (mu-law with all bits inverted, A-law with the even bits
// inverted; G.711 sections 2 and 3, from memory).
//
// Convention for inputs exactly on a decision value: the sample takes the
// code above it on the signed line (toward +infinity). Every code therefore
// covers a half-open interval [lower, upper) of the signed line, the same
// partition that table() hands to theory code. For positive inputs that is
// the larger magnitude; for negative inputs the smaller one. The npm package
// alawmulaw mirrors positive behaviour onto negatives (larger magnitude), so
// the two differ exactly on negative inputs sitting on a decision value:
// 127 int16 inputs per law.
//
// Float samples map to int16 by floor(x * 32768), clamped to -32768..32767.
// Floor (not round) because every G.711 decision value is an integer on the
// 16-bit scale: with floor the float quantizer's decision values are exactly
// the standard's, divided by 32768, and it agrees with the integer codec on
// every int16 input n / 32768.

import type { Quantizer, QuantizedSample, QuantizerTable } from './types';

/** Segment (chord) end points, mu-law, 14-bit magnitudes (G.711 Table 2, from memory). */
export const MU_LAW_SEGMENT_ENDS: readonly number[] = Object.freeze([
  31, 95, 223, 479, 991, 2015, 4063, 8159,
]);
/** Segment (chord) end points, A-law, 13-bit magnitudes (G.711 Table 1, from memory). */
export const A_LAW_SEGMENT_ENDS: readonly number[] = Object.freeze([32, 64, 128, 256, 512, 1024, 2048, 4096]);
/** Step size inside each chord, in the same units as the end points. */
const MU_LAW_STEPS = [2, 4, 8, 16, 32, 64, 128, 256];
const A_LAW_STEPS = [2, 2, 4, 8, 16, 32, 64, 128];

/** Overload points on the float scale (int16 / 32768). */
export const MU_LAW_OVERLOAD = (8159 * 4) / 32768;
export const A_LAW_OVERLOAD = 1.0;
/** Theoretical load capacities, dBm0 (G.711, from memory). */
export const MU_LAW_LOAD_CAPACITY_DBM0 = 3.17;
export const A_LAW_LOAD_CAPACITY_DBM0 = 3.14;
/** Character sent instead of 0x00 by mu-law all-zero suppression (G.711 section 3.2, from memory). */
export const MU_LAW_ZERO_SUPPRESSION_CODE = 0x02;

const MU_SCALE = 4; // 14-bit -> 16-bit
const A_SCALE = 8; // 13-bit -> 16-bit

/**
 * Per magnitude index k = 16 * chord + step (0..127): the lower decision
 * value and the quantized value, 16-bit units. Built from the chord end
 * points and step sizes: each chord holds 16 equal steps ending at its end
 * point, and the quantized value is the step's midpoint. For mu-law the
 * first step of chord 0 starts at -1, so its midpoint is the zero level
 * shared by +0 and -0.
 */
function magnitudeLevels(
  ends: readonly number[],
  steps: readonly number[],
  scale: number,
): { lower: Int32Array; value: Int32Array } {
  const lower = new Int32Array(128);
  const value = new Int32Array(128);
  for (let chord = 0; chord < 8; chord++) {
    const step = steps[chord];
    const start = ends[chord] - 16 * step;
    for (let s = 0; s < 16; s++) {
      const k = chord * 16 + s;
      const lo = start + s * step;
      lower[k] = Math.max(lo, 0) * scale;
      value[k] = (lo + step / 2) * scale;
    }
  }
  return { lower, value };
}

const MU = magnitudeLevels(MU_LAW_SEGMENT_ENDS, MU_LAW_STEPS, MU_SCALE);
const A = magnitudeLevels(A_LAW_SEGMENT_ENDS, A_LAW_STEPS, A_SCALE);

// Line characters for magnitude index k and sign.
const muChar = (k: number, negative: boolean): number => (negative ? 0x80 | k : k) ^ 0xff;
const aChar = (k: number, negative: boolean): number => (negative ? k : 0x80 | k) ^ 0x55;

/**
 * Full encode table, indexed by (n & 0xffff) for int16 n. A positive n takes
 * the largest k with lower[k] <= n; a negative n of magnitude m the largest k
 * with lower[k] < m (ties toward +infinity, see the header).
 */
function buildEncodeTable(lower: Int32Array, char: (k: number, negative: boolean) => number): Uint8Array {
  const table = new Uint8Array(65536);
  let k = 0;
  for (let n = 0; n <= 32767; n++) {
    while (k < 127 && lower[k + 1] <= n) k++;
    table[n] = char(k, false);
  }
  k = 0;
  for (let m = 1; m <= 32768; m++) {
    while (k < 127 && lower[k + 1] < m) k++;
    table[-m & 0xffff] = char(k, true);
  }
  return table;
}

function buildDecodeTable(value: Int32Array, char: (k: number, negative: boolean) => number): Int16Array {
  const table = new Int16Array(256);
  for (let k = 0; k < 128; k++) {
    table[char(k, false)] = value[k];
    table[char(k, true)] = -value[k];
  }
  return table;
}

const MU_ENCODE = buildEncodeTable(MU.lower, muChar);
const A_ENCODE = buildEncodeTable(A.lower, aChar);
const MU_ENCODE_ZS = MU_ENCODE.map((c) => (c === 0 ? MU_LAW_ZERO_SUPPRESSION_CODE : c));
const MU_DECODE = buildDecodeTable(MU.value, muChar);
const A_DECODE = buildDecodeTable(A.value, aChar);
const MU_DECODE_FLOAT = Float64Array.from(MU_DECODE, (v) => v / 32768);
const A_DECODE_FLOAT = Float64Array.from(A_DECODE, (v) => v / 32768);

/** Clamp to int16 and floor; NaN maps to 0. */
function toInt16(x: number): number {
  if (x >= 32767) return 32767;
  if (x <= -32768) return -32768;
  return Math.floor(x) | 0;
}

// --- sample functions (int16 <-> line character) ---------------------------

/** 16-bit linear -> mu-law line character. Non-integers are floored, out-of-range clamped. */
export function linearToMuLaw(x: number, zeroSuppression = false): number {
  return (zeroSuppression ? MU_ENCODE_ZS : MU_ENCODE)[toInt16(x) & 0xffff];
}

export function muLawToLinear(code: number): number {
  return MU_DECODE[code & 0xff];
}

/** 16-bit linear -> A-law line character. Non-integers are floored, out-of-range clamped. */
export function linearToALaw(x: number): number {
  return A_ENCODE[toInt16(x) & 0xffff];
}

export function aLawToLinear(code: number): number {
  return A_DECODE[code & 0xff];
}

/** Chord 0..7 of a mu-law line character. */
export function muLawSegment(code: number): number {
  return (~code >> 4) & 7;
}

/** Chord 0..7 of an A-law line character. */
export function aLawSegment(code: number): number {
  return ((code ^ 0x55) >> 4) & 7;
}

// --- block functions --------------------------------------------------------

export function encodeMuLawBlock(
  input: Int16Array,
  out: Uint8Array = new Uint8Array(input.length),
  zeroSuppression = false,
): Uint8Array {
  const t = zeroSuppression ? MU_ENCODE_ZS : MU_ENCODE;
  const n = input.length;
  for (let i = 0; i < n; i++) out[i] = t[input[i] & 0xffff];
  return out;
}

export function decodeMuLawBlock(
  codes: Uint8Array,
  out: Int16Array = new Int16Array(codes.length),
): Int16Array {
  const t = MU_DECODE;
  const n = codes.length;
  for (let i = 0; i < n; i++) out[i] = t[codes[i]];
  return out;
}

export function encodeALawBlock(
  input: Int16Array,
  out: Uint8Array = new Uint8Array(input.length),
): Uint8Array {
  const t = A_ENCODE;
  const n = input.length;
  for (let i = 0; i < n; i++) out[i] = t[input[i] & 0xffff];
  return out;
}

export function decodeALawBlock(
  codes: Uint8Array,
  out: Int16Array = new Int16Array(codes.length),
): Int16Array {
  const t = A_DECODE;
  const n = codes.length;
  for (let i = 0; i < n; i++) out[i] = t[codes[i]];
  return out;
}

// --- float quantizers -------------------------------------------------------

/**
 * Decision and output values on the float scale, one entry per distinct
 * level. Mu-law +0 and -0 both decode to 0, so they form one level covering
 * [-4, 4) / 32768; the table has 255 levels (A-law: 256, no zero level).
 * With zero suppression the lowest interval (below decision value 127,
 * -7903 in 14-bit units) outputs -7519 instead of -8031, so there
 * outputs[0] > outputs[1]: the one place where outputs are not ascending,
 * because the suppressed quantizer is not monotone there.
 */
function buildTable(
  lower: Int32Array,
  value: Int32Array,
  hasZeroLevel: boolean,
  lowestOutput: number,
): QuantizerTable {
  const decisions: number[] = [];
  const outputs: number[] = [];
  for (let k = 127; k >= 1; k--) {
    outputs.push(-value[k]);
    decisions.push(-lower[k]);
  }
  if (hasZeroLevel) {
    outputs.push(0);
  } else {
    outputs.push(-value[0]);
    decisions.push(0);
    outputs.push(value[0]);
  }
  for (let k = 1; k < 128; k++) {
    decisions.push(lower[k]);
    outputs.push(value[k]);
  }
  outputs[0] = lowestOutput;
  return {
    decisions: Float64Array.from(decisions, (v) => v / 32768),
    outputs: Float64Array.from(outputs, (v) => v / 32768),
  };
}

function edges(ends: readonly number[], scale: number): Float64Array {
  return Float64Array.from([0, ...ends], (v) => (v * scale) / 32768);
}

interface G711Params {
  kind: 'g711-mu' | 'g711-a';
  label: string;
  overloadPoint: number;
  loadCapacityDbm0: number;
  segmentEdges: Float64Array;
  encodeTable: Uint8Array;
  decodeFloat: Float64Array;
  segmentOfCode: (code: number) => number;
  makeTable: () => QuantizerTable;
}

function makeG711Quantizer(p: G711Params): Quantizer {
  const enc = p.encodeTable;
  const dec = p.decodeFloat;
  const over = p.overloadPoint;
  // Chord per line character, so the hot path is lookups only.
  const seg = new Uint8Array(256);
  for (let c = 0; c < 256; c++) seg[c] = p.segmentOfCode(c);
  let cachedTable: QuantizerTable | undefined;

  const codeOf = (x: number): number => {
    const s = x * 32768;
    const n = s >= 32767 ? 32767 : s <= -32768 ? -32768 : Math.floor(s) | 0;
    return enc[n & 0xffff];
  };

  return {
    kind: p.kind,
    label: p.label,
    bits: 8,
    overloadPoint: over,
    loadCapacityDbm0: p.loadCapacityDbm0,
    segmentCount: 8,
    segmentEdges: p.segmentEdges,
    quantize: (x) => dec[codeOf(x)],
    encode: codeOf,
    decode: (code) => dec[code & 0xff],
    segmentOf: (x) => seg[codeOf(x)],
    quantizeSample(x, out) {
      const code = codeOf(x);
      const r: QuantizedSample = out ?? { value: 0, code: 0, segment: 0, overload: false };
      r.value = dec[code];
      r.code = code;
      r.segment = seg[code];
      r.overload = x > over || x < -over;
      return r;
    },
    quantizeBlock(input, output, codes, segments) {
      const n = input.length;
      let overloads = 0;
      if (codes === undefined && segments === undefined) {
        // The common case (audio path): no per-sample branches on optional outputs.
        for (let i = 0; i < n; i++) {
          const x = input[i];
          const s = x * 32768;
          const v = s >= 32767 ? 32767 : s <= -32768 ? -32768 : Math.floor(s) | 0;
          output[i] = dec[enc[v & 0xffff]];
          if (x > over || x < -over) overloads++;
        }
        return overloads;
      }
      for (let i = 0; i < n; i++) {
        const x = input[i];
        const s = x * 32768;
        const v = s >= 32767 ? 32767 : s <= -32768 ? -32768 : Math.floor(s) | 0;
        const code = enc[v & 0xffff];
        output[i] = dec[code];
        if (codes !== undefined) codes[i] = code;
        if (segments !== undefined) segments[i] = seg[code];
        if (x > over || x < -over) overloads++;
      }
      return overloads;
    },
    table() {
      if (cachedTable === undefined) cachedTable = p.makeTable();
      return cachedTable;
    },
  };
}

/** G.711 mu-law on float samples; see the header for the float <-> int16 rule. */
export function createG711MuQuantizer(opts: { zeroSuppression?: boolean } = {}): Quantizer {
  const zs = opts.zeroSuppression === true;
  return makeG711Quantizer({
    kind: 'g711-mu',
    label: zs ? 'g711-mu,zs' : 'g711-mu',
    overloadPoint: MU_LAW_OVERLOAD,
    loadCapacityDbm0: MU_LAW_LOAD_CAPACITY_DBM0,
    segmentEdges: edges(MU_LAW_SEGMENT_ENDS, MU_SCALE),
    encodeTable: zs ? MU_ENCODE_ZS : MU_ENCODE,
    decodeFloat: MU_DECODE_FLOAT,
    segmentOfCode: muLawSegment,
    makeTable: () => buildTable(MU.lower, MU.value, true, -MU.value[zs ? 125 : 127]),
  });
}

/** G.711 A-law on float samples; see the header for the float <-> int16 rule. */
export function createG711AQuantizer(): Quantizer {
  return makeG711Quantizer({
    kind: 'g711-a',
    label: 'g711-a',
    overloadPoint: A_LAW_OVERLOAD,
    loadCapacityDbm0: A_LAW_LOAD_CAPACITY_DBM0,
    segmentEdges: edges(A_LAW_SEGMENT_ENDS, A_SCALE),
    encodeTable: A_ENCODE,
    decodeFloat: A_DECODE_FLOAT,
    segmentOfCode: aLawSegment,
    makeTable: () => buildTable(A.lower, A.value, false, -A.value[127]),
  });
}
