// SNR theory checked against outside facts: the handbook formulas and the step^2/12 law
// of fine uniform quantization.
import { describe, expect, it } from 'vitest';
import { createQuantizer } from '../../core/quantizers/index';
import { SineDensity } from '../../core/theory/densities';
import {
  aLawAsymptoteDb,
  bennettGranularNoise,
  lawSnrAt,
  lawSnrCurve,
  muLawAsymptoteDb,
  uniformFullLoadSineDb,
} from '../../core/theory/law-curves';
import { TableTheory, theoryOf } from '../../core/theory/snr-curves';
import { rmsFromDbov } from '../../core/units/levels';
import { densityOf } from '../../core/theory/densities';

const FULL_LOAD_SINE_DBOV = -10 * Math.log10(2);
const BITS = [8, 9, 10, 11, 12, 13, 14, 15, 16];

describe('levels', () => {
  it('puts a full-load sine at -3.01 dBov', () => {
    // A sine whose peak is the overload point is -3.01 dBov (DEVELOPERS.md "Numbers and scales";
    // common practice, no source).
    const q = createQuantizer({ law: 'uniform', bits: 8, form: 'rise' });
    expect(theoryOf(q).evaluate(new SineDensity(q.overloadPoint)).levelDbov).toBeCloseTo(-3.01, 2);
  });
});

describe('exact table theory: uniform quantizer, full-load sine', () => {
  it('gives 6.02 N + 1.76 dB within 0.2 dB for N = 8..16 (mid-rise, peak at the overload point)', () => {
    // Jayant and Noll, Digital Coding of Waveforms (1984): uniform quantizer, full-load sine,
    // SNR = 6.02 N + 1.76 dB (from memory).
    for (const n of BITS) {
      const th = theoryOf(createQuantizer({ law: 'uniform', bits: n, form: 'rise' }));
      expect(th.symmetric).toBe(true);
      const p = th.at('sine', FULL_LOAD_SINE_DBOV);
      expect(Math.abs(p.snrDb - (6.02 * n + 1.76)), `N=${n}: ${p.snrDb}`).toBeLessThan(0.2);
      expect(p.overloadNoise).toBe(0);
    }
  });

  it("gives 6.02 N + 1.76 dB within 0.2 dB for two's complement mid-tread at digital full scale", () => {
    // Jayant and Noll (1984), 6.02 N + 1.76 dB (from memory). A digital full-scale sine peaks at the
    // largest code, V - step (for 16 bits: 32767), as is usual for PCM (common practice, no source).
    for (const n of BITS) {
      const q = createQuantizer({ law: 'uniform', bits: n, form: 'tread' });
      const th = theoryOf(q);
      expect(th.symmetric).toBe(false);
      const step = 2 / 2 ** n;
      const p = th.evaluate(new SineDensity(1 - step));
      expect(Math.abs(p.snrDb - (6.02 * n + 1.76)), `N=${n}: ${p.snrDb}`).toBeLessThan(0.2);
    }
  });
});

describe('fine uniform quantization of Gaussian input', () => {
  it('exact table theory: granular noise is step^2/12 when sigma exceeds the step', () => {
    // B. Widrow, "A study of rough amplitude quantization by means of Nyquist sampling theory",
    // IRE Trans. Circuit Theory, 1956 (from memory): for Gaussian input the error power departs
    // from step^2/12 only by terms of order exp(-2 pi^2 sigma^2 / step^2), below 1e-13 here.
    for (const n of [8, 12, 16]) {
      for (const form of ['rise', 'tread'] as const) {
        const th = theoryOf(createQuantizer({ law: 'uniform', bits: n, form }));
        const step = 2 / 2 ** n;
        for (const level of [-40, -30, -20]) {
          const p = th.at('gaussian', level);
          const rel = p.granularNoise / ((step * step) / 12) - 1;
          expect(Math.abs(rel), `N=${n} ${form} ${level} dBov`).toBeLessThan(1e-6);
          expect(p.overloadNoise).toBeLessThan(1e-20);
        }
      }
    }
  });

  it('splits fine-quantizer noise into step^2/12 inside the range and clipping noise outside', () => {
    // Past the overload point a fine quantizer outputs about V, so its overload noise is the
    // clipping noise E[(|x| - V)^2; |x| > V], and granular noise is step^2/12 times P(|x| < V)
    // (Jayant and Noll 1984, from memory; for the Gaussian, P(|x| < V) from the 68-95 rule's erf).
    const step = 2 / 2 ** 16;
    for (const form of ['rise', 'tread'] as const) {
      const th = theoryOf(createQuantizer({ law: 'uniform', bits: 16, form }));
      // sigma = V/2: P(|x| < V) = 0.954499736103642 (common practice, no source).
      const d = densityOf('gaussian', 0.5);
      const p = th.evaluate(d);
      const clip = lawSnrAt({ law: 'uniform', bits: 16, form }, 'gaussian', p.levelDbov).overloadNoise;
      expect(Math.abs(p.overloadNoise / clip - 1), form).toBeLessThan(1e-3);
      expect(Math.abs(p.granularNoise / (((step * step) / 12) * 0.954499736103642) - 1), form).toBeLessThan(
        1e-3,
      );
    }
  });

  it('counts as overload whatever lies beyond a declared overload point, even inside the cells', () => {
    // A table quantizer may declare its overload point inside its range (our convention,
    // DEVELOPERS.md: overload point 1.0 unless set with ov=). Fine cells keep step^2/12 on both
    // sides (Widrow 1956, from memory), so the split follows P(|x| < V) for sigma = V:
    // 0.682689492137086 (common practice, no source).
    const step = 2 / 2 ** 16;
    const k = (step * step) / 12;
    for (const form of ['rise', 'tread'] as const) {
      // V = 0.05 and sigma = V: the quantizer's own range (+-1) is 20 sigma away.
      const th = new TableTheory(createQuantizer({ law: 'uniform', bits: 16, form }).table(), 0.05);
      const p = th.at('gaussian', 0);
      // The one cell cut at each of +-V departs from step^2/12 by itself: 1e-4 of the total here.
      expect(Math.abs(p.granularNoise / (k * 0.682689492137086) - 1), form).toBeLessThan(1e-3);
      expect(Math.abs(p.overloadNoise / (k * (1 - 0.682689492137086)) - 1), form).toBeLessThan(1e-3);
    }
  });

  it('Bennett integral of the uniform quantizer equals step^2/12 in the granular region', () => {
    // Bennett's integral with c'(x) = 1 is step^2/12 times P(|x| < V) (common practice, no source).
    for (const n of [4, 8, 16]) {
      const step = 2 / 2 ** n;
      for (const level of [-60, -40, -20]) {
        const d = densityOf('gaussian', rmsFromDbov(level, 1));
        const g = bennettGranularNoise({ law: 'uniform', bits: n, form: 'rise' }, d, 1);
        expect(Math.abs(g / ((step * step) / 12) - 1)).toBeLessThan(1e-12);
      }
    }
  });
});

describe('continuous-law theory', () => {
  it('approaches the handbook large-signal asymptotes for a full-load sine', () => {
    // Jayant and Noll (1984), from memory: mu-law 6.02 N + 4.77 - 20 log10(ln(1 + mu)),
    // A-law 6.02 N + 4.77 - 20 log10(1 + ln A), uniform 6.02 N + 1.76 dB.
    for (const n of BITS) {
      const mu = lawSnrAt({ law: 'mu', mu: 255, bits: n }, 'sine', FULL_LOAD_SINE_DBOV).snrDb;
      const a = lawSnrAt({ law: 'a', a: 87.6, bits: n }, 'sine', FULL_LOAD_SINE_DBOV).snrDb;
      const u = lawSnrAt({ law: 'uniform', bits: n, form: 'rise' }, 'sine', FULL_LOAD_SINE_DBOV).snrDb;
      expect(Math.abs(mu - (6.02 * n + 4.77 - 20 * Math.log10(Math.log(256))))).toBeLessThan(0.1);
      expect(Math.abs(a - (6.02 * n + 4.77 - 20 * Math.log10(1 + Math.log(87.6))))).toBeLessThan(0.1);
      expect(Math.abs(u - (6.02 * n + 1.76))).toBeLessThan(0.1);
      // The exact-constant asymptote functions agree with the printed two-decimal forms.
      expect(
        Math.abs(muLawAsymptoteDb(n, 255) - (6.02 * n + 4.77 - 20 * Math.log10(Math.log(256)))),
      ).toBeLessThan(0.06);
      expect(
        Math.abs(aLawAsymptoteDb(n, 87.6) - (6.02 * n + 4.77 - 20 * Math.log10(1 + Math.log(87.6)))),
      ).toBeLessThan(0.06);
      expect(Math.abs(uniformFullLoadSineDb(n) - (6.02 * n + 1.76))).toBeLessThan(0.06);
    }
  });

  it('mu = 0 and A = 1 are the uniform quantizer', () => {
    // mu-law with mu -> 0 and A-law with A = 1 reduce to the identity compressor
    // (common practice, no source).
    for (const level of [-50, -20, -3]) {
      const u = lawSnrAt({ law: 'uniform', bits: 8, form: 'rise' }, 'laplacian', level).snrDb;
      expect(lawSnrAt({ law: 'mu', mu: 0, bits: 8 }, 'laplacian', level).snrDb).toBeCloseTo(u, 10);
      expect(lawSnrAt({ law: 'mu', mu: 1e-9, bits: 8 }, 'laplacian', level).snrDb).toBeCloseTo(u, 6);
      expect(lawSnrAt({ law: 'a', a: 1, bits: 8 }, 'laplacian', level).snrDb).toBeCloseTo(u, 10);
    }
  });

  it('agrees with the exact table theory of 12-bit mu-law and A-law between -40 and -10 dBov', () => {
    // Bennett's high-resolution approximation holds when cells are small against the signal
    // (common practice, no source). Noise inputs agree to hundredths of a dB; a sine's
    // arcsine density piles up at its peaks, so where the peak falls within a cell matters more.
    const levels = [-40, -35, -30, -25, -20, -15, -10];
    for (const stage of [
      { law: 'mu', mu: 255, bits: 12 },
      { law: 'a', a: 87.6, bits: 12 },
    ] as const) {
      const th = theoryOf(createQuantizer(stage));
      for (const shape of ['gaussian', 'laplacian', 'sine'] as const) {
        const exact = th.curve(shape, levels);
        const bennett = lawSnrCurve(stage, shape, levels);
        const tol = shape === 'sine' ? 0.3 : 0.1;
        for (let i = 0; i < levels.length; i++) {
          const d = exact.snrDb[i] - bennett.snrDb[i];
          expect(Math.abs(d), `${stage.law} ${shape} ${levels[i]} dBov: ${d}`).toBeLessThan(tol);
        }
      }
    }
  });
});

describe('G.711 exact theory', () => {
  it('all-zero suppression changes only what happens beyond the most negative decision value', () => {
    // G.711 section 3.2: suppression replaces the all-zero character, the most negative level
    // (from memory). So the two channels differ only when the input reaches that level.
    const plain = theoryOf(createQuantizer('g711-mu'));
    const zs = new TableTheory(
      createQuantizer({ law: 'g711-mu', zeroSuppression: true }).table(),
      plain.overloadPoint,
    );
    expect(zs.symmetric).toBe(false);
    for (const level of [-50, -40, -30]) {
      expect(zs.at('laplacian', level).snrDb).toBeCloseTo(plain.at('laplacian', level).snrDb, 9);
    }
    expect(zs.at('gaussian', -3).snrDb).toBeLessThan(plain.at('gaussian', -3).snrDb - 0.01);
  });
});

describe('speed', () => {
  it('integrates a 65536-level table at 60 levels quickly, and agrees with Bennett there', () => {
    // Bennett's integral is near exact for 16-bit mu-law below overload (common practice, no source).
    const levels = Array.from({ length: 60 }, (_, i) => -70 + i);
    const stage = { law: 'mu', mu: 255, bits: 16 } as const;
    const th = theoryOf(createQuantizer(stage));
    const t0 = performance.now();
    const exact = th.curve('gaussian', levels);
    const ms = performance.now() - t0;
    const bennett = lawSnrCurve(stage, 'gaussian', levels);
    for (let i = 0; i < levels.length; i++) {
      if (levels[i] <= -15) expect(Math.abs(exact.snrDb[i] - bennett.snrDb[i])).toBeLessThan(0.01);
    }
    // Generous bound: about 0.15 s here; it catches an accidental per-level cost of O(L^2).
    expect(ms).toBeLessThan(5000);
  });
});
