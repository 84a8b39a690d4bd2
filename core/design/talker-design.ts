// The quantizer designed for a talker, one way for the page and the command line: from
// the levels of the talker's active 20 ms frames (FrameLevelTally), each frame taken as
// a Laplacian at its own RMS level and clipped at the overload point the levels refer
// to, the talker's density being the mixture of those (talkerDensity). Laplacian: the
// amplitudes of speech are peakier than Gaussian and close to Laplacian (Jayant and
// Noll 1984, from memory); the recommender's frame model makes the same choice.
import type { FrameShape } from './frame-snr';
import { talkerDensity } from './level-distribution';
import { designLloydMax } from './lloyd-max';
import { designPanterDite, type DesignedQuantizer } from './panter-dite';
import type { FrameLevels } from './recommend';

/**
 * The target a talker's channel is held to unless the user sets another: 30 dB SNR in
 * 95 % of the active frames. Our default, a choice rather than a requirement (common
 * practice, no source); the page and `quantiscope design` both start from it.
 */
export const DEFAULT_TALKER_TARGET: Readonly<{ targetSnrDb: number; share: number }> = Object.freeze({
  targetSnrDb: 30,
  share: 0.95,
});

export type TalkerDesignMethod = 'lloyd-max' | 'panter-dite';

export interface TalkerDesignOptions {
  /** Default lloyd-max. */
  method?: TalkerDesignMethod;
  /** Table name; default talker-lm-N (Lloyd-Max) or talker-pd-N (Panter-Dite). */
  name?: string;
  /** Density of one frame; default laplacian (the recommender may ask for gaussian). */
  shape?: FrameShape;
}

/** The N-bit odd-symmetric table for a talker's active frames; RangeError with no frame or bad bits. */
export function designForTalker(
  frames: FrameLevels,
  bits: number,
  options: TalkerDesignOptions = {},
): DesignedQuantizer {
  const method = options.method ?? 'lloyd-max';
  const ov = frames.overloadPoint ?? 1;
  const weights = frames.weights ?? frames.levelsDbov.map(() => 1);
  const density = talkerDensity(frames.levelsDbov, weights, options.shape ?? 'laplacian', ov, ov);
  const name = options.name ?? `talker-${method === 'lloyd-max' ? 'lm' : 'pd'}-${bits}`;
  return method === 'lloyd-max'
    ? designLloydMax(density, bits, { name })
    : designPanterDite(density, bits, name);
}
