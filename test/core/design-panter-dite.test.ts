// The optimum compander of P. F. Panter and W. Dite (Proc. IRE, 1951) checked against its
// published Gaussian figure and against measurement on seeded noise.
import { describe, expect, it } from 'vitest';
import {
  densityFromMagnitudes,
  designPanterDite,
  gaussianDesignDensity,
  laplacianDesignDensity,
  panterDiteFormulaSnrDb,
} from '../../core/design/index';
import { measureSnr } from '../../core/measure/snr';
import { createQuantizer } from '../../core/quantizers/index';
import { gaussianBlock } from '../../core/signals/noise';
import { Xoshiro128 } from '../../core/signals/random';

describe('Panter-Dite compander', () => {
  it('predicts 6.02 N - 4.35 dB for Gaussian input', () => {
    // Panter and Dite (1951), from memory: error power (sqrt(3) pi / 2) sigma^2 / L^2 for a Gaussian,
    // i.e. SNR = 6.02 N - 4.35 dB. The rounded constants (6.0206, 4.3476) allow 0.02 dB at N = 12.
    const d = gaussianDesignDensity(1);
    for (let n = 1; n <= 12; n++) {
      expect(Math.abs(panterDiteFormulaSnrDb(d, n) - (6.02 * n - 4.35)), `N=${n}`).toBeLessThan(0.02);
      expect(designPanterDite(d, n).formulaSnrDb).toBe(panterDiteFormulaSnrDb(d, n));
    }
  });

  it('measures within 0.5 dB of 6.02 N - 4.35 dB on seeded Gaussian noise for N = 6..10', () => {
    // Source: Panter and Dite 1951 (from memory). 2^17 samples: the error power is known
    // to about 0.5 percent (0.02 dB).
    const x = gaussianBlock(new Xoshiro128(5), 1 << 17, 0.05);
    const y = new Float64Array(x.length);
    for (let n = 6; n <= 10; n++) {
      const r = designPanterDite(gaussianDesignDensity(0.05), n);
      const q = createQuantizer(r.stage);
      expect(q.bits).toBe(n);
      q.quantizeBlock(x, y);
      const snr = measureSnr(x, y).snrDb;
      expect(Math.abs(snr - (6.02 * n - 4.35)), `N=${n}: ${snr}`).toBeLessThan(0.5);
      // The built table's exact SNR tells the same (core/theory integrates its cells).
      expect(Math.abs(r.snrDb - (6.02 * n - 4.35)), `N=${n}`).toBeLessThan(0.1);
    }
  });

  it('needs no truncation for the Gaussian: outermost cells run to infinity, outputs at c^-1(1 - 1/L)', () => {
    // For the Gaussian, p^(1/3) is a Gaussian of deviation sqrt(3) sigma (derived here), so the
    // compressor is c(x) = 2 Phi(x / (sqrt 3 sigma)) - 1 and c^-1(1 - 1/L) = sqrt 3 sigma z with
    // Q(z) = 1/(2L); for L = 64, Q(z) = 1/128 at z = 2.418 (normal tables).
    const r = designPanterDite(gaussianDesignDensity(1), 6);
    const top = r.stage.outputs[r.stage.outputs.length - 1];
    expect(top).toBeCloseTo(Math.sqrt(3) * 2.418, 2);
    expect(r.stage.overloadPoint).toBe(top);
    // The last decision value: Q(z) = 1/64 at z = 2.154.
    expect(r.stage.decisions[r.stage.decisions.length - 1]).toBeCloseTo(Math.sqrt(3) * 2.154, 2);
  });

  it('gives the closed-form Laplacian figure 6.02 N - 6.53 dB', () => {
    // For the Laplacian (b = sigma/sqrt 2) the integral of p^(1/3) over the line is 6b (2b)^(-1/3),
    // whose cube over 12 L^2 is 4.5 sigma^2 / L^2: SNR = 6.02 N - 6.53 dB (derived here; common
    // practice, no source).
    const d = laplacianDesignDensity(1);
    for (let n = 4; n <= 12; n++) {
      expect(Math.abs(panterDiteFormulaSnrDb(d, n) - (6.02 * n - 6.53)), `N=${n}`).toBeLessThan(0.02);
    }
    expect(Math.abs(designPanterDite(d, 10).snrDb - (6.02 * 10 - 6.53))).toBeLessThan(0.05);
  });

  it('on a measured density, the support ends at the top bin and the table stays inside it', () => {
    // A uniform density on [0, 1) in ten bins: p^(1/3) is flat, so the compander is the uniform
    // quantizer, with SNR 6.02 N for a uniform input (Jayant and Noll 1984, from memory).
    const edges = Array.from({ length: 11 }, (_, i) => i / 10);
    const d = densityFromMagnitudes(edges, new Array(10).fill(1));
    const r = designPanterDite(d, 8);
    expect(Math.max(...r.stage.outputs)).toBeLessThan(1);
    expect(r.stage.outputs[255]).toBeCloseTo(1 - 1 / 256, 12);
    expect(Math.abs(r.snrDb - 6.02 * 8)).toBeLessThan(0.05);
  });
});
