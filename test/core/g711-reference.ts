// Independent G.711 reference for the tests, written from the structure of
// ITU-T G.711 Tables 1 (A-law) and 2 (mu-law) as recalled (from memory):
// 8 chords of 16 steps per polarity, each chord's first quantized value and
// step size, the chord end points, and the layout of the line character.
// It shares no code with core/quantizers/g711.ts and is written for
// clarity, not speed.

/** Chord end points, mu-law 14-bit / A-law 13-bit magnitudes (G.711 Tables 2 / 1, from memory). */
export const MU_ENDS = [31, 95, 223, 479, 991, 2015, 4063, 8159];
export const A_ENDS = [32, 64, 128, 256, 512, 1024, 2048, 4096];

/** First quantized value of each chord (G.711 Tables 2 / 1, from memory). */
export const MU_BASE = [0, 33, 99, 231, 495, 1023, 2079, 4191];
export const A_BASE = [1, 33, 66, 132, 264, 528, 1056, 2112];

/** Step size of each chord (G.711 Tables 2 / 1, from memory; A-law chords 0 and 1 share one step). */
export const MU_STEP = [2, 4, 8, 16, 32, 64, 128, 256];
export const A_STEP = [2, 2, 4, 8, 16, 32, 64, 128];

/**
 * Factor from the G.711 uniform value to 16-bit linear: shift left by 2 / 3 (G.711 works on
 * 14-bit mu-law and 13-bit A-law linear values, from memory).
 */
export const MU_TO_16 = 4;
export const A_TO_16 = 8;

export interface LawReference {
  name: 'mu' | 'a';
  /** 16-bit decoded value for each of the 256 line characters. */
  decoded: number[];
  /** Line character for polarity (true = positive), chord 0..7, step 0..15. */
  char(positive: boolean, chord: number, step: number): number;
  /**
   * 127 ascending 16-bit magnitudes where the magnitude index changes:
   * decision value j separates magnitude index j-1 from j (j = 1..127).
   */
  decisions16: number[];
  /** 16-bit quantized magnitude of magnitude index 0..127. */
  magnitude16: number[];
}

// mu-law: the line carries the character with every bit inverted; before
// inversion bit 8 is 1 for negative (G.711 Table 2 note, from memory), so
// on the line 0xff is +0 and 0x80 the largest positive value.
function muChar(positive: boolean, chord: number, step: number): number {
  return ((positive ? 0 : 0x80) | (chord << 4) | step) ^ 0xff;
}

// A-law: polarity bit 1 = positive, even bits inverted on the line (G.711
// Table 1 note, from memory): XOR with 0x55.
function aChar(positive: boolean, chord: number, step: number): number {
  return ((positive ? 0x80 : 0) | (chord << 4) | step) ^ 0x55;
}

function build(
  name: 'mu' | 'a',
  ends: number[],
  base: number[],
  steps: number[],
  to16: number,
  char: LawReference['char'],
): LawReference {
  const decoded = new Array<number>(256).fill(NaN);
  const magnitude16: number[] = [];
  // Decision values inside chord c: ends[c] - step * j, j = 15..0; the last
  // one of chord 7 is the overload point, not a decision between codes.
  const upper: number[] = [];
  for (let c = 0; c < 8; c++) {
    for (let s = 0; s < 16; s++) {
      const v = base[c] + s * steps[c];
      magnitude16.push(v * to16);
      decoded[char(true, c, s)] = v * to16;
      decoded[char(false, c, s)] = 0 - v * to16; // no -0 for the zero level
      upper.push((ends[c] - steps[c] * (15 - s)) * to16);
    }
  }
  return { name, decoded, char, decisions16: upper.slice(0, 127), magnitude16 };
}

export const MU_REF = build('mu', MU_ENDS, MU_BASE, MU_STEP, MU_TO_16, muChar);
export const A_REF = build('a', A_ENDS, A_BASE, A_STEP, A_TO_16, aChar);

/**
 * Reference encoder, linear search over the decision values. Tie rule (our
 * stated convention): an input exactly on a decision value takes the code
 * above it on the signed line, so a negative input on a decision value gets
 * the smaller magnitude.
 */
export function referenceEncode(ref: LawReference, n: number): number {
  const positive = n >= 0;
  const m = Math.abs(n);
  let k = 0;
  for (const d of ref.decisions16) {
    if (positive ? d <= m : d < m) k++;
  }
  return ref.char(positive, k >> 4, k & 15);
}

/** Mean power of a sine whose peak sits at `peak`. */
export const fullLoadSinePower = (peak: number): number => (peak * peak) / 2;
