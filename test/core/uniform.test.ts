import { describe, expect, it } from 'vitest';
import { createQuantizer } from '../../core/quantizers/index';

describe('uniform quantizer', () => {
  it('uniform:16 mid-tread is exactly 16-bit PCM on the factor-32768 scale (common practice, no source)', () => {
    const q = createQuantizer('uniform:16');
    let wrong = 0;
    for (let n = -32768; n <= 32767; n++) {
      const x = n / 32768;
      if (q.quantize(x) !== x || q.encode(x) !== n + 32768) wrong++;
      // Anything within a third of a step rounds back to n.
      if (q.quantize((n + 0.3) / 32768) !== x || q.quantize((n - 0.3) / 32768) !== x) wrong++;
    }
    expect(wrong).toBe(0);
  });

  it('has 2^N levels with step 2V/2^N; mid-rise levels at (k + 1/2) steps (Jayant and Noll 1984, from memory)', () => {
    for (const bits of [2, 3, 8, 12]) {
      const rise = createQuantizer({ law: 'uniform', bits, form: 'rise' });
      const tread = createQuantizer({ law: 'uniform', bits, form: 'tread' });
      const L = 2 ** bits;
      const step = 2 / L;
      const tr = rise.table();
      expect(tr.outputs.length).toBe(L);
      expect(tr.outputs[0]).toBeCloseTo(-1 + step / 2, 15);
      expect(tr.outputs[L - 1]).toBeCloseTo(1 - step / 2, 15);
      expect(tr.decisions[L / 2 - 1]).toBe(0);
      const tt = tread.table();
      expect(tt.outputs[L / 2]).toBe(0);
      expect(tt.outputs[0]).toBeCloseTo(-1, 15);
      expect(tt.outputs[L - 1]).toBeCloseTo(1 - step, 15);
      expect(tt.decisions[L / 2 - 1]).toBeCloseTo(-step / 2, 15);
    }
  });

  it('clips and counts overloads beyond the overload point', () => {
    const q = createQuantizer('uniform:8:rise,ov=0.5');
    const input = Float64Array.from([0, 0.49, 0.5, 0.51, -0.51, 2, -3, 0.1]);
    const out = new Float64Array(input.length);
    expect(q.quantizeBlock(input, out)).toBe(4);
    expect(out[3]).toBe(out[2]);
    expect(out[5]).toBeCloseTo(0.5 - 1 / 512, 15);
    expect(out[6]).toBeCloseTo(-0.5 + 1 / 512, 15);
    expect(q.quantizeSample(0.6).overload).toBe(true);
    expect(q.quantizeSample(0.4).overload).toBe(false);
  });

  it('treats NaN as silence rather than producing a NaN code', () => {
    const q = createQuantizer('uniform:8');
    expect(q.quantize(Number.NaN)).toBe(0);
    expect(q.encode(Number.NaN)).toBe(q.encode(0));
  });

  it('segments are 6 dB bands counted down from the overload point', () => {
    const q = createQuantizer('uniform:12');
    expect(q.segmentCount).toBe(8);
    expect(Array.from(q.segmentEdges)).toEqual([0, 1 / 128, 1 / 64, 1 / 32, 1 / 16, 1 / 8, 1 / 4, 1 / 2, 1]);
    expect(q.segmentOf(0.75)).toBe(7);
    expect(q.segmentOf(0.3)).toBe(6);
    expect(q.segmentOf(0.001)).toBe(0);
    expect(q.segmentOf(-0.3)).toBe(6);
    const q10 = createQuantizer('uniform:12,seg=10');
    expect(q10.segmentCount).toBe(10);
    expect(q10.segmentEdges[1]).toBeCloseTo(2 ** -9, 15);
  });
});
