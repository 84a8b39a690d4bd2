// Uniform N-bit quantizer. Mid-tread follows two's complement PCM (levels k*step,
// k = -L/2 .. L/2-1, so uniform:16 at overload 1.0 is exactly 16-bit PCM);
// mid-rise has symmetric levels (k + 1/2)*step. Exact decision values go to the
// level farther from zero, which keeps both forms odd-symmetric.
import type { UniformStage } from '../spec/types';
import { checkBits, LevelQuantizer, resolveOptions } from './level-quantizer';
import { bandOf, sixDbBandEdges } from './segments';

export class UniformQuantizer extends LevelQuantizer {
  readonly form: 'tread' | 'rise';
  readonly step: number;
  private readonly invStep: number;
  private readonly half: number;

  constructor(stage: UniformStage, label: string) {
    const bits = stage.bits;
    checkBits(bits, 2, 16, 'uniform');
    const { overloadPoint: v, loadCapacityDbm0: lc, segments: segs } = resolveOptions(stage);
    const levels = 1 << bits;
    const half = levels >> 1;
    const step = (2 * v) / levels;
    const rise = stage.form === 'rise';
    const outputs = new Float64Array(levels);
    const decisions = new Float64Array(levels - 1);
    const edges = sixDbBandEdges(v, segs);
    const segmentByCode = new Uint8Array(levels);
    for (let c = 0; c < levels; c++) {
      const k = c - half;
      outputs[c] = (rise ? k + 0.5 : k) * step;
      if (c > 0) decisions[c - 1] = (rise ? k : k - 0.5) * step;
      segmentByCode[c] = bandOf(Math.abs(outputs[c]), edges);
    }
    super({
      kind: 'uniform',
      label,
      bits,
      overloadPoint: v,
      loadCapacityDbm0: lc,
      segmentEdges: edges,
      outputs,
      decisions,
      segmentByCode,
    });
    this.form = rise ? 'rise' : 'tread';
    this.step = step;
    this.invStep = 1 / step;
    this.half = half;
  }

  encode(x: number): number {
    const u = x * this.invStep;
    let k: number;
    if (this.form === 'rise') k = u >= 0 ? Math.floor(u) : -Math.floor(-u) - 1;
    else k = u >= 0 ? Math.floor(u + 0.5) : -Math.floor(0.5 - u);
    if (k >= this.half) k = this.half - 1;
    else if (k < -this.half) k = -this.half;
    else if (k !== k) k = 0; // NaN
    return k + this.half;
  }
}
