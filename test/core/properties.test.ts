// Properties every scalar quantizer must have (definition of a quantizer as a
// monotone staircase; Jayant and Noll 1984, from memory), checked with fast-check.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createQuantizer } from '../../core/quantizers/index';

const CONFIGS = [
  'uniform:2',
  'uniform:8:rise',
  'uniform:13',
  'mu:255:8',
  'mu:100:7',
  'mu:5:4,ov=0.7',
  'a:87.6:8',
  'a:1000:10',
  'table:-0.9816/0/0.9816:-1.51/-0.4528/0.4528/1.51,ov=2',
];

describe.each(CONFIGS)('%s', (text) => {
  const q = createQuantizer(text);
  const wide = fc.double({ min: -2.5 * q.overloadPoint, max: 2.5 * q.overloadPoint, noNaN: true });
  // Mid-tread two's complement keeps one extra negative level, so symmetry holds inside the range.
  const step = q.kind === 'uniform' ? (2 * q.overloadPoint) / 2 ** q.bits : 0;
  const symmetricRange = q.kind === 'uniform' && !text.includes('rise') ? q.overloadPoint - step : Infinity;

  // Where 0 itself is a decision value (mid-rise), 0 goes to the positive level: the one exception.
  const zeroIsDecision = q.table().decisions.includes(0);

  it('is odd-symmetric', () => {
    fc.assert(
      fc.property(wide, (x) => {
        if (Math.abs(x) >= symmetricRange || (x === 0 && zeroIsDecision)) return;
        expect(q.quantize(-x)).toBe(-q.quantize(x) + 0); // +0 folds -0
      }),
      { numRuns: 3000 },
    );
  });

  it('is monotone', () => {
    fc.assert(
      fc.property(wide, wide, (a, b) => {
        const [lo, hi] = a <= b ? [a, b] : [b, a];
        expect(q.quantize(lo)).toBeLessThanOrEqual(q.quantize(hi));
      }),
      { numRuns: 3000 },
    );
  });

  it('decode(encode(decode(c))) == decode(c) for every code', () => {
    const codes = q.table().outputs.length;
    let wrong = 0;
    for (let c = 0; c < codes; c++) if (q.decode(q.encode(q.decode(c))) !== q.decode(c)) wrong++;
    expect(wrong).toBe(0);
  });

  it('is idempotent', () => {
    fc.assert(
      fc.property(wide, (x) => {
        const y = q.quantize(x);
        expect(q.quantize(y)).toBe(y);
      }),
      { numRuns: 3000 },
    );
  });

  it('block, sample and scalar paths agree', () => {
    fc.assert(
      fc.property(fc.array(wide, { minLength: 1, maxLength: 64 }), (xs) => {
        const out = new Float64Array(xs.length);
        const codes = new Int32Array(xs.length);
        const segs = new Uint8Array(xs.length);
        const overloads = q.quantizeBlock(xs, out, codes, segs);
        let expectOverloads = 0;
        xs.forEach((x, i) => {
          const s = q.quantizeSample(x);
          expect(out[i]).toBe(s.value);
          expect(codes[i]).toBe(s.code);
          expect(segs[i]).toBe(s.segment);
          expect(s.value).toBe(q.quantize(x));
          expect(s.segment).toBe(q.segmentOf(x));
          expect(s.segment).toBeLessThan(q.segmentCount);
          if (s.overload) expectOverloads++;
        });
        expect(overloads).toBe(expectOverloads);
      }),
      { numRuns: 300 },
    );
  });
});
