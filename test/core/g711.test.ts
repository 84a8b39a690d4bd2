import { describe, it, expect } from 'vitest';
import {
  A_LAW_LOAD_CAPACITY_DBM0,
  A_LAW_OVERLOAD,
  A_LAW_SEGMENT_ENDS,
  MU_LAW_LOAD_CAPACITY_DBM0,
  MU_LAW_OVERLOAD,
  MU_LAW_SEGMENT_ENDS,
  MU_LAW_ZERO_SUPPRESSION_CODE,
  aLawSegment,
  aLawToLinear,
  createG711AQuantizer,
  createG711MuQuantizer,
  decodeMuLawBlock,
  encodeALawBlock,
  encodeMuLawBlock,
  linearToALaw,
  linearToMuLaw,
  muLawSegment,
  muLawToLinear,
} from '../../core/quantizers/g711';
import type { Quantizer } from '../../core/quantizers/types';
import {
  A_ENDS,
  A_REF,
  A_TO_16,
  MU_ENDS,
  MU_REF,
  MU_TO_16,
  fullLoadSinePower,
  referenceEncode,
} from './g711-reference';
import { A_LAW, ALL_CODES, ALL_INT16, MU_LAW } from './g711-laws';

describe('G.711 decoder outputs', () => {
  // Source: G.711 Table 2 (mu-law) and Table 1 (A-law) structure, from memory, via g711-reference.ts.
  for (const law of [MU_LAW, A_LAW]) {
    it(`${law.name}: all 256 characters decode to the table value`, () => {
      for (let c = 0; c < 256; c++) expect(law.toLinear(c), `code ${c}`).toBe(law.ref.decoded[c]);
      expect(Array.from(law.decodeBlock(ALL_CODES))).toEqual(law.ref.decoded);
    });
  }

  // Source: G.711 Tables 1/2 (from memory): extreme and zero characters on the line.
  it('landmark characters', () => {
    expect(muLawToLinear(0xff)).toBe(0); // +0
    expect(muLawToLinear(0x7f)).toBe(0); // -0
    expect(muLawToLinear(0x80)).toBe(8031 * 4); // largest positive, 14-bit 8031
    expect(muLawToLinear(0x00)).toBe(-8031 * 4);
    expect(aLawToLinear(0xd5)).toBe(1 * 8); // smallest positive, 13-bit 1
    expect(aLawToLinear(0x55)).toBe(-1 * 8);
    expect(aLawToLinear(0xaa)).toBe(4032 * 8); // largest positive, 13-bit 4032
    expect(aLawToLinear(0x2a)).toBe(-4032 * 8);
  });

  // Source: closed forms of the same tables (from memory): mu-law (2m+33)*2^c - 33;
  // A-law 2m+1 in chord 0, (2m+33)*2^(c-1) above. A second, formula-based check.
  it('agrees with the closed-form chord formulas', () => {
    for (let c = 0; c < 8; c++) {
      for (let m = 0; m < 16; m++) {
        const mu14 = (2 * m + 33) * 2 ** c - 33;
        const a13 = c === 0 ? 2 * m + 1 : (2 * m + 33) * 2 ** (c - 1);
        expect(muLawToLinear(MU_REF.char(true, c, m))).toBe(mu14 * MU_TO_16);
        expect(muLawToLinear(MU_REF.char(false, c, m))).toBe(0 - mu14 * MU_TO_16);
        expect(aLawToLinear(A_REF.char(true, c, m))).toBe(a13 * A_TO_16);
        expect(aLawToLinear(A_REF.char(false, c, m))).toBe(-a13 * A_TO_16);
      }
    }
  });
});

describe('G.711 encoder against the decision values', () => {
  // Source: decision values of G.711 Tables 1/2 (from memory) via the reference's
  // linear search; ties by our stated convention (toward +infinity).
  for (const law of [MU_LAW, A_LAW]) {
    it(`${law.name}: every int16 input`, () => {
      const block = law.encodeBlock(ALL_INT16);
      for (let i = 0; i < 65536; i++) {
        const n = ALL_INT16[i];
        const want = referenceEncode(law.ref, n);
        if (block[i] !== want || law.fromLinear(n) !== want) {
          expect({ n, got: block[i], scalar: law.fromLinear(n) }).toEqual({ n, got: want, scalar: want });
        }
      }
    });
  }

  // Convention (ours, stated in g711.ts): a negative input exactly on a decision
  // value takes the neighbour of smaller magnitude; a positive one the larger.
  it('ties on decision values go toward +infinity', () => {
    // mu-law decision value 1 (14-bit) = 4 (16-bit): G.711 Table 2, from memory.
    expect(muLawToLinear(linearToMuLaw(4))).toBe(8);
    expect(muLawToLinear(linearToMuLaw(-4))).toBe(0);
    expect(muLawToLinear(linearToMuLaw(-5))).toBe(-8);
    // mu-law chord boundary at 31 (14-bit) = 124 (16-bit).
    expect(muLawSegment(linearToMuLaw(124))).toBe(1);
    expect(muLawSegment(linearToMuLaw(-124))).toBe(0);
    // A-law decision value 2 (13-bit) = 16 (16-bit), and 0 between the polarities.
    expect(aLawToLinear(linearToALaw(16))).toBe(24);
    expect(aLawToLinear(linearToALaw(-16))).toBe(-8);
    expect(aLawToLinear(linearToALaw(0))).toBe(8);
    expect(aLawToLinear(linearToALaw(-1))).toBe(-8);
  });

  it('scalar functions floor non-integers and clamp out-of-range inputs', () => {
    // (common practice, no source) floor keeps the decision values of the int16 scale.
    expect(linearToMuLaw(3.99)).toBe(linearToMuLaw(3));
    expect(linearToMuLaw(-4.01)).toBe(linearToMuLaw(-5));
    expect(linearToMuLaw(1e9)).toBe(0x80);
    expect(linearToMuLaw(-1e9)).toBe(0x00);
    expect(linearToALaw(1e9)).toBe(0xaa);
    expect(linearToALaw(-1e9)).toBe(0x2a);
  });

  // Landmark characters as above (G.711 Tables 1/2, from memory); the out-parameter is our API.
  it('block functions write into a given output and return it', () => {
    const out = new Uint8Array(4);
    expect(encodeALawBlock(Int16Array.of(0, -1, 32767, -32768), out)).toBe(out);
    expect(Array.from(out)).toEqual([0xd5, 0x55, 0xaa, 0x2a]);
    const lin = new Int16Array(2);
    expect(decodeMuLawBlock(Uint8Array.of(0x80, 0x00), lin)).toBe(lin);
    expect(Array.from(lin)).toEqual([32124, -32124]);
  });
});

describe('G.711 segments, overload and load capacity', () => {
  // Source: G.711 Tables 1/2 chord end points (from memory).
  it('segment end points', () => {
    expect(MU_LAW_SEGMENT_ENDS).toEqual([31, 95, 223, 479, 991, 2015, 4063, 8159]);
    expect(A_LAW_SEGMENT_ENDS).toEqual([32, 64, 128, 256, 512, 1024, 2048, 4096]);
    // The encoder changes chord exactly there (positive side, 16-bit units).
    for (let c = 0; c < 7; c++) {
      expect(muLawSegment(linearToMuLaw(MU_ENDS[c] * 4 - 1))).toBe(c);
      expect(muLawSegment(linearToMuLaw(MU_ENDS[c] * 4))).toBe(c + 1);
      expect(aLawSegment(linearToALaw(A_ENDS[c] * 8 - 1))).toBe(c);
      expect(aLawSegment(linearToALaw(A_ENDS[c] * 8))).toBe(c + 1);
    }
    // Chord of a character straight from its bits (G.711 Tables 1/2, from memory).
    for (let c = 0; c < 8; c++) {
      expect(muLawSegment(MU_REF.char(false, c, 9))).toBe(c);
      expect(aLawSegment(A_REF.char(true, c, 3))).toBe(c);
    }
  });

  // Source: G.711 (from memory): the mu-law range ends at 8159 (14-bit), A-law at 4096 (13-bit).
  it('overload points and quantizer segment edges', () => {
    expect(MU_LAW_OVERLOAD).toBe((8159 * 4) / 32768);
    expect(A_LAW_OVERLOAD).toBe(1);
    const mu = createG711MuQuantizer();
    const a = createG711AQuantizer();
    expect(Array.from(mu.segmentEdges)).toEqual([0, ...MU_ENDS].map((v) => (v * 4) / 32768));
    expect(Array.from(a.segmentEdges)).toEqual([0, ...A_ENDS].map((v) => (v * 8) / 32768));
    expect(mu.segmentEdges[8]).toBe(mu.overloadPoint);
    expect(a.segmentEdges[8]).toBe(a.overloadPoint);
  });

  // Source: G.711 theoretical load capacity (from memory): +3.17 dBm0 mu-law, +3.14 dBm0 A-law.
  it('load capacities', () => {
    expect(MU_LAW_LOAD_CAPACITY_DBM0).toBe(3.17);
    expect(A_LAW_LOAD_CAPACITY_DBM0).toBe(3.14);
    expect(createG711MuQuantizer().loadCapacityDbm0).toBe(3.17);
    expect(createG711AQuantizer().loadCapacityDbm0).toBe(3.14);
  });
});

describe('G.711 Tables 5/6: 0 dBm0 periodic sequences', () => {
  // Source: G.711 Tables 5 (A-law) and 6 (mu-law), from memory: one period of a
  // 1 kHz tone at 0 dBm0, 8 characters at 8000 samples/s, hex as sent on the line.
  const cases = [
    {
      law: 'mu',
      seq: [0x1e, 0x0b, 0x0b, 0x1e, 0x9e, 0x8b, 0x8b, 0x9e],
      decode: muLawToLinear,
      encode: (n: number) => linearToMuLaw(n),
      q: createG711MuQuantizer(),
    },
    {
      law: 'A',
      seq: [0x34, 0x21, 0x21, 0x34, 0xb4, 0xa1, 0xa1, 0xb4],
      decode: aLawToLinear,
      encode: linearToALaw,
      q: createG711AQuantizer(),
    },
  ];

  for (const { law, seq, decode, encode, q } of cases) {
    // dBm0 tied to load capacity: a sine with peak at the overload point sits at
    // +loadCapacity dBm0 (G.711 load capacity definition, from memory).
    const dbm0 = (power: number) =>
      10 * Math.log10(power / fullLoadSinePower(q.overloadPoint)) + q.loadCapacityDbm0;

    it(`${law}-law sequence decodes to a 1 kHz tone at 0 dBm0 within 0.03 dB`, () => {
      const x = seq.map((c) => decode(c) / 32768);
      // 1 kHz = bin 1 of the 8-point period at 8000 samples/s.
      let re = 0;
      let im = 0;
      for (let k = 0; k < 8; k++) {
        re += x[k] * Math.cos((2 * Math.PI * k) / 8);
        im -= x[k] * Math.sin((2 * Math.PI * k) / 8);
      }
      const fundamental = 2 * ((re / 8) ** 2 + (im / 8) ** 2);
      const total = x.reduce((s, v) => s + v * v, 0) / 8;
      expect(Math.abs(dbm0(fundamental))).toBeLessThan(0.03);
      expect(Math.abs(dbm0(total))).toBeLessThan(0.03);
      // Almost all of the power is the 1 kHz component; the rest is quantizing distortion,
      // far below the 35 dB of the G.712 mask (from memory).
      expect(10 * Math.log10((total - fundamental) / fundamental)).toBeLessThan(-30);
    });

    // The sequence's symmetry (a b b a -a -b -b -a) means samples at phases pi/8 + k*pi/4
    // (our inference from Tables 5/6); encoding such a 0 dBm0 sine must give it back.
    it(`${law}-law encoder reproduces the sequence from a 0 dBm0 sine`, () => {
      const peak = q.overloadPoint * 10 ** (-q.loadCapacityDbm0 / 20) * 32768;
      const got = Array.from({ length: 8 }, (_, k) =>
        encode(Math.round(peak * Math.sin(Math.PI / 8 + (k * Math.PI) / 4))),
      );
      // The table starts on the negative half; our sine starts positive: half a period apart.
      const want = seq.slice(4).concat(seq.slice(0, 4));
      expect(got).toEqual(want);
    });
  }
});

describe('G.711 section 3.2: mu-law all-zero suppression', () => {
  // Source: G.711 section 3.2 (from memory): negative inputs between decision values
  // 127 and 128 send 0x02 instead of 0x00; decoder output -7519 (14-bit), -30076 (16-bit).
  it('0x02 decodes to -7519 (14-bit), -30076 (16-bit)', () => {
    expect(MU_LAW_ZERO_SUPPRESSION_CODE).toBe(0x02);
    expect(muLawToLinear(0x02)).toBe(-30076);
    expect(muLawToLinear(0x02) / 4).toBe(-7519);
  });

  it('exactly the inputs that would send 0x00 send 0x02 instead', () => {
    // Decision value 127, mu-law 14-bit magnitude 7903 (G.711 Table 2, from memory).
    const d127 = 7903 * 4;
    const plain = encodeMuLawBlock(ALL_INT16);
    const zs = encodeMuLawBlock(ALL_INT16, undefined, true);
    let replaced = 0;
    const wrong: number[] = [];
    for (let i = 0; i < 65536; i++) {
      const n = ALL_INT16[i];
      const sendsZero = plain[i] === 0x00;
      if (sendsZero !== n < -d127) wrong.push(n);
      if (sendsZero) replaced++;
      const want = sendsZero ? 0x02 : plain[i];
      if (zs[i] !== want || linearToMuLaw(n, true) !== want) wrong.push(n);
    }
    expect(wrong).toEqual([]);
    expect(replaced).toBe(32768 - d127);
    // On decision value 127 itself: the tie rule gives the smaller magnitude, 0x01.
    expect(linearToMuLaw(-d127, true)).toBe(0x01);
    expect(linearToMuLaw(-d127 - 1, true)).toBe(0x02);
  });

  // Source: G.711 section 3.2 (from memory), on our float scale (int16 / 32768, DEVELOPERS.md
  // "Numbers and scales").
  it('the float quantizer with suppression never sends 0x00', () => {
    const q = createG711MuQuantizer({ zeroSuppression: true });
    expect(q.label).toBe('g711-mu,zs');
    expect(q.encode(-1)).toBe(0x02);
    expect(q.quantize(-1)).toBe(-30076 / 32768);
    expect(q.quantize(-0.99)).toBe(-30076 / 32768);
    expect(q.segmentOf(-1)).toBe(7);
    expect(q.quantize(1)).toBe(32124 / 32768);
  });
});

describe('G.711 float quantizers', () => {
  const quantizers: [string, Quantizer, (n: number) => number][] = [
    ['g711-mu', createG711MuQuantizer(), (n) => muLawToLinear(linearToMuLaw(n))],
    [
      'g711-mu,zs',
      createG711MuQuantizer({ zeroSuppression: true }),
      (n) => muLawToLinear(linearToMuLaw(n, true)),
    ],
    ['g711-a', createG711AQuantizer(), (n) => aLawToLinear(linearToALaw(n))],
  ];

  // Source: G.711 (from memory): 8-bit characters, 8 chords; overload points as above.
  it('declare kind, label, bits and segments', () => {
    const [mu, a] = [createG711MuQuantizer(), createG711AQuantizer()];
    expect([mu.kind, mu.label, mu.bits, mu.segmentCount, mu.overloadPoint]).toEqual([
      'g711-mu',
      'g711-mu',
      8,
      8,
      MU_LAW_OVERLOAD,
    ]);
    expect([a.kind, a.label, a.bits, a.segmentCount, a.overloadPoint]).toEqual(['g711-a', 'g711-a', 8, 8, 1]);
  });

  for (const [name, q, int16Path] of quantizers) {
    // Float <-> int16 by 32768 (our convention, DEVELOPERS.md "Numbers and scales"); the float
    // path must match the integer codec.
    it(`${name}: agrees with the int16 codec on every n / 32768`, () => {
      for (let n = -32768; n < 32768; n++) {
        const got = q.quantize(n / 32768);
        if (got !== int16Path(n) / 32768) expect({ n, got }).toEqual({ n, got: int16Path(n) / 32768 });
      }
    });

    // The Quantizer contract of core/quantizers/types.ts (common practice, no source).
    it(`${name}: encode, decode, segmentOf and quantizeSample are consistent`, () => {
      const seg = name === 'g711-a' ? aLawSegment : muLawSegment;
      for (const x of [-1.3, -0.7, -0.01, -1e-6, 0, 1e-6, 0.003, 0.25, 0.9, 1, 2]) {
        const code = q.encode(x);
        expect(q.decode(code)).toBe(q.quantize(x));
        expect(q.segmentOf(x)).toBe(seg(code));
        const s = q.quantizeSample(x);
        expect(s).toEqual({
          value: q.quantize(x),
          code,
          segment: seg(code),
          overload: Math.abs(x) > q.overloadPoint,
        });
      }
    });

    // Theory integrates over table(); it must be the partition quantize() uses
    // (QuantizerTable: level k covers [decisions[k-1], decisions[k])).
    it(`${name}: table() is what quantize() does`, () => {
      const { decisions, outputs } = q.table();
      expect(outputs.length).toBe(decisions.length + 1);
      for (let k = 1; k < decisions.length; k++) expect(decisions[k]).toBeGreaterThan(decisions[k - 1]);
      const eps = 2 ** -20; // below half a 16-bit step
      for (let k = 0; k < outputs.length; k++) {
        const lo = k === 0 ? -1.5 : decisions[k - 1];
        const hi = k === outputs.length - 1 ? 1.5 : decisions[k];
        for (const x of [lo, (lo + hi) / 2, hi - eps])
          expect(q.quantize(x), `level ${k} at ${x}`).toBe(outputs[k]);
      }
      // Outputs ascend everywhere except where suppression replaces the lowest level.
      for (let k = name === 'g711-mu,zs' ? 2 : 1; k < outputs.length; k++) {
        expect(outputs[k]).toBeGreaterThan(outputs[k - 1]);
      }
    });

    // Overload is |x| beyond the overload point (common practice, no source).
    it(`${name}: quantizeBlock fills outputs, codes, segments and counts overloads`, () => {
      const over = q.overloadPoint;
      const input = Float32Array.of(0, 0.1, -0.2, over, -over, 1.0001, -1.0001, 3, -3, 0.5);
      const expectedOver = Array.from(input).filter((x) => Math.abs(x) > over).length;
      const out = new Float32Array(input.length);
      const codes = new Uint8Array(input.length);
      const segs = new Uint8Array(input.length);
      expect(q.quantizeBlock(input, out, codes, segs)).toBe(expectedOver);
      for (let i = 0; i < input.length; i++) {
        expect(out[i]).toBe(Math.fround(q.quantize(input[i])));
        expect(codes[i]).toBe(q.encode(input[i]));
        expect(segs[i]).toBe(q.segmentOf(input[i]));
      }
      const out64 = new Float64Array(input.length);
      expect(q.quantizeBlock(input, out64)).toBe(expectedOver);
      expect(Array.from(out64)).toEqual(Array.from(input, (x) => q.quantize(x)));
    });

    // Block and scalar paths must agree everywhere, including between int16 steps.
    it(`${name}: quantizeBlock equals the scalar path on a dense grid`, () => {
      const grid = Float64Array.from({ length: 4 * 65536 + 64 }, (_, i) => (i / 4 - 32768 - 8) / 32768);
      const out = new Float64Array(grid.length);
      const codes = new Int32Array(grid.length);
      const plain = new Float64Array(grid.length);
      q.quantizeBlock(grid, out, codes);
      q.quantizeBlock(grid, plain); // the path without optional outputs
      const bad: number[] = [];
      for (let i = 0; i < grid.length; i++) {
        const want = q.quantize(grid[i]);
        if (out[i] !== want || plain[i] !== want || codes[i] !== q.encode(grid[i])) bad.push(grid[i]);
      }
      expect(bad).toEqual([]);
    });
  }

  // Our convention (g711.ts header): |x| > overloadPoint is an overload; the
  // point itself is not. (common practice, no source)
  it('counts overload strictly beyond the overload point', () => {
    const mu = createG711MuQuantizer();
    const a = createG711AQuantizer();
    const out = new Float64Array(4);
    expect(mu.quantizeBlock([MU_LAW_OVERLOAD, -MU_LAW_OVERLOAD, 0.99598, -0.99598], out)).toBe(2);
    expect(a.quantizeBlock([1, -1, 1 + 1e-9, -1 - 1e-9], out)).toBe(2);
  });

  // G.711 Tables 1/2 (from memory): mu-law has a zero output (+0 and -0), A-law does not;
  // the first mu-law decision value is 1 (14-bit) = 4 (16-bit).
  it('mu-law table lists +0/-0 as one zero level; A-law has none', () => {
    const mu = createG711MuQuantizer().table();
    const a = createG711AQuantizer().table();
    expect(mu.outputs.length).toBe(255);
    expect(a.outputs.length).toBe(256);
    expect(mu.outputs[127]).toBe(0);
    expect([mu.decisions[126], mu.decisions[127]]).toEqual([-4 / 32768, 4 / 32768]);
    expect(a.decisions[127]).toBe(0);
    expect(Array.from(a.outputs).includes(0)).toBe(false);
  });
});
