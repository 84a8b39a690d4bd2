import { describe, expect, it } from 'vitest';
import { createQuantizer } from '../../core/quantizers/index';

describe('quantizer from explicit tables', () => {
  it('fed the uniform quantizer tables, quantizes exactly as the uniform quantizer does', () => {
    for (const text of ['uniform:5:rise', 'uniform:5', 'mu:255:6']) {
      const ref = createQuantizer(text);
      const { decisions, outputs } = ref.table();
      const t = createQuantizer({
        law: 'table',
        decisions: Array.from(decisions),
        outputs: Array.from(outputs),
      });
      let wrong = 0;
      for (let i = -3000; i <= 3000; i++) {
        const x = i / 2500;
        if (t.quantize(x) !== ref.quantize(x) || t.encode(x) !== ref.encode(x)) wrong++;
      }
      for (const d of decisions) if (t.encode(d) !== ref.encode(d)) wrong++;
      expect(wrong, text).toBe(0);
    }
  });

  it('uses a small Gaussian-designed table as given (J. Max 1960 2-bit values, from memory)', () => {
    const q = createQuantizer('table:max2:-0.9816/0/0.9816:-1.51/-0.4528/0.4528/1.51,ov=2');
    expect(q.bits).toBe(2);
    expect(q.quantize(0.2)).toBe(0.4528);
    expect(q.quantize(-0.2)).toBe(-0.4528);
    expect(q.quantize(1.2)).toBe(1.51);
    expect(q.quantize(-5)).toBe(-1.51);
    expect(q.encode(0)).toBe(2);
    expect(q.encode(-0.9816)).toBe(0); // tie goes away from zero
    expect(q.encode(0.9816)).toBe(3);
  });

  it('refuses tables it cannot use, naming the bad entry', () => {
    const make = (decisions: number[], outputs: number[]) => () =>
      createQuantizer({ law: 'table', decisions, outputs });
    expect(make([0], [1])).toThrow(/2 to 65536 output values/);
    expect(make([0, 1], [-1, 1])).toThrow(/one decision value fewer/);
    expect(make([0.5, 0.2], [0, 0.6, 1])).toThrow(/decision 2 does not ascend/);
    expect(make([0], [0.1, 1])).toThrow(/outside its cell/);
    expect(make([Number.NaN], [-1, 1])).toThrow(/decision 1 is not a finite number/);
    expect(make([0], [-1, Infinity])).toThrow(/output 2 is not a finite number/);
  });
});
