import { describe, expect, it } from 'vitest';
import { createQuantizer, segmentEdgesDbov } from '../../core/quantizers/index';
import { dbm0FromDbov, dbovFromDbm0, dbovFromRms, sineAmplitudeForDbm0 } from '../../core/units/levels';

describe('level scales', () => {
  it('a full-scale sine is -3.01 dBov and a square wave at the overload point 0 dBov (our definition of dBov, DEVELOPERS.md "Numbers and scales")', () => {
    expect(dbovFromRms(1 / Math.SQRT2, 1)).toBeCloseTo(-3.0103, 4);
    expect(dbovFromRms(0.5, 0.5)).toBe(0);
  });

  it('0 dBm0 is about -6.2 dBov for both G.711 laws (common practice, no source)', () => {
    for (const law of ['g711-mu', 'g711-a']) {
      const q = createQuantizer(law);
      expect(Math.abs(dbovFromDbm0(0, q.loadCapacityDbm0) + 6.2)).toBeLessThan(0.1);
      expect(dbm0FromDbov(dbovFromDbm0(-17.5, q.loadCapacityDbm0), q.loadCapacityDbm0)).toBeCloseTo(
        -17.5,
        12,
      );
    }
  });

  it('a sine at the load capacity has its peak at the overload point (G.711 section 5 definition)', () => {
    const q = createQuantizer('g711-mu');
    expect(sineAmplitudeForDbm0(3.17, q.overloadPoint, q.loadCapacityDbm0)).toBeCloseTo(q.overloadPoint, 12);
    expect(sineAmplitudeForDbm0(3.17 - 20, q.overloadPoint, q.loadCapacityDbm0)).toBeCloseTo(
      q.overloadPoint / 10,
      12,
    );
  });

  it('other quantizers default to overload 1.0 and +3.14 dBm0, and accept their own', () => {
    const u = createQuantizer('uniform:12');
    expect(u.overloadPoint).toBe(1);
    expect(u.loadCapacityDbm0).toBe(3.14);
    const m = createQuantizer('mu:255:8,ov=0.5,lc=3.17');
    expect(m.overloadPoint).toBe(0.5);
    expect(m.loadCapacityDbm0).toBe(3.17);
  });
});

describe('segment ledgers line up across channels', () => {
  it('uniform 6 dB bands coincide with the A-law chords (ITU-T G.711 A-law segment end points, from memory)', () => {
    const u = segmentEdgesDbov(createQuantizer('uniform:12'));
    const a = segmentEdgesDbov(createQuantizer('g711-a'));
    for (let s = 1; s <= 8; s++) expect(u[s]).toBeCloseTo(a[s], 9);
    expect(a[8]).toBe(0);
    expect(a[7]).toBeCloseTo(-6.0206, 3);
  });

  it('and the top four mu-law chord edges within 0.3 dB (the mu-law chords end at 2^(k+6) - 33, G.711, from memory)', () => {
    const u = segmentEdgesDbov(createQuantizer('uniform:12,ov=0.99597'));
    const m = segmentEdgesDbov(createQuantizer('g711-mu'));
    for (let s = 5; s <= 8; s++) expect(Math.abs(u[s] - m[s])).toBeLessThan(0.3);
    expect(m[0]).toBe(-Infinity);
  });
});
