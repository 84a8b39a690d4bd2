// Choosing a channel for a talker: given the levels of the talker's active frames, a
// target SNR and the share of active frames that must reach it (for example 30 dB for
// 99 percent), predict each candidate's share from theory, rank the candidates by bit
// rate and pick the cheapest that meets the target.
//
// Frame model (frame-snr.ts): each frame is a Laplacian (default) or Gaussian signal at
// its own RMS level, clipped at the input's full scale, and its SNR is the exact theory
// of the candidate's quantizer for that density (core/theory), with the spread that a
// frame of 160 samples (20 ms at 8 kHz) shows around it. Laplacian by default: the
// amplitudes of speech are peakier than Gaussian and closer to Laplacian (Jayant and
// Noll 1984, from memory); Gaussian suits noise-like material. The spread matters
// where a candidate's curve runs flat just above the target: in a compander's log
// region it is 0.7-0.9 dB for Laplacian frames, so a compander 1 dB above the target
// still has about a tenth of its frames below it, which the mean alone would hide.
// A frame meets the target with probability Phi((mean - target) / spread); the
// predicted share is the weighted sum of those over the frames.
//
// The theory is evaluated on a 0.5 dB grid of (unclipped) frame RMS and interpolated
// to each frame's measured level; the candidates' curves change little over 0.5 dB.
import { createQuantizer } from '../quantizers/index';
import { stageBits } from '../spec/bits';
import { formatStage } from '../spec/format';
import type { StageSpec } from '../spec/types';
import { erfc } from '../theory/special';
import { type FrameShape, FrameSnrModel } from './frame-snr';
import { designForTalker } from './talker-design';

export type { FrameShape } from './frame-snr';

/** Levels of a talker's active frames (dB RMS relative to `overloadPoint`) with weights. */
export interface FrameLevels {
  levelsDbov: number[];
  /** Frames at each level; 1 each when absent. */
  weights?: number[];
  /**
   * Float-scale point the levels refer to, and the input's full scale where frames
   * clip (default 1: 16-bit full scale, the A-law and uniform overload point).
   */
  overloadPoint?: number;
}

export type CandidateFamily = 'uniform' | 'mu' | 'a' | 'g711' | 'designed';

export interface CandidateSet {
  uniformBits?: number[];
  mu?: number[];
  a?: number[];
  companderBits?: number[];
  g711?: boolean;
  /** Lloyd-Max quantizers designed for the talker (designForTalker, the frame shape of the recommendation). */
  designedBits?: number[];
}

/**
 * Uniform 4-14 bits, mu-law (50, 100, 255, 500) and A-law (25, 87.6, 200) at 4-12 bits,
 * G.711, and Lloyd-Max quantizers designed for the talker at 4-8 bits. Uniform 15 and
 * 16 bits would cost most of the theory's time (up to 65536 cells) and reach 70 dB and
 * more at speech levels; designs above 8 bits cost most of the design time. Add either
 * through the candidate set.
 */
export const DEFAULT_CANDIDATES: Required<CandidateSet> = {
  uniformBits: [4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14],
  mu: [50, 100, 255, 500],
  a: [25, 87.6, 200],
  companderBits: [4, 5, 6, 7, 8, 9, 10, 11, 12],
  g711: true,
  designedBits: [4, 5, 6, 7, 8],
};

export interface RecommendOptions {
  targetSnrDb: number;
  /** Share of active frames that must reach the target, 0 < share <= 1. */
  share: number;
  frameShape?: FrameShape;
  /** Channel rate for the bit rates, default 8000. */
  rateHz?: number;
  /** Samples per frame, default 20 ms at the rate (160 at 8 kHz). */
  frameSamples?: number;
  candidates?: CandidateSet;
}

export interface CandidateVerdict {
  id: string;
  family: CandidateFamily;
  /** Stage for createQuantizer (a table stage for the designed ones). */
  stage: StageSpec;
  bits: number;
  bitRate: number;
  /** Predicted share of frames at or above the target. */
  predictedShare: number;
  /** SNR that the required share of frames reaches or exceeds. */
  snrAtShareDb: number;
  /** snrAtShareDb - target. */
  snrMarginDb: number;
  /** predictedShare - share. */
  shareMargin: number;
  meets: boolean;
  /** Expected frame SNR (exact theory) on the level grid of the result. */
  theoryDb: number[];
  /** Spread (standard deviation) of the frame SNR on the same grid. */
  spreadDb: number[];
}

/** Plain serialisable result for the trade-off panel and the command line. */
export interface Recommendation {
  targetSnrDb: number;
  share: number;
  frameShape: FrameShape;
  rateHz: number;
  frameSamples: number;
  frames: number;
  /** Frame levels of every candidate's curves, dB re the talker's overload point. */
  gridDbov: number[];
  /** All candidates, cheapest first; equal rates by larger margin. */
  candidates: CandidateVerdict[];
  /** Index in `candidates` of the cheapest that meets the target, or -1. */
  chosen: number;
}

const GRID_STEP_DB = 0.5;

function candidateStages(
  set: Required<CandidateSet>,
  frames: FrameLevels,
  shape: FrameShape,
): { family: CandidateFamily; stage: StageSpec }[] {
  const out: { family: CandidateFamily; stage: StageSpec }[] = [];
  for (const bits of set.uniformBits)
    out.push({ family: 'uniform', stage: { law: 'uniform', bits, form: 'tread' } });
  for (const mu of set.mu)
    for (const bits of set.companderBits) out.push({ family: 'mu', stage: { law: 'mu', mu, bits } });
  for (const a of set.a)
    for (const bits of set.companderBits) out.push({ family: 'a', stage: { law: 'a', a, bits } });
  if (set.g711) {
    out.push({ family: 'g711', stage: { law: 'g711-mu' } });
    out.push({ family: 'g711', stage: { law: 'g711-a' } });
  }
  for (const bits of set.designedBits)
    out.push({ family: 'designed', stage: designForTalker(frames, bits, { shape }).stage });
  return out;
}

function idOf(stage: StageSpec): string {
  return stage.law === 'table' ? `table:${stage.name ?? 'designed'}` : formatStage(stage);
}

/** Normal upper-tail probability of z standard deviations above: Phi(z). */
function phi(z: number): number {
  return 0.5 * erfc(-z / Math.SQRT2);
}

/** Weighted share of frames at or above `t` dB, each frame normal(mean, spread). */
function shareAbove(mean: Float64Array, spread: Float64Array, w: Float64Array, t: number): number {
  let s = 0;
  for (let i = 0; i < mean.length; i++) {
    const sd = spread[i];
    s += w[i] * (sd > 0 ? phi((mean[i] - t) / sd) : mean[i] >= t ? 1 : 0);
  }
  return s;
}

/** Ranks the candidates for a talker and picks the cheapest that meets the target. */
export function recommend(frames: FrameLevels, options: RecommendOptions): Recommendation {
  const { targetSnrDb, share } = options;
  if (!Number.isFinite(targetSnrDb))
    throw new RangeError('recommend: the target SNR must be a finite number');
  if (!(share > 0 && share <= 1)) throw new RangeError(`recommend: share must lie in (0, 1] (got ${share})`);
  const shape = options.frameShape ?? 'laplacian';
  const rateHz = options.rateHz ?? 8000;
  const frameSamples = options.frameSamples ?? Math.round(0.02 * rateHz);
  const levels = frames.levelsDbov;
  const weights = frames.weights ?? levels.map(() => 1);
  if (levels.length < 1 || weights.length !== levels.length) {
    throw new RangeError('recommend: needs at least one frame level and one weight per level');
  }
  const kept: number[] = [];
  let total = 0;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < levels.length; i++) {
    if (!Number.isFinite(levels[i]) || !(weights[i] >= 0))
      throw new RangeError(`recommend: bad frame level ${i + 1}`);
    if (weights[i] > 0) {
      kept.push(i);
      total += weights[i];
      lo = Math.min(lo, levels[i]);
      hi = Math.max(hi, levels[i]);
    }
  }
  if (!(total > 0)) throw new RangeError('recommend: no active frames');
  const ov = frames.overloadPoint ?? 1;
  // Grid of unclipped frame RMS; clipping lowers the loud frames' level, hence the headroom.
  const g0 = Math.floor(lo / GRID_STEP_DB) * GRID_STEP_DB - GRID_STEP_DB;
  const gTop = Math.min(hi + 6, 20);
  const gn = Math.max(2, Math.ceil((gTop - g0) / GRID_STEP_DB));
  const sigmas = new Float64Array(gn + 1);
  for (let i = 0; i <= gn; i++) sigmas[i] = ov * Math.pow(10, (g0 + i * GRID_STEP_DB) / 20);

  const w = new Float64Array(kept.length);
  const mean = new Float64Array(kept.length);
  const spread = new Float64Array(kept.length);
  for (let j = 0; j < kept.length; j++) w[j] = weights[kept[j]] / total;

  const set: Required<CandidateSet> = { ...DEFAULT_CANDIDATES, ...options.candidates };
  const verdicts: CandidateVerdict[] = [];
  let grid: number[] | null = null;
  for (const { family, stage } of candidateStages(set, { ...frames, weights }, shape)) {
    const model = new FrameSnrModel(createQuantizer(stage), frameSamples, ov);
    const at = Array.from(sigmas, (sg) => model.evaluate(shape, sg));
    const level = at.map((p) => p.levelDbov);
    grid ??= level;
    // Interpolate mean and spread at each frame's level along the (ascending) level axis.
    let k = 0;
    const order = kept.map((_, j) => j).sort((u, v) => levels[kept[u]] - levels[kept[v]]);
    for (const j of order) {
      const l = levels[kept[j]];
      while (k < gn - 1 && level[k + 1] < l) k++;
      const f = Math.min(Math.max((l - level[k]) / (level[k + 1] - level[k]), 0), 1);
      mean[j] = at[k].meanDb + (at[k + 1].meanDb - at[k].meanDb) * f;
      spread[j] = at[k].spreadDb + (at[k + 1].spreadDb - at[k].spreadDb) * f;
    }
    const predictedShare = shareAbove(mean, spread, w, targetSnrDb);
    // SNR that the required share reaches: the share falls as the threshold rises.
    let a = -200;
    let b = 400;
    for (let it = 0; it < 60; it++) {
      const m = 0.5 * (a + b);
      if (shareAbove(mean, spread, w, m) >= share) a = m;
      else b = m;
    }
    const snrAtShareDb = a;
    const bits = stageBits(stage);
    verdicts.push({
      id: idOf(stage),
      family,
      stage,
      bits,
      bitRate: bits * rateHz,
      predictedShare,
      snrAtShareDb,
      snrMarginDb: snrAtShareDb - targetSnrDb,
      shareMargin: predictedShare - share,
      meets: predictedShare >= share,
      theoryDb: at.map((p) => p.theoryDb),
      spreadDb: at.map((p) => p.spreadDb),
    });
  }
  verdicts.sort((u, v) => u.bitRate - v.bitRate || v.snrMarginDb - u.snrMarginDb);
  return {
    targetSnrDb,
    share,
    frameShape: shape,
    rateHz,
    frameSamples,
    frames: total,
    gridDbov: grid ?? [],
    candidates: verdicts,
    chosen: verdicts.findIndex((v) => v.meets),
  };
}
