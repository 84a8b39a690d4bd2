import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { aCompress, aExpand, muCompress, muExpand } from '../../core/laws/index';

describe('continuous mu-law and A-law characteristics', () => {
  const unit = fc.double({ min: -1, max: 1, noNaN: true });

  it('expand(compress(x)) == x within 1e-12 for any mu >= 0 (required by the quantizer core)', () => {
    fc.assert(
      fc.property(unit, fc.double({ min: 0, max: 1e6, noNaN: true }), (x, mu) => {
        expect(Math.abs(muExpand(muCompress(x, mu), mu) - x)).toBeLessThanOrEqual(1e-12);
      }),
      { numRuns: 5000 },
    );
  });

  it('expand(compress(x)) == x within 1e-12 for any A >= 1', () => {
    fc.assert(
      fc.property(unit, fc.double({ min: 1, max: 1e6, noNaN: true }), (x, a) => {
        expect(Math.abs(aExpand(aCompress(x, a), a) - x)).toBeLessThanOrEqual(1e-12);
      }),
      { numRuns: 5000 },
    );
  });

  it('mu = 0 and A = 1 are the identity (limits of the defining formulas, Jayant and Noll 1984, from memory)', () => {
    for (const x of [-1, -0.5, -1e-9, 0, 1e-9, 0.25, 0.999, 1]) {
      expect(muCompress(x, 0)).toBe(x);
      expect(muExpand(x, 0)).toBe(x);
      expect(aCompress(x, 1)).toBeCloseTo(x, 15);
      expect(aExpand(x, 1)).toBeCloseTo(x, 15);
    }
    // A tiny mu tends to the identity continuously.
    expect(muCompress(0.3, 1e-12)).toBeCloseTo(0.3, 9);
  });

  it('maps the end points and is odd', () => {
    for (const mu of [1, 100, 255, 1e4]) {
      expect(muCompress(1, mu)).toBeCloseTo(1, 14);
      expect(muCompress(-0.37, mu)).toBe(-muCompress(0.37, mu));
    }
    for (const a of [1.5, 87.6, 1000]) {
      expect(aCompress(1, a)).toBeCloseTo(1, 14);
      expect(aCompress(-0.37, a)).toBe(-aCompress(0.37, a));
    }
  });

  it('A-law is linear below 1/A and continuous there (the A-law definition, Jayant and Noll 1984, from memory)', () => {
    const a = 87.6;
    const k = 1 + Math.log(a);
    expect(aCompress(0.5 / a, a)).toBeCloseTo(0.5 / k, 14);
    expect(aCompress(1 / a - 1e-12, a)).toBeCloseTo(aCompress(1 / a, a), 9);
  });

  it('G.711 chord end points lie on the continuous curves they approximate (ITU-T G.711 segment tables, from memory)', () => {
    // mu-law: chord k ends at 2^(k+6) - 33 of 8159 and the 8 chords split the compressed range evenly.
    for (let k = 0; k < 8; k++) {
      const x = (2 ** (k + 6) - 33) / 8159;
      expect(Math.abs(muCompress(x, 255) - (k + 1) / 8)).toBeLessThan(3e-3);
    }
    // A-law: chords end at 2^-k of full scale; the segment approximation of A = 87.6 stays within 0.012.
    for (let k = 0; k < 7; k++) {
      expect(Math.abs(aCompress(2 ** -k, 87.6) - (8 - k) / 8)).toBeLessThan(0.012);
    }
  });
});
