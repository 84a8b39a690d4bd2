// An odd-symmetric quantizer given by its positive half, the form every designer here
// works in: M cells [t_0 = 0, t_1), ..., [t_{M-1}, infinity) with outputs y_1..y_M, so
// 2M levels and zero a decision value (mid-rise). Its mean squared error for a design
// density follows from the density's tails in closed form, and it turns into the
// table stage that createQuantizer builds as channel A or B.
import { DEFAULT_LOAD_CAPACITY_DBM0, type TableStage } from '../spec/types';
import type { DesignDensity } from './design-density';

export interface HalfTable {
  /** t_1 .. t_{M-1}, ascending, > 0 (t_0 = 0 and t_M = infinity are implied). */
  thresholds: Float64Array;
  /** y_1 .. y_M, ascending, > 0. */
  outputs: Float64Array;
}

export interface TableError {
  /** Mean squared error, overload cell beyond the outermost output included. */
  mse: number;
  /** Of which from |x| beyond the outermost output (clipped samples). */
  overload: number;
  snrDb: number;
}

const s = new Float64Array(6);

/** Exact mean squared error of a half table for an even density. */
export function halfTableError(h: HalfTable, d: DesignDensity): TableError {
  const t = h.thresholds;
  const y = h.outputs;
  const m = y.length;
  let granular = 0;
  let overload = 0;
  d.tails(0, s, 0);
  for (let i = 0; i < m; i++) {
    const yi = y[i];
    const last = i === m - 1;
    // The last cell's granular part ends at its output; beyond it samples are clipped.
    d.tails(last ? yi : t[i], s, 3);
    const e = s[2] - s[5] - 2 * yi * (s[1] - s[4]) + yi * yi * (s[0] - s[3]);
    granular += e > 0 ? e : 0;
    if (last) {
      const o = s[5] - 2 * yi * s[4] + yi * yi * s[3];
      overload = o > 0 ? o : 0;
    }
    s[0] = s[3];
    s[1] = s[4];
    s[2] = s[5];
  }
  const mse = 2 * (granular + overload);
  return { mse, overload: 2 * overload, snrDb: 10 * Math.log10((d.rms * d.rms) / mse) };
}

/** Largest magnitude the table reproduces: its outermost output. */
export function halfTableOverload(h: HalfTable): number {
  return h.outputs[h.outputs.length - 1];
}

/**
 * The table stage of a half table. Its overload point is the outermost output (samples
 * beyond it are clipped to it). Its load capacity keeps the float scale's dBm0 where
 * A-law and the default uniform channels put it (a sine of peak 1.0 is +3.14 dBm0), so a
 * talker reads the same dBm0 on a designed channel as on the others:
 * lc = 3.14 + 20 log10(overload point).
 */
export function halfTableStage(h: HalfTable, name: string): TableStage {
  const m = h.outputs.length;
  const decisions: number[] = [];
  for (let i = m - 2; i >= 0; i--) decisions.push(-h.thresholds[i]);
  decisions.push(0);
  for (let i = 0; i < m - 1; i++) decisions.push(h.thresholds[i]);
  const outputs: number[] = [];
  for (let i = m - 1; i >= 0; i--) outputs.push(-h.outputs[i]);
  for (let i = 0; i < m; i++) outputs.push(h.outputs[i]);
  const ov = halfTableOverload(h);
  return {
    law: 'table',
    name,
    decisions,
    outputs,
    overloadPoint: ov,
    loadCapacityDbm0: DEFAULT_LOAD_CAPACITY_DBM0 + 20 * Math.log10(ov),
  };
}
