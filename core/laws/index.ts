// A compressor law as a value, so quantizers and theory treat mu-law and A-law alike.
import { aCompress, aExpand, aSlope, checkA } from './a';
import { checkMu, muCompress, muExpand, muSlope } from './mu';

export interface CompandingLaw {
  readonly name: 'mu' | 'a';
  readonly parameter: number;
  compress(x: number): number;
  expand(y: number): number;
  slope(x: number): number;
}

export function muLaw(mu: number): CompandingLaw {
  checkMu(mu);
  return {
    name: 'mu',
    parameter: mu,
    compress: (x) => muCompress(x, mu),
    expand: (y) => muExpand(y, mu),
    slope: (x) => muSlope(x, mu),
  };
}

export function aLaw(a: number): CompandingLaw {
  checkA(a);
  return {
    name: 'a',
    parameter: a,
    compress: (x) => aCompress(x, a),
    expand: (y) => aExpand(y, a),
    slope: (x) => aSlope(x, a),
  };
}

export { aCompress, aExpand, aSlope, muCompress, muExpand, muSlope };
