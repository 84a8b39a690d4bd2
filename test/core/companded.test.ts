import { describe, expect, it } from 'vitest';
import { aExpand, muExpand } from '../../core/laws/index';
import { createQuantizer } from '../../core/quantizers/index';

describe('companded quantizer', () => {
  it('levels are the expanded uniform grid of the compressed domain (compander definition, Jayant and Noll 1984, from memory)', () => {
    const q = createQuantizer('mu:255:8');
    const t = q.table();
    expect(t.outputs.length).toBe(256);
    for (let m = 0; m < 128; m++) {
      expect(t.outputs[128 + m]).toBeCloseTo(muExpand((m + 0.5) / 128, 255), 14);
      expect(t.outputs[127 - m]).toBeCloseTo(-muExpand((m + 0.5) / 128, 255), 14);
    }
    for (let m = 1; m < 128; m++) expect(t.decisions[127 + m]).toBeCloseTo(muExpand(m / 128, 255), 14);
    const qa = createQuantizer('a:87.6:8');
    expect(qa.table().outputs[255]).toBeCloseTo(aExpand(127.5 / 128, 87.6), 14);
  });

  it('mu = 0 and A = 1 reduce to the mid-rise uniform quantizer', () => {
    const u = createQuantizer('uniform:6:rise');
    const m0 = createQuantizer('mu:0:6');
    const a1 = createQuantizer('a:1:6');
    for (let i = -1100; i <= 1100; i++) {
      const x = i / 1000 + 1e-7;
      expect(m0.quantize(x)).toBeCloseTo(u.quantize(x), 14);
      expect(a1.quantize(x)).toBeCloseTo(u.quantize(x), 14);
    }
  });

  it('encode agrees with its own decision table at and around every decision value', () => {
    for (const text of ['mu:255:8', 'a:87.6:8', 'mu:100:7', 'a:87.6:12', 'mu:255:8,ov=0.25']) {
      const q = createQuantizer(text);
      const { decisions } = q.table();
      let wrong = 0;
      for (let c = 1; c <= decisions.length; c++) {
        const t = decisions[c - 1];
        const above = t > 0 || t === 0 ? c : c - 1; // ties go away from zero
        if (q.encode(t) !== above) wrong++;
        if (q.encode(t + Math.abs(t) * 1e-12 + 1e-300) !== c) wrong++;
        if (q.encode(t - Math.abs(t) * 1e-12 - 1e-300) !== c - 1) wrong++;
      }
      expect(wrong, text).toBe(0);
    }
  });

  it('clips beyond the overload point and counts it', () => {
    const q = createQuantizer('a:87.6:8,ov=0.5');
    const out = new Float32Array(4);
    expect(q.quantizeBlock([0.49, 0.51, -0.7, 0], out)).toBe(2);
    expect(out[1]).toBe(Math.fround(q.table().outputs[255]));
    expect(out[2]).toBe(Math.fround(q.table().outputs[0]));
  });

  it('segments are equal bands of the compressed domain', () => {
    const q = createQuantizer('mu:255:8');
    expect(q.segmentCount).toBe(8);
    for (let s = 1; s < 8; s++) expect(q.segmentEdges[s]).toBeCloseTo(muExpand(s / 8, 255), 14);
    expect(q.segmentOf(0.9)).toBe(7);
    expect(q.segmentOf(-0.9)).toBe(7);
    expect(q.segmentOf(1e-5)).toBe(0);
    const q16 = createQuantizer('a:87.6:8,seg=16');
    expect(q16.segmentCount).toBe(16);
    expect(q16.segmentOf(aExpand(0.5 + 1e-9, 87.6))).toBe(8);
  });
});
