// The optimum compander for a density (P. F. Panter and W. Dite, "Quantization
// distortion in pulse-count modulation with nonuniform spacing of levels", Proc. IRE,
// 1951): the compressor's slope is proportional to the cube root of the density,
//   c(x) = integral_0^x p^(1/3) / integral_0^inf p^(1/3),
// and for many levels the error power is (integral of p^(1/3) over the line)^3 / (12 L^2).
// Built here as an N-bit table: an N-bit mid-rise uniform quantizer on the compressed
// scale (-1, 1), its decision and output values taken back through c^-1.
//
// Overload point and support: for the Gaussian and Laplacian, c maps the whole line
// onto (-1, 1), so no truncation is needed: the outermost cells run to infinity and
// their outputs sit at c^-1(1 - 1/L). For a measured (piecewise) density the support
// ends at its top bin edge, where c reaches 1. Either way the table's overload point is
// its outermost output (see symmetric-table.ts).
import type { TableStage } from '../spec/types';
import type { DesignDensity } from './design-density';
import { type HalfTable, halfTableError, halfTableStage } from './symmetric-table';

export const MIN_DESIGN_BITS = 1;
export const MAX_DESIGN_BITS = 12;

export function checkDesignBits(bits: number): void {
  if (!Number.isInteger(bits) || bits < MIN_DESIGN_BITS || bits > MAX_DESIGN_BITS) {
    throw new RangeError(
      `design: bits must be a whole number from ${MIN_DESIGN_BITS} to ${MAX_DESIGN_BITS} (got ${bits})`,
    );
  }
}

export interface DesignedQuantizer {
  method: 'lloyd-max' | 'panter-dite';
  /** Label of the density designed for. */
  density: string;
  bits: number;
  /** Table stage for createQuantizer: channel A or B. */
  stage: TableStage;
  /** Predicted by exact integration of the design density over the table's cells. */
  mse: number;
  /** Part of mse from samples beyond the outermost output. */
  overloadMse: number;
  snrDb: number;
  /** Panter-Dite's many-level formula (panter-dite only, else null). */
  formulaSnrDb: number | null;
  /** Lloyd-Max iterations (0 for panter-dite) and whether they met the tolerance. */
  iterations: number;
  converged: boolean;
}

/** Positive half of the N-bit Panter-Dite compander for a density. */
export function panterDiteHalf(d: DesignDensity, bits: number): HalfTable {
  checkDesignBits(bits);
  const m = 2 ** (bits - 1);
  const r0 = d.rootTail(0);
  const thresholds = new Float64Array(m - 1);
  const outputs = new Float64Array(m);
  for (let i = 1; i < m; i++) thresholds[i - 1] = d.rootTailInverse(r0 * (1 - i / m));
  for (let i = 1; i <= m; i++) outputs[i - 1] = d.rootTailInverse(r0 * (1 - (i - 0.5) / m));
  return { thresholds, outputs };
}

/** Panter-Dite's error power for L levels: (integral of p^(1/3))^3 / (12 L^2), as SNR in dB. */
export function panterDiteFormulaSnrDb(d: DesignDensity, bits: number): number {
  const root = 2 * d.rootTail(0);
  const levels = 2 ** bits;
  const mse = (root * root * root) / (12 * levels * levels);
  return 10 * Math.log10((d.rms * d.rms) / mse);
}

/** The N-bit Panter-Dite compander for a density, as a table stage with its predicted SNR. */
export function designPanterDite(d: DesignDensity, bits: number, name?: string): DesignedQuantizer {
  const half = panterDiteHalf(d, bits);
  const err = halfTableError(half, d);
  return {
    method: 'panter-dite',
    density: d.label,
    bits,
    stage: halfTableStage(half, name ?? `pd-${d.label}-${bits}`),
    mse: err.mse,
    overloadMse: err.overload,
    snrDb: err.snrDb,
    formulaSnrDb: panterDiteFormulaSnrDb(d, bits),
    iterations: 0,
    converged: true,
  };
}
