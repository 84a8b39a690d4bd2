// Shared shape of every quantizer in the core. Samples are floats on the
// 16-bit PCM scale divided by 32768 (so int16 n <-> n / 32768 everywhere).

/** Full description of a scalar quantizer on the real line, float scale. */
export interface QuantizerTable {
  /** L-1 ascending decision values; level k covers [decisions[k-1], decisions[k]). */
  readonly decisions: Float64Array;
  /**
   * L output (quantized) values, one per cell, ascending for every quantizer but one:
   * G.711 mu-law with all-zero suppression sends its lowest cell to 0x02, so outputs[0]
   * there is above outputs[1].
   */
  readonly outputs: Float64Array;
}

/** One quantized sample, for callers that want everything at once. */
export interface QuantizedSample {
  value: number;
  code: number;
  segment: number;
  overload: boolean;
}

export type QuantizerKind = 'uniform' | 'mu' | 'a' | 'g711-mu' | 'g711-a' | 'table';

export interface Quantizer {
  readonly kind: QuantizerKind;
  /** Canonical text form of the stage this quantizer was built from. */
  readonly label: string;
  readonly bits: number;
  /** Largest magnitude handled without clipping, float scale. */
  readonly overloadPoint: number;
  /** Power in dBm0 of a sine whose peak sits at the overload point. */
  readonly loadCapacityDbm0: number;
  /** Number of segments; segment index runs 0 (softest) .. segmentCount-1. */
  readonly segmentCount: number;
  /** segmentCount+1 ascending magnitudes; edges[0] = 0, last = overloadPoint. */
  readonly segmentEdges: Float64Array;

  /** Quantize one float sample (hot path; allocation-free). */
  quantize(x: number): number;
  /** Code for one float sample (as sent on the line for G.711). */
  encode(x: number): number;
  /** Float value for a code. */
  decode(code: number): number;
  /** Segment index of an input sample (by its code for G.711). */
  segmentOf(x: number): number;
  /** Everything about one sample; writes into `out` when given. */
  quantizeSample(x: number, out?: QuantizedSample): QuantizedSample;
  /**
   * Quantize a block. `codes` and `segments`, when given, receive each
   * sample's code and segment. Returns how many samples overloaded
   * (|x| beyond the overload point, so clipped).
   */
  quantizeBlock(
    input: ArrayLike<number>,
    output: Float32Array | Float64Array,
    codes?: Int32Array | Uint16Array | Uint8Array,
    segments?: Uint8Array,
  ): number;
  /** Decision and output values on the float scale, for theory and plotting. */
  table(): QuantizerTable;
}
