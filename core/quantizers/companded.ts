// Companded N-bit quantizer: continuous compressor, N-bit mid-rise uniform quantizer
// in the compressed domain [-1, 1], expander. The compressor only guesses the level;
// a comparison against the expanded decision values settles it, so encode() agrees
// with table() to the last bit and ties go to the level farther from zero.
import type { CompandingLaw } from '../laws/index';
import type { StageOptions } from '../spec/types';
import { checkBits, LevelQuantizer, resolveOptions } from './level-quantizer';

export interface CompandedOptions extends StageOptions {
  bits: number;
}

export class CompandedQuantizer extends LevelQuantizer {
  readonly law: CompandingLaw;
  private readonly half: number;
  /** Decision magnitudes: mags[m] is the lower edge of magnitude level m (mags[0] = 0). */
  private readonly mags: Float64Array;
  private readonly scale: number;
  // Inline forms of the compressor for the guess (a virtual call per sample costs
  // more than the logarithm); the comparison that follows makes any rounding harmless.
  private readonly guessKind: 0 | 1 | 2;
  private readonly p: number;
  private readonly invNorm: number;

  constructor(law: CompandingLaw, opts: CompandedOptions, label: string) {
    const bits = opts.bits;
    checkBits(bits, 2, 16, `${law.name}-law`);
    const resolved = resolveOptions(opts);
    const v = resolved.overloadPoint;
    const lc = resolved.loadCapacityDbm0;
    const half = 1 << (bits - 1);
    const segs = Math.min(resolved.segments, half);

    const mags = new Float64Array(half + 1);
    const outMags = new Float64Array(half);
    for (let m = 0; m <= half; m++) mags[m] = m === 0 ? 0 : v * law.expand(m / half);
    for (let m = 0; m < half; m++) outMags[m] = v * law.expand((m + 0.5) / half);

    const levels = 2 * half;
    const outputs = new Float64Array(levels);
    const decisions = new Float64Array(levels - 1);
    const segmentByCode = new Uint8Array(levels);
    const segOfMag = (m: number): number => Math.floor((m * segs) / half);
    for (let m = 0; m < half; m++) {
      outputs[half + m] = outMags[m];
      outputs[half - 1 - m] = -outMags[m];
      segmentByCode[half + m] = segOfMag(m);
      segmentByCode[half - 1 - m] = segOfMag(m);
    }
    for (let c = 1; c < levels; c++) {
      const m = c - half; // decision between code c-1 and c
      decisions[c - 1] = m >= 0 ? mags[m] : -mags[-m];
    }
    const edges = new Float64Array(segs + 1);
    for (let s = 1; s < segs; s++) edges[s] = mags[Math.ceil((s * half) / segs)];
    edges[segs] = v;

    super({
      kind: law.name,
      label,
      bits,
      overloadPoint: v,
      loadCapacityDbm0: lc,
      segmentEdges: edges,
      outputs,
      decisions,
      segmentByCode,
    });
    this.law = law;
    this.half = half;
    this.mags = mags;
    this.scale = 1 / v;
    const p = law.parameter;
    this.p = p;
    if (law.name === 'mu' && p >= 1e-3) {
      this.guessKind = 1;
      this.invNorm = half / Math.log1p(p);
    } else if (law.name === 'a' && p > 1) {
      this.guessKind = 2;
      this.invNorm = half / (1 + Math.log(p));
    } else {
      this.guessKind = 0;
      this.invNorm = half;
    }
  }

  encode(x: number): number {
    const a = Math.abs(x);
    if (!(a === a)) return this.half; // NaN
    const half = this.half;
    const mags = this.mags;
    const r = a * this.scale;
    let g: number;
    if (this.guessKind === 1) g = Math.log1p(this.p * r) * this.invNorm;
    else if (this.guessKind === 2) {
      const ar = this.p * r;
      g = (ar < 1 ? ar : 1 + Math.log(ar)) * this.invNorm;
    } else g = this.law.compress(r) * half;
    let m = Math.floor(g);
    if (m >= half) m = half - 1;
    else if (m < 0) m = 0;
    while (m < half - 1 && a >= mags[m + 1]) m++;
    while (m > 0 && a < mags[m]) m--;
    return x < 0 ? half - 1 - m : half + m;
  }
}
