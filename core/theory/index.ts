// SNR theory: exact integration over a quantizer's own cells, and the continuous-law
// (Bennett) theory with the handbook asymptotes.
export {
  type Density,
  type DensityShape,
  DENSITY_SHAPES,
  densityOf,
  GaussianDensity,
  LaplacianDensity,
  SineDensity,
} from './densities';
export {
  type SnrCurve,
  type SnrPoint,
  TableTheory,
  quantizerSnrCurve,
  tableSnr,
  theoryOf,
} from './snr-curves';
export {
  type LawStage,
  aLawAsymptoteDb,
  bennettGranularNoise,
  lawSnr,
  lawSnrAt,
  lawSnrCurve,
  muLawAsymptoteDb,
  uniformFullLoadSineDb,
} from './law-curves';
export { erf, erfc } from './special';
