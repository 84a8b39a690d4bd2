// Continuous-law theory of an N-bit compander (uniform, mu-law, A-law): granular
// noise by Bennett's integral, step^2/12 * E[1/c'(x)^2 ; |x| < V] with step = 2V/2^N
// and c the compressor scaled to [0, V], plus the clipping noise E[(|x| - V)^2 ; |x| > V].
// For these laws 1/c'^2 is a polynomial in |x| on each piece, so the expectation
// is a sum of partial moments of the density: closed form, no quadrature.
//
// Also the handbook asymptotes (Jayant and Noll, Digital Coding of Waveforms, 1984),
// written exactly: 6.02 N is 20 log10(2) N, 1.76 is 10 log10(3/2), 4.77 is 10 log10(3).

import type { AStage, MuStage, UniformStage } from '../spec/types';
import { rmsFromDbov } from '../units/levels';
import { type Density, type DensityShape, clipNoise, densityOf, innerMoments } from './densities';
import { type SnrCurve, type SnrPoint, emptyCurve, snrDbOf } from './snr-curves';

/** The laws the Bennett theory covers; only law, bits, parameter and overloadPoint are read. */
export type LawStage = UniformStage | MuStage | AStage;

const DB_PER_BIT = 20 * Math.log10(2);

/** Handbook SNR of a uniform N-bit quantizer for a full-load sine: 6.02 N + 1.76 dB. */
export function uniformFullLoadSineDb(bits: number): number {
  return DB_PER_BIT * bits + 10 * Math.log10(1.5);
}

/** Handbook large-signal SNR of mu-law: 6.02 N + 4.77 - 20 log10(ln(1 + mu)) dB. */
export function muLawAsymptoteDb(bits: number, mu: number): number {
  return DB_PER_BIT * bits + 10 * Math.log10(3) - 20 * Math.log10(Math.log1p(mu));
}

/** Handbook large-signal SNR of A-law: 6.02 N + 4.77 - 20 log10(1 + ln A) dB. */
export function aLawAsymptoteDb(bits: number, a: number): number {
  return DB_PER_BIT * bits + 10 * Math.log10(3) - 20 * Math.log10(1 + Math.log(a));
}

/** Compressed-domain step of an N-bit quantizer over [-V, V]. */
function stepOf(bits: number, v: number): number {
  return (2 * v) / Math.pow(2, bits);
}

const scratch = new Float64Array(6);
const inner = new Float64Array(3);

/** Bennett granular noise of a law for a density (overload point V). */
export function bennettGranularNoise(stage: LawStage, d: Density, v: number): number {
  const step = stepOf(stage.bits, v);
  const k = (step * step) / 12;
  switch (stage.law) {
    case 'uniform': {
      innerMoments(d, v, scratch, inner);
      return k * inner[0];
    }
    case 'mu': {
      // 1/c'(x)^2 = (ln(1+mu)/mu)^2 (1 + mu|x|/V)^2; mu = 0 is the uniform quantizer.
      const mu = stage.mu;
      const r = mu === 0 ? 1 : Math.log1p(mu) / mu;
      innerMoments(d, v, scratch, inner);
      const u = mu / v;
      return k * r * r * (inner[0] + 2 * u * inner[1] + u * u * inner[2]);
    }
    case 'a': {
      // 1/c'^2 = ((1+ln A)/A)^2 below V/A, ((1+ln A) |x|/V)^2 above.
      const a = stage.a;
      const g = 1 + Math.log(a);
      const knee = v / a;
      innerMoments(d, knee, scratch, inner);
      const linear = (g / a) * (g / a) * inner[0];
      const below2 = inner[2];
      innerMoments(d, v, scratch, inner);
      const log = (g / v) * (g / v) * (inner[2] - below2);
      return k * (linear + log);
    }
  }
}

/** Continuous-law SNR for one density; overload point from the stage (default 1). */
export function lawSnr(stage: LawStage, d: Density, overloadPoint = stage.overloadPoint ?? 1): SnrPoint {
  const v = overloadPoint;
  const g = bennettGranularNoise(stage, d, v);
  const o = clipNoise(d, v, scratch);
  const s = d.rms * d.rms;
  return {
    levelDbov: 20 * Math.log10(d.rms / v),
    signalPower: s,
    granularNoise: g,
    overloadNoise: o,
    snrDb: snrDbOf(s, g + o),
  };
}

/** Continuous-law SNR at one input level in dBov. */
export function lawSnrAt(stage: LawStage, shape: DensityShape, levelDbov: number): SnrPoint {
  const v = stage.overloadPoint ?? 1;
  return lawSnr(stage, densityOf(shape, rmsFromDbov(levelDbov, v)), v);
}

/** Continuous-law SNR versus input level (dBov). */
export function lawSnrCurve(stage: LawStage, shape: DensityShape, levelsDbov: ArrayLike<number>): SnrCurve {
  const c = emptyCurve(shape, levelsDbov);
  for (let i = 0; i < c.levelsDbov.length; i++) {
    const p = lawSnrAt(stage, shape, c.levelsDbov[i]);
    c.signalPower[i] = p.signalPower;
    c.granularNoise[i] = p.granularNoise;
    c.overloadNoise[i] = p.overloadNoise;
    c.snrDb[i] = p.snrDb;
  }
  return c;
}
