// Quantizers designed for a density or a talker, and the channel recommender.
export {
  type DesignDensity,
  GaussianDesignDensity,
  LaplacianDesignDensity,
  PiecewiseDensity,
  gaussianDesignDensity,
  inverseNormalTail,
  laplacianDesignDensity,
} from './design-density';
export {
  type DbovHistogram,
  dbovHistogramOf,
  densityFromDbov,
  densityFromMagnitudes,
  densityFromValues,
  talkerDensity,
} from './level-distribution';
export { type LloydMaxOptions, designLloydMax, lloydMaxHalf } from './lloyd-max';
export {
  type DesignedQuantizer,
  MAX_DESIGN_BITS,
  MIN_DESIGN_BITS,
  designPanterDite,
  panterDiteFormulaSnrDb,
  panterDiteHalf,
} from './panter-dite';
export { type HalfTable, type TableError, halfTableError, halfTableStage } from './symmetric-table';
export { ClippedDensity, type FrameShape, type FrameSnr, FrameSnrModel } from './frame-snr';
export {
  type CandidateFamily,
  type CandidateSet,
  type CandidateVerdict,
  type FrameLevels,
  type Recommendation,
  type RecommendOptions,
  DEFAULT_CANDIDATES,
  recommend,
} from './recommend';
export {
  FRAME_LEVEL_BIN_DB,
  FRAME_LEVEL_BINS,
  FRAME_LEVEL_MAX_DBOV,
  FRAME_LEVEL_MIN_DBOV,
  FrameLevelTally,
  frameLevelBin,
  frameLevelCentre,
  frameLevelHistogram,
} from './frame-tally';
export {
  type TalkerDesignMethod,
  type TalkerDesignOptions,
  DEFAULT_TALKER_TARGET,
  designForTalker,
} from './talker-design';
