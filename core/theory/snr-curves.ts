// Exact SNR of any scalar quantizer given by its decision and output values, for a
// sine, Gaussian or Laplacian input: the error (x - y_k)^2 integrated over every
// cell in closed form from the density's partial moments, outermost cells unbounded.
// Noise from |x| beyond the overload point is overload noise, the rest granular.
//
// Cost: one tail evaluation per decision value inside the density's support, so a
// 65536-level table takes milliseconds per level point; symmetric tables (odd
// quantizers) integrate one half only.

import type { Quantizer, QuantizerTable } from '../quantizers/types';
import { rmsFromDbov } from '../units/levels';
import { type Density, type DensityShape, densityOf, intervalMoments } from './densities';

export interface SnrPoint {
  /** Input RMS level relative to the overload point, dBov. */
  levelDbov: number;
  signalPower: number;
  granularNoise: number;
  overloadNoise: number;
  snrDb: number;
}

/** SNR versus level, one entry per level; arrays for plotting. */
export interface SnrCurve {
  shape: DensityShape;
  levelsDbov: Float64Array;
  signalPower: Float64Array;
  granularNoise: Float64Array;
  overloadNoise: Float64Array;
  snrDb: Float64Array;
}

export function emptyCurve(shape: DensityShape, levelsDbov: ArrayLike<number>): SnrCurve {
  const n = levelsDbov.length;
  return {
    shape,
    levelsDbov: Float64Array.from(levelsDbov),
    signalPower: new Float64Array(n),
    granularNoise: new Float64Array(n),
    overloadNoise: new Float64Array(n),
    snrDb: new Float64Array(n),
  };
}

export function snrDbOf(signal: number, noise: number): number {
  return 10 * Math.log10(signal / noise);
}

/** First index i with t[i] > x (t ascending), or t.length. */
function firstAbove(t: Float64Array, x: number): number {
  let lo = 0;
  let hi = t.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (t[mid] > x) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

/** First index i with t[i] >= x (t ascending), or t.length. */
function firstAtLeast(t: Float64Array, x: number): number {
  let lo = 0;
  let hi = t.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (t[mid] >= x) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

function isOddSymmetric(t: Float64Array, y: Float64Array): boolean {
  const nt = t.length;
  for (let i = 0; i < nt; i++) if (t[i] !== -t[nt - 1 - i]) return false;
  const ny = y.length;
  for (let i = 0; i < ny; i++) if (y[i] !== -y[ny - 1 - i]) return false;
  return true;
}

/** Exact theory for one table; reusable across densities and levels. */
export class TableTheory {
  readonly overloadPoint: number;
  /** True when the table is odd-symmetric, so one half is integrated. */
  readonly symmetric: boolean;
  private readonly t: Float64Array;
  private readonly y: Float64Array;
  // Scratch: tails at the two ends of the running piece, at V and at 0, and moments.
  private readonly ends = new Float64Array(6);
  private readonly atV = new Float64Array(3);
  private readonly atZero = new Float64Array(3);
  private readonly m = new Float64Array(3);
  private granular = 0;
  private overload = 0;

  constructor(table: QuantizerTable, overloadPoint: number) {
    const t = table.decisions;
    const y = table.outputs;
    if (y.length < 1 || t.length !== y.length - 1) {
      throw new RangeError(
        `theory: needs one decision value fewer than output values (${t.length}, ${y.length})`,
      );
    }
    for (let i = 1; i < t.length; i++) {
      if (!(t[i] > t[i - 1])) throw new RangeError(`theory: decision ${i + 1} does not ascend`);
    }
    if (!(overloadPoint > 0))
      throw new RangeError(`theory: overload point must be > 0 (got ${overloadPoint})`);
    this.t = Float64Array.from(t);
    this.y = Float64Array.from(y);
    this.overloadPoint = overloadPoint;
    this.symmetric = isOddSymmetric(this.t, this.y);
  }

  /** Exact signal and noise powers for an input density. Writes into `out` when given. */
  evaluate(d: Density, out?: SnrPoint): SnrPoint {
    const v = this.overloadPoint;
    d.tails(v, this.atV, 0);
    d.tails(0, this.atZero, 0);
    this.granular = 0;
    this.overload = 0;
    if (this.symmetric) this.positiveHalf(d);
    else this.wholeLine(d);
    const g = this.symmetric ? 2 * this.granular : this.granular;
    const o = this.symmetric ? 2 * this.overload : this.overload;
    const s = d.rms * d.rms;
    const r = out ?? { levelDbov: 0, signalPower: 0, granularNoise: 0, overloadNoise: 0, snrDb: 0 };
    r.levelDbov = 20 * Math.log10(d.rms / v);
    r.signalPower = s;
    r.granularNoise = g;
    r.overloadNoise = o;
    r.snrDb = snrDbOf(s, g + o);
    return r;
  }

  /** SNR at one input level (dBov) for a density shape. */
  at(shape: DensityShape, levelDbov: number): SnrPoint {
    return this.evaluate(densityOf(shape, rmsFromDbov(levelDbov, this.overloadPoint)));
  }

  /** SNR versus level for a density shape. */
  curve(shape: DensityShape, levelsDbov: ArrayLike<number>): SnrCurve {
    const c = emptyCurve(shape, levelsDbov);
    const p: SnrPoint = { levelDbov: 0, signalPower: 0, granularNoise: 0, overloadNoise: 0, snrDb: 0 };
    for (let i = 0; i < c.levelsDbov.length; i++) {
      this.evaluate(densityOf(shape, rmsFromDbov(c.levelsDbov[i], this.overloadPoint)), p);
      c.signalPower[i] = p.signalPower;
      c.granularNoise[i] = p.granularNoise;
      c.overloadNoise[i] = p.overloadNoise;
      c.snrDb[i] = p.snrDb;
    }
    return c;
  }

  /** Adds the error power of output y over [a, b] (tails of |a| at ends[ia], of |b| at ends[ib]). */
  private piece(a: number, b: number, ia: number, ib: number, y: number, isOverload: boolean): void {
    const m = this.m;
    intervalMoments(a, b, this.ends, ia, this.ends, ib, this.atZero, m);
    const e = m[2] - 2 * y * m[1] + y * y * m[0];
    if (isOverload) this.overload += e;
    else this.granular += e;
  }

  /** Granular piece [a, V] (a < V), the tails of V living in atV. */
  private pieceToV(a: number, ia: number, y: number, v: number): void {
    const m = this.m;
    intervalMoments(a, v, this.ends, ia, this.atV, 0, this.atZero, m);
    this.granular += m[2] - 2 * y * m[1] + y * y * m[0];
  }

  /** Overload piece [a, -V] (a < -V), the tails of |-V| living in atV. */
  private pieceToMinusV(a: number, ia: number, y: number, v: number): void {
    const m = this.m;
    intervalMoments(a, -v, this.ends, ia, this.atV, 0, this.atZero, m);
    this.overload += m[2] - 2 * y * m[1] + y * y * m[0];
  }

  private setEndToV(i: number): void {
    this.ends[i] = this.atV[0];
    this.ends[i + 1] = this.atV[1];
    this.ends[i + 2] = this.atV[2];
  }

  private wholeLine(d: Density): void {
    const t = this.t;
    const y = this.y;
    const last = y.length - 1;
    const v = this.overloadPoint;
    const support = d.support;
    // Only cells that meet (-support, support) hold mass.
    const kFirst = firstAbove(t, -support);
    const kLast = Math.min(firstAtLeast(t, support), last);
    let a = kFirst === 0 ? -Infinity : t[kFirst - 1];
    let ia = 0;
    let ib = 3;
    d.tails(Math.abs(a), this.ends, ia);
    for (let k = kFirst; k <= kLast; k++) {
      const b = k === last ? Infinity : t[k];
      const yk = y[k];
      if (a < -v && b > -v) {
        this.pieceToMinusV(a, ia, yk, v);
        a = -v;
        this.setEndToV(ia);
      }
      if (a < v && b > v) {
        this.pieceToV(a, ia, yk, v);
        a = v;
        this.setEndToV(ia);
      }
      d.tails(Math.abs(b), this.ends, ib);
      this.piece(a, b, ia, ib, yk, a >= v || b <= -v);
      a = b;
      const s = ia;
      ia = ib;
      ib = s;
    }
  }

  private positiveHalf(d: Density): void {
    const t = this.t;
    const y = this.y;
    const last = y.length - 1;
    const v = this.overloadPoint;
    const kFirst = firstAbove(t, 0);
    const kLast = Math.min(firstAtLeast(t, d.support), last);
    let a = kFirst === 0 ? 0 : Math.max(t[kFirst - 1], 0);
    let ia = 0;
    let ib = 3;
    d.tails(a, this.ends, ia);
    for (let k = kFirst; k <= kLast; k++) {
      const b = k === last ? Infinity : t[k];
      const yk = y[k];
      if (a < v && b > v) {
        this.pieceToV(a, ia, yk, v);
        a = v;
        this.setEndToV(ia);
      }
      d.tails(b, this.ends, ib);
      this.piece(a, b, ia, ib, yk, a >= v);
      a = b;
      const s = ia;
      ia = ib;
      ib = s;
    }
  }
}

/** Exact SNR of a table quantizer for one density. */
export function tableSnr(table: QuantizerTable, overloadPoint: number, d: Density): SnrPoint {
  return new TableTheory(table, overloadPoint).evaluate(d);
}

/** Exact theory of a quantizer, from its own table and overload point. */
export function theoryOf(q: Quantizer): TableTheory {
  return new TableTheory(q.table(), q.overloadPoint);
}

/** Exact SNR versus input level (dBov) of a quantizer for a density shape. */
export function quantizerSnrCurve(
  q: Quantizer,
  shape: DensityShape,
  levelsDbov: ArrayLike<number>,
): SnrCurve {
  return theoryOf(q).curve(shape, levelsDbov);
}
