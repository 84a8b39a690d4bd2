// Level sweeps and acceptance masks.
export {
  type SweepMethod,
  type SweepOptions,
  type SweepPoint,
  type SweepResult,
  type SweepStimulus,
  SWEEP_CEILING_DB,
  SWEEP_FLOOR_DB,
  runSweep,
  sweepLevels,
} from './sweep';
export {
  type Mask,
  type MaskJudgement,
  type MaskPoint,
  type MaskVerdict,
  G712_SINE_MASK,
  MaskError,
  checkMask,
  formatMask,
  judgeAgainstMask,
  maskLimitAt,
  parseMask,
} from './mask';
export { PeriodicSpectrum } from './periodic-spectrum';
export { fillToneTakes, periodicBandNoise, tonePeriodSamples } from './stimuli';
