// Property tests (fast-check) for the G.711 codecs and float quantizers.
// Properties of any symmetric scalar quantizer (common practice, no source),
// with G.711's decision values from Tables 1/2 (from memory) where a property
// must exclude them.
import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  aLawToLinear,
  createG711AQuantizer,
  createG711MuQuantizer,
  linearToALaw,
  linearToMuLaw,
  muLawToLinear,
} from '../../core/quantizers/g711';
import { A_REF, MU_REF, type LawReference } from './g711-reference';

const laws: { name: string; ref: LawReference; roundTrip: (n: number) => number }[] = [
  { name: 'mu-law', ref: MU_REF, roundTrip: (n) => muLawToLinear(linearToMuLaw(n)) },
  { name: 'A-law', ref: A_REF, roundTrip: (n) => aLawToLinear(linearToALaw(n)) },
];

const int16 = fc.integer({ min: -32768, max: 32767 });

describe('int16 codecs', () => {
  for (const { name, ref, roundTrip } of laws) {
    // Odd symmetry holds on -32767..32767 except where |n| is a decision value
    // (those go toward +infinity, so -d and d land on different magnitudes);
    // for A-law this includes n = 0, the decision value between the polarities.
    const decisions = new Set(ref.decisions16);
    if (ref.name === 'a') decisions.add(0);
    const offDecision = fc.integer({ min: -32767, max: 32767 }).filter((n) => !decisions.has(Math.abs(n)));

    it(`${name}: odd symmetry off the decision values`, () => {
      fc.assert(
        fc.property(offDecision, (n) => roundTrip(-n) === -roundTrip(n)),
        { numRuns: 5000 },
      );
      // On a decision value the tie rule breaks symmetry by exactly one level.
      const d = ref.decisions16[40];
      expect(roundTrip(-d)).toBeGreaterThan(-roundTrip(d));
    });

    it(`${name}: decode(encode(x)) is non-decreasing in x`, () => {
      fc.assert(
        fc.property(int16, int16, (a, b) => {
          const [lo, hi] = a <= b ? [a, b] : [b, a];
          return roundTrip(lo) <= roundTrip(hi);
        }),
        { numRuns: 5000 },
      );
      let prev = -Infinity;
      for (let n = -32768; n < 32768; n++) {
        const v = roundTrip(n);
        if (v < prev) expect({ n, v }).toEqual({ n, v: prev });
        prev = v;
      }
    });

    it(`${name}: decode(encode(decode(c))) == decode(c) for every code`, () => {
      const decode = ref.name === 'mu' ? muLawToLinear : aLawToLinear;
      const encode = ref.name === 'mu' ? linearToMuLaw : linearToALaw;
      fc.assert(
        fc.property(fc.integer({ min: 0, max: 255 }), (c) => decode(encode(decode(c))) === decode(c)),
      );
      for (let c = 0; c < 256; c++) expect(decode(encode(decode(c)))).toBe(decode(c));
    });
  }

  // With all-zero suppression the mu-law quantizer is not monotone: below
  // decision value 127 (-7903, 14-bit) it sends 0x02 (-7519) instead of 0x00
  // (-8031); G.711 section 3.2 (from memory). Exactly one descent, there.
  it('mu-law with suppression: one descent, at decision value 127', () => {
    const descents: number[] = [];
    let prev = -Infinity;
    for (let n = -32768; n < 32768; n++) {
      const v = muLawToLinear(linearToMuLaw(n, true));
      if (v < prev) descents.push(n);
      prev = v;
    }
    expect(descents).toEqual([-7903 * 4]);
    // And decode(encode(decode(c))) fails only for 0x00, which is never sent.
    const bad: number[] = [];
    for (let c = 0; c < 256; c++)
      if (muLawToLinear(linearToMuLaw(muLawToLinear(c), true)) !== muLawToLinear(c)) bad.push(c);
    expect(bad).toEqual([0x00]);
  });
});

describe('float quantizers', () => {
  const quantizers = [
    { q: createG711MuQuantizer(), ref: MU_REF },
    { q: createG711MuQuantizer({ zeroSuppression: true }), ref: MU_REF },
    { q: createG711AQuantizer(), ref: A_REF },
  ];
  const anyDouble = fc.double({ noNaN: true });
  const nearRange = fc.double({ min: -1.2, max: 1.2, noNaN: true });

  for (const { q, ref } of quantizers) {
    it(`${q.label}: idempotent, quantize(quantize(x)) == quantize(x)`, () => {
      fc.assert(
        fc.property(anyDouble, (x) => q.quantize(q.quantize(x)) === q.quantize(x)),
        { numRuns: 3000 },
      );
      fc.assert(
        fc.property(nearRange, (x) => q.quantize(q.quantize(x)) === q.quantize(x)),
        { numRuns: 3000 },
      );
    });

    if (!q.label.endsWith(',zs')) {
      // Domain: every finite x except exact decision values (d / 32768, and 0 for A-law).
      const decisions = new Set(ref.decisions16.map((d) => d / 32768));
      if (ref.name === 'a') decisions.add(0);
      const off = fc.oneof(anyDouble, nearRange).filter((x) => !decisions.has(Math.abs(x)));

      it(`${q.label}: odd symmetry off the decision values`, () => {
        fc.assert(
          fc.property(off, (x) => q.quantize(-x) === -q.quantize(x)),
          { numRuns: 5000 },
        );
      });

      it(`${q.label}: monotone`, () => {
        fc.assert(
          fc.property(nearRange, nearRange, (a, b) => {
            const [lo, hi] = a <= b ? [a, b] : [b, a];
            return q.quantize(lo) <= q.quantize(hi);
          }),
          { numRuns: 5000 },
        );
      });
    }

    it(`${q.label}: decode(encode(decode(c))) == decode(c) for codes it sends`, () => {
      fc.assert(
        fc.property(nearRange, (x) => {
          const c = q.encode(x);
          return q.decode(q.encode(q.decode(c))) === q.decode(c);
        }),
        { numRuns: 3000 },
      );
    });
  }
});
