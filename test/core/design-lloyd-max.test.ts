// Lloyd-Max quantizers checked against J. Max, "Quantizing for minimum distortion" (1960),
// closed-form facts of the Laplacian, and measurement on seeded noise.
import { describe, expect, it } from 'vitest';
import {
  dbovHistogramOf,
  densityFromDbov,
  densityFromMagnitudes,
  densityFromValues,
  designLloydMax,
  designPanterDite,
  gaussianDesignDensity,
  inverseNormalTail,
  laplacianDesignDensity,
} from '../../core/design/index';
import { measureSnr } from '../../core/measure/snr';
import { createQuantizer } from '../../core/quantizers/index';
import { gaussianBlock, laplacianBlock } from '../../core/signals/noise';
import { Xoshiro128 } from '../../core/signals/random';
import { formatChannel, parseChannel } from '../../core/spec/index';
import type { TableStage } from '../../core/spec/types';
import { densityOf } from '../../core/theory/densities';
import { theoryOf } from '../../core/theory/snr-curves';

/** Non-negative decision values and positive outputs of an odd-symmetric table. */
function positiveHalf(stage: TableStage): { t: number[]; y: number[] } {
  return { t: stage.decisions.filter((v) => v >= 0), y: stage.outputs.filter((v) => v > 0) };
}

// J. Max (1960), Gaussian, unit variance (from memory; printed values are rounded, allow 1e-3).
const MAX_1960 = [
  { bits: 1, t: [0], y: [0.7979], mse: 0.3634 },
  { bits: 2, t: [0, 0.9816], y: [0.4528, 1.51], mse: 0.1175 },
  { bits: 3, t: [0, 0.5006, 1.05, 1.748], y: [0.2451, 0.756, 1.344, 2.152], mse: 0.03455 },
  {
    bits: 4,
    t: [0, 0.2582, 0.5224, 0.7996, 1.099, 1.437, 1.844, 2.401],
    y: [0.1284, 0.3881, 0.6568, 0.9424, 1.256, 1.618, 2.069, 2.733],
    mse: 0.009497,
  },
];

describe('Lloyd-Max for the Gaussian', () => {
  it('reproduces J. Max (1960) for N = 1, 2, 3 (and 4) within 1e-3', () => {
    // J. Max, IRE Trans. Inf. Theory IT-6, 1960, Table I (from memory): N = 1..3;
    // the 16-level row is recalled too.
    const d = gaussianDesignDensity(1);
    for (const row of MAX_1960) {
      const r = designLloydMax(d, row.bits);
      expect(r.converged).toBe(true);
      const { t, y } = positiveHalf(r.stage);
      expect(t.length).toBe(row.t.length);
      row.t.forEach((v, i) => expect(Math.abs(t[i] - v), `N=${row.bits} t${i}`).toBeLessThan(1e-3));
      row.y.forEach((v, i) => expect(Math.abs(y[i] - v), `N=${row.bits} y${i}`).toBeLessThan(1e-3));
      expect(Math.abs(r.mse - row.mse), `N=${row.bits} mse`).toBeLessThan(1e-3 * row.mse + 1e-6);
    }
  });

  it('builds a table stage that createQuantizer and the text form accept, with the predicted error', () => {
    // A table stage (DEVELOPERS.md, the channel text form); the predicted MSE must be the exact
    // theory of the built quantizer (core/theory) and what seeded Gaussian noise measures (law
    // of large numbers, common practice).
    const r = designLloydMax(gaussianDesignDensity(1), 3);
    expect(r.stage).toMatchObject({ law: 'table', name: 'lm-gaussian-3' });
    const q = createQuantizer(r.stage);
    expect(q.bits).toBe(3);
    expect(q.overloadPoint).toBeCloseTo(2.152, 3);
    const th = theoryOf(q).evaluate(densityOf('gaussian', 1));
    expect(th.granularNoise + th.overloadNoise).toBeCloseTo(r.mse, 12);
    const spec = parseChannel(formatChannel({ stages: [r.stage], rate: 8000 }));
    expect(spec.stages[0]).toEqual(r.stage);
    const x = gaussianBlock(new Xoshiro128(3), 1 << 16);
    const y = new Float64Array(x.length);
    createQuantizer(spec.stages[0]).quantizeBlock(x, y);
    expect(measureSnr(x, y).noisePower / r.mse).toBeGreaterThan(0.97);
    expect(measureSnr(x, y).noisePower / r.mse).toBeLessThan(1.03);
  });

  it('is never beaten by the Panter-Dite compander and meets its asymptote for many levels', () => {
    // Lloyd-Max is the least-MSE quantizer for its level count (Max 1960), so the compander with as
    // many levels cannot do better; for many levels both approach 6.02 N - 4.35 dB (Panter and Dite
    // 1951, from memory).
    const d = gaussianDesignDensity(1);
    for (let n = 1; n <= 10; n++) {
      const lm = designLloydMax(d, n);
      const pd = designPanterDite(d, n);
      expect(lm.snrDb, `N=${n}`).toBeGreaterThanOrEqual(pd.snrDb - 1e-9);
      if (n >= 8) expect(Math.abs(lm.snrDb - (6.02 * n - 4.35)), `N=${n}`).toBeLessThan(0.1);
    }
  });

  it('scales with sigma', () => {
    // A quantizer designed for sigma is the unit design scaled by sigma (the Gaussian is a scale
    // family; common practice, no source).
    const unit = designLloydMax(gaussianDesignDensity(1), 5);
    const big = designLloydMax(gaussianDesignDensity(0.05), 5);
    big.stage.outputs.forEach((v, i) => expect(v).toBeCloseTo(0.05 * unit.stage.outputs[i], 9));
    expect(big.snrDb).toBeCloseTo(unit.snrDb, 6);
  });
});

describe('Lloyd-Max for the Laplacian', () => {
  it('N = 1: output E|x| = sigma / sqrt 2 and MSE sigma^2 / 2', () => {
    // One cell per side: the output is the mean magnitude b = sigma/sqrt 2 of the Laplacian, and
    // the MSE sigma^2 - b^2 (closed form; common practice, no source).
    const r = designLloydMax(laplacianDesignDensity(1), 1);
    expect(r.stage.outputs[1]).toBeCloseTo(Math.SQRT1_2, 12);
    expect(r.mse).toBeCloseTo(0.5, 12);
  });

  it('N = 2 solves the two conditions found independently from the exponential law', () => {
    // The magnitude is exponential with mean b: the centroid of [t, inf) is t + b (memorylessness)
    // and of [0, t) is b - t e^(-t/b) / (1 - e^(-t/b)); the threshold t is their midpoint (Max
    // 1960). Solved here by bisection, independently of the designer.
    const b = Math.SQRT1_2;
    const f = (t: number) => t - 0.5 * (t + b + b - (t * Math.exp(-t / b)) / (1 - Math.exp(-t / b)));
    let lo = 0.1;
    let hi = 5;
    for (let i = 0; i < 200; i++) {
      const m = 0.5 * (lo + hi);
      if (f(m) < 0) lo = m;
      else hi = m;
    }
    const r = designLloydMax(laplacianDesignDensity(1), 2);
    const { t, y } = positiveHalf(r.stage);
    expect(t[1]).toBeCloseTo(lo, 9);
    expect(y[1]).toBeCloseTo(lo + b, 9);
  });

  it('gives the SNR that seeded Laplacian noise measures, for N = 4..8', () => {
    // Prediction against measurement on 2^17 seeded samples (law of large numbers; common practice).
    const x = laplacianBlock(new Xoshiro128(9), 1 << 17, 0.1);
    for (let n = 4; n <= 8; n++) {
      const r = designLloydMax(laplacianDesignDensity(0.1), n);
      const y = new Float64Array(x.length);
      createQuantizer(r.stage).quantizeBlock(x, y);
      expect(Math.abs(measureSnr(x, y).snrDb - r.snrDb), `N=${n}`).toBeLessThan(0.15);
    }
  });
});

describe('Lloyd-Max from a measured level distribution', () => {
  // 2^20 seeded Gaussian samples of sigma 0.1: designs from their histograms must come close to
  // Max's table scaled by the sample's sigma (Max 1960, from memory). Allowed: 5e-3 for fine value
  // bins, 1e-2 for 0.5 dB bins (6 percent wide, the density taken as flat across each).
  const x = gaussianBlock(new Xoshiro128(11), 1 << 20, 0.1);
  let ms = 0;
  for (const v of x) ms += v * v;
  const sigma = Math.sqrt(ms / x.length);

  const expectMax = (stage: TableStage, row: (typeof MAX_1960)[number], tol: number) => {
    const { t, y } = positiveHalf(stage);
    row.t.forEach((v, i) => expect(Math.abs(t[i] / sigma - v), `N=${row.bits} t${i}`).toBeLessThan(tol));
    row.y.forEach((v, i) => expect(Math.abs(y[i] / sigma - v), `N=${row.bits} y${i}`).toBeLessThan(tol));
  };

  it('from a histogram of signed sample values (folded onto magnitudes)', () => {
    const edges: number[] = [];
    for (let i = 0; i <= 800; i++) edges.push(-0.8 + i * 0.002);
    const counts = new Float64Array(800);
    for (const v of x) {
      const k = Math.floor((v + 0.8) / 0.002);
      if (k >= 0 && k < 800) counts[k]++;
    }
    const d = densityFromValues(edges, counts);
    expect(d.rms / sigma).toBeCloseTo(1, 3);
    for (const row of MAX_1960.slice(0, 3)) expectMax(designLloydMax(d, row.bits).stage, row, 5e-3);
  });

  it('from the level-spread histogram in 0.5 dB bins of dBov', () => {
    // The shape the level-spread meter keeps (our convention: 0.5 dB bins from -96 dBov, overload bin).
    const d = densityFromDbov(dbovHistogramOf(x, 1), 1);
    for (const row of MAX_1960) expectMax(designLloydMax(d, row.bits).stage, row, 1e-2);
    const r8 = designLloydMax(d, 8);
    expect(r8.converged).toBe(true);
    // 8 bits for a Gaussian: 43.85 dB (Lloyd-Max on the exact density, Max 1960 method).
    expect(Math.abs(r8.snrDb - designLloydMax(gaussianDesignDensity(sigma), 8).snrDb)).toBeLessThan(0.2);
  });

  it('refuses histograms it cannot use', () => {
    // Bad input is named, not silently designed around (common practice, no source).
    expect(() => densityFromMagnitudes([0, 1], [0])).toThrow(/empty/);
    expect(() => densityFromMagnitudes([0, 1, 1], [1, 1])).toThrow(/ascend/);
    expect(() => densityFromValues([0, 1], [1, 2])).toThrow(/one edge more/);
    expect(() => designLloydMax(gaussianDesignDensity(1), 0)).toThrow(/bits/);
  });
});

describe('inverse normal tail', () => {
  it('matches the normal table', () => {
    // Standard normal quantiles (common statistical tables): Q(1.959964) = 0.025, Q(2.326348) = 0.01,
    // Q(3.090232) = 0.001, Q(0) = 0.5.
    expect(inverseNormalTail(0.025)).toBeCloseTo(1.959964, 6);
    expect(inverseNormalTail(0.01)).toBeCloseTo(2.326348, 6);
    expect(inverseNormalTail(0.001)).toBeCloseTo(3.090232, 6);
    expect(inverseNormalTail(0.975)).toBeCloseTo(-1.959964, 6);
    expect(Math.abs(inverseNormalTail(0.5))).toBeLessThan(1e-12);
  });
});
