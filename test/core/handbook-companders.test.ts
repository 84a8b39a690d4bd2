// Measured: continuous mu-law and A-law companders on Gaussian noise against the
// handbook asymptotes, and the flat SNR over a talker's range that companding is for.
import { describe, expect, it } from 'vitest';
import { SnrAccumulator } from '../../core/measure/snr';
import { createQuantizer, type Quantizer } from '../../core/quantizers/index';
import { fillGaussian } from '../../core/signals/noise';
import { Xoshiro128 } from '../../core/signals/random';

const CHUNK = 1 << 14;

/**
 * Measured SNR of q on seeded Gaussian noise at each level (dBov), `chunks` blocks of
 * CHUNK samples; the same noise, scaled, at every level.
 */
function measureLevels(q: Quantizer, levels: number[], chunks: number, seed: number) {
  const rng = new Xoshiro128(seed);
  const unit = new Float64Array(CHUNK);
  const x = new Float64Array(CHUNK);
  const y = new Float64Array(CHUNK);
  const acc = levels.map(() => new SnrAccumulator(chunks));
  for (let c = 0; c < chunks; c++) {
    fillGaussian(rng, unit);
    levels.forEach((level, i) => {
      const rms = q.overloadPoint * 10 ** (level / 20);
      for (let k = 0; k < CHUNK; k++) x[k] = rms * unit[k];
      q.quantizeBlock(x, y);
      acc[i].add(x, y);
    });
  }
  return acc.map((a) => ({ snrDb: a.snrDb, se: a.standardErrorDb() }));
}

describe('companders at N = 8 on Gaussian noise 15 to 20 dB below overload', () => {
  // 2^18 samples per level: standard error about 0.01 dB.
  const levels = [-20, -17.5, -15];

  it('mu-law (mu = 255) within 0.5 dB of 6.02 N + 4.77 - 20 log10(ln(1 + mu))', () => {
    // Jayant and Noll, Digital Coding of Waveforms (1984), large-signal mu-law SNR (from memory).
    const asymptote = 6.02 * 8 + 4.77 - 20 * Math.log10(Math.log(1 + 255));
    const m = measureLevels(createQuantizer({ law: 'mu', mu: 255, bits: 8 }), levels, 16, 11);
    m.forEach((r, i) => {
      expect(r.se).toBeLessThan(0.05);
      expect(Math.abs(r.snrDb - asymptote), `${levels[i]} dBov: ${r.snrDb} vs ${asymptote}`).toBeLessThan(
        0.5,
      );
    });
  });

  it('A-law (A = 87.6) within 0.5 dB of 6.02 N + 4.77 - 20 log10(1 + ln A)', () => {
    // Jayant and Noll (1984), large-signal A-law SNR (from memory).
    const asymptote = 6.02 * 8 + 4.77 - 20 * Math.log10(1 + Math.log(87.6));
    const m = measureLevels(createQuantizer({ law: 'a', a: 87.6, bits: 8 }), levels, 16, 12);
    m.forEach((r, i) => {
      expect(r.se).toBeLessThan(0.05);
      expect(Math.abs(r.snrDb - asymptote), `${levels[i]} dBov: ${r.snrDb} vs ${asymptote}`).toBeLessThan(
        0.5,
      );
    });
  });
});

describe('flat SNR over a talker range, 8 bits, Gaussian input, -50 to -15 dBov', () => {
  // A talker's level varies by about 40 dB (common practice, no source): the reason to compand.
  const levels = [-50, -45, -40, -35, -30, -25, -20, -15];
  const spread = (m: { snrDb: number }[]) =>
    Math.max(...m.map((r) => r.snrDb)) - Math.min(...m.map((r) => r.snrDb));

  it('continuous mu = 255 compander: SNR varies by less than 7 dB', () => {
    // The flat-SNR property of mu-law companding (common practice, no source).
    const m = measureLevels(createQuantizer({ law: 'mu', mu: 255, bits: 8 }), levels, 8, 21);
    expect(spread(m)).toBeLessThan(7);
  });

  it('uniform quantizer: SNR varies by about 35 dB, decibel for decibel with the level', () => {
    // Uniform quantization noise does not depend on the level, so SNR follows the level:
    // 35 dB over 35 dB (common practice, no source). Both forms, band 33..37 dB.
    for (const form of ['tread', 'rise'] as const) {
      const m = measureLevels(createQuantizer({ law: 'uniform', bits: 8, form }), levels, 8, 22);
      const s = spread(m);
      expect(s, form).toBeGreaterThan(33);
      expect(s, form).toBeLessThan(37);
    }
  });
});
