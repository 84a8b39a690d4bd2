// The voice-channel path: filter design, rate changers and the path itself.
export { ChannelPath, ChannelAtRate, RateGroup, type ChannelPathOptions } from './path';
export {
  planRate,
  channelBand,
  stageFactors,
  STOPBAND_REQUIRED_DB,
  STOPBAND_DESIGN_DB,
  PASSBAND_RIPPLE_ALLOWED_DB,
  type RatePlan,
  type RateStage,
  type ChannelBand,
} from './rate-plan';
export {
  designLowpass,
  designHalfband,
  kaiserBeta,
  kaiserOrder,
  kaiserWindow,
  besselI0,
  type LowpassSpec,
  type LowpassDesign,
} from './fir-design';
export {
  FirDecimator,
  FirInterpolator,
  HalfbandDecimator,
  HalfbandInterpolator,
  createDecimator,
  createInterpolator,
  isHalfband,
  type Decimator,
  type Interpolator,
} from './polyphase';
export { DelayLine } from './delay-line';
export { RationalResampler, planInputRate, rationalFactors, type InputRatePlan } from './rational';
