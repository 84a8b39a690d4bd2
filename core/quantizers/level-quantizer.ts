// Common body of the quantizers whose codes index their levels in ascending order
// (uniform, companded, table). Subclasses supply encode(); everything else is
// looked up from per-code tables built once, so the hot paths stay allocation-free.
import { DEFAULT_LOAD_CAPACITY_DBM0, DEFAULT_SEGMENTS, type StageOptions } from '../spec/types';
import { checkSegmentCount } from './segments';
import type { QuantizedSample, Quantizer, QuantizerKind, QuantizerTable } from './types';

export interface LevelQuantizerInit {
  kind: QuantizerKind;
  label: string;
  bits: number;
  overloadPoint: number;
  loadCapacityDbm0: number;
  segmentEdges: Float64Array;
  /** Output value of each code, ascending. */
  outputs: Float64Array;
  /** Decision values between consecutive codes (length outputs.length - 1). */
  decisions: Float64Array;
  /** Segment of each code. */
  segmentByCode: Uint8Array;
}

export abstract class LevelQuantizer implements Quantizer {
  readonly kind: QuantizerKind;
  readonly label: string;
  readonly bits: number;
  readonly overloadPoint: number;
  readonly loadCapacityDbm0: number;
  readonly segmentCount: number;
  readonly segmentEdges: Float64Array;
  protected readonly outputs: Float64Array;
  protected readonly decisions: Float64Array;
  protected readonly segmentByCode: Uint8Array;

  constructor(init: LevelQuantizerInit) {
    this.kind = init.kind;
    this.label = init.label;
    this.bits = init.bits;
    this.overloadPoint = init.overloadPoint;
    this.loadCapacityDbm0 = init.loadCapacityDbm0;
    this.segmentEdges = init.segmentEdges;
    this.segmentCount = init.segmentEdges.length - 1;
    this.outputs = init.outputs;
    this.decisions = init.decisions;
    this.segmentByCode = init.segmentByCode;
  }

  /** Code of a float sample. NaN is treated as 0. */
  abstract encode(x: number): number;

  decode(code: number): number {
    const v = this.outputs[code];
    if (v === undefined) throw new RangeError(`${this.label}: code ${code} is out of range`);
    return v;
  }

  quantize(x: number): number {
    return this.outputs[this.encode(x)];
  }

  segmentOf(x: number): number {
    return this.segmentByCode[this.encode(x)];
  }

  quantizeSample(x: number, out?: QuantizedSample): QuantizedSample {
    const code = this.encode(x);
    const o = out ?? { value: 0, code: 0, segment: 0, overload: false };
    o.value = this.outputs[code];
    o.code = code;
    o.segment = this.segmentByCode[code];
    o.overload = Math.abs(x) > this.overloadPoint;
    return o;
  }

  quantizeBlock(
    input: ArrayLike<number>,
    output: Float32Array | Float64Array,
    codes?: Int32Array | Uint16Array | Uint8Array,
    segments?: Uint8Array,
  ): number {
    const n = input.length;
    const ov = this.overloadPoint;
    const outputs = this.outputs;
    let overloads = 0;
    for (let i = 0; i < n; i++) {
      const x = input[i];
      const code = this.encode(x);
      output[i] = outputs[code];
      if (codes !== undefined) codes[i] = code;
      if (segments !== undefined) segments[i] = this.segmentByCode[code];
      if (x > ov || x < -ov) overloads++;
    }
    return overloads;
  }

  table(): QuantizerTable {
    return { decisions: this.decisions.slice(), outputs: this.outputs.slice() };
  }
}

export function checkBits(bits: number, min: number, max: number, what: string): void {
  if (!Number.isInteger(bits) || bits < min || bits > max) {
    throw new RangeError(`${what}: bits must be a whole number from ${min} to ${max} (got ${bits})`);
  }
}

/** Options of a configurable stage with their defaults filled in and checked. */
export function resolveOptions(o: StageOptions): Required<StageOptions> {
  const overloadPoint = o.overloadPoint ?? 1;
  checkOverloadPoint(overloadPoint);
  const loadCapacityDbm0 = o.loadCapacityDbm0 ?? DEFAULT_LOAD_CAPACITY_DBM0;
  checkLoadCapacity(loadCapacityDbm0);
  const segments = o.segments ?? DEFAULT_SEGMENTS;
  checkSegmentCount(segments);
  return { overloadPoint, loadCapacityDbm0, segments };
}

function checkOverloadPoint(v: number): void {
  if (!Number.isFinite(v) || v <= 0)
    throw new RangeError(`overload point must be a finite number > 0 (got ${v})`);
}

function checkLoadCapacity(v: number): void {
  if (!Number.isFinite(v)) throw new RangeError(`load capacity must be a finite number of dBm0 (got ${v})`);
}
