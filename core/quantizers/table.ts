// Quantizer given by explicit decision and output values (designed quantizers).
// A sample on an exact decision value goes to the level farther from zero, as in
// the uniform and companded quantizers.
import type { TableStage } from '../spec/types';
import { LevelQuantizer, resolveOptions } from './level-quantizer';
import { bandOf, sixDbBandEdges } from './segments';

const MAX_LEVELS = 1 << 16;

/** Refuses tables that cannot quantize consistently; the message names the bad entry. */
export function checkTable(decisions: ArrayLike<number>, outputs: ArrayLike<number>): void {
  const levels = outputs.length;
  if (levels < 2 || levels > MAX_LEVELS) {
    throw new RangeError(`table: needs 2 to ${MAX_LEVELS} output values (got ${levels})`);
  }
  if (decisions.length !== levels - 1) {
    throw new RangeError(
      `table: needs one decision value fewer than output values (${decisions.length} decisions, ${levels} outputs)`,
    );
  }
  for (let i = 0; i < levels; i++) {
    if (!Number.isFinite(outputs[i])) throw new RangeError(`table: output ${i + 1} is not a finite number`);
  }
  for (let i = 0; i < levels - 1; i++) {
    const t = decisions[i];
    if (!Number.isFinite(t)) throw new RangeError(`table: decision ${i + 1} is not a finite number`);
    if (i > 0 && !(t > decisions[i - 1])) throw new RangeError(`table: decision ${i + 1} does not ascend`);
    // Each output must sit in its own cell, with ties sent away from zero.
    const below = outputs[i];
    const above = outputs[i + 1];
    const belowOk = t > 0 ? below < t : below <= t;
    const aboveOk = t >= 0 ? above >= t : above > t;
    if (!belowOk || !aboveOk) {
      throw new RangeError(`table: output ${i + 1} or ${i + 2} lies outside its cell around decision ${t}`);
    }
  }
}

export class TableQuantizer extends LevelQuantizer {
  private readonly t: Float64Array;
  private readonly last: number;

  constructor(stage: TableStage, label: string) {
    checkTable(stage.decisions, stage.outputs);
    const { overloadPoint: v, loadCapacityDbm0: lc, segments: segs } = resolveOptions(stage);
    const outputs = Float64Array.from(stage.outputs);
    const decisions = Float64Array.from(stage.decisions);
    const edges = sixDbBandEdges(v, segs);
    const segmentByCode = new Uint8Array(outputs.length);
    for (let c = 0; c < outputs.length; c++) segmentByCode[c] = bandOf(Math.abs(outputs[c]), edges);
    super({
      kind: 'table',
      label,
      bits: Math.ceil(Math.log2(outputs.length)),
      overloadPoint: v,
      loadCapacityDbm0: lc,
      segmentEdges: edges,
      outputs,
      decisions,
      segmentByCode,
    });
    this.t = decisions;
    this.last = decisions.length;
  }

  encode(x: number): number {
    if (!(x === x)) x = 0;
    const t = this.t;
    // Count decisions below x (<= x for x >= 0, < x for x < 0).
    let lo = 0;
    let hi = this.last;
    if (x >= 0) {
      while (lo < hi) {
        const mid = (lo + hi) >> 1;
        if (t[mid] <= x) lo = mid + 1;
        else hi = mid;
      }
    } else {
      while (lo < hi) {
        const mid = (lo + hi) >> 1;
        if (t[mid] < x) lo = mid + 1;
        else hi = mid;
      }
    }
    return lo;
  }
}
