// Geometry of the Transfer curve, once per channel change: the effective compressor of
// any quantizer from its table. (The Level/SNR theory runs in the compute worker.)
import { createQuantizer, type Quantizer } from '../../../core/quantizers/index';
import { parseChannel } from '../../../core/spec/parse';

export function firstStage(text: string): Quantizer {
  return createQuantizer(parseChannel(text).stages[0]);
}

/** Index of the cell holding x (decisions ascending; cell k is [d[k-1], d[k])). */
function cellOf(d: Float64Array, x: number): number {
  let lo = 0;
  let hi = d.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (d[mid] <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Effective compressor on [-1, 1]: the position of x among the quantizer's cells,
 * linear inside a cell (exact for companders, the segmented line for G.711), and
 * the staircase: the centre of x's cell on the same scale.
 */
export function compressorAt(
  d: Float64Array,
  v: number,
  x: number,
  out: { smooth: number; step: number },
): void {
  const cells = d.length + 1;
  const k = cellOf(d, x);
  const lo = k === 0 ? -v : d[k - 1];
  const hi = k === d.length ? v : d[k];
  const frac = hi > lo ? Math.min(1, Math.max(0, (x - lo) / (hi - lo))) : 0.5;
  out.smooth = -1 + (2 * (k + frac)) / cells;
  out.step = -1 + (2 * (k + 0.5)) / cells;
}
