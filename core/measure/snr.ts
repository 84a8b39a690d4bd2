// Plain overall SNR of a quantized block against its input, summed in float64:
// signal power over the power of the difference.

export interface SnrMeasurement {
  /** Samples measured. */
  count: number;
  /** Mean square of the input. */
  signalPower: number;
  /** Mean square of output - input. */
  noisePower: number;
  /** 10 log10(signalPower / noisePower); +Infinity for a lossless block. */
  snrDb: number;
}

/** Scratch for sumEnergies' two sums, so neither caller allocates per block. */
const SUMS = new Float64Array(2);

/** Sums of input^2 and of (output - input)^2 over [start, end), into sums[0] and sums[1]. */
function sumEnergies(
  input: ArrayLike<number>,
  output: ArrayLike<number>,
  start: number,
  end: number,
  sums: Float64Array,
): void {
  let s = 0;
  let e = 0;
  for (let i = start; i < end; i++) {
    const x = input[i];
    const d = output[i] - x;
    s += x * x;
    e += d * d;
  }
  sums[0] = s;
  sums[1] = e;
}

/**
 * SNR of output against input over samples [start, end). Writes into `out` when
 * given, so a caller measuring block after block allocates nothing.
 */
export function measureSnr(
  input: ArrayLike<number>,
  output: ArrayLike<number>,
  start = 0,
  end = Math.min(input.length, output.length),
  out?: SnrMeasurement,
): SnrMeasurement {
  if (start < 0 || end > input.length || end > output.length || start > end) {
    throw new RangeError(`measureSnr: range [${start}, ${end}) does not fit the blocks`);
  }
  sumEnergies(input, output, start, end, SUMS);
  const s = SUMS[0];
  const e = SUMS[1];
  const n = end - start;
  const r = out ?? { count: 0, signalPower: 0, noisePower: 0, snrDb: 0 };
  r.count = n;
  r.signalPower = n > 0 ? s / n : 0;
  r.noisePower = n > 0 ? e / n : 0;
  r.snrDb = 10 * Math.log10(s / e);
  return r;
}

/** SNR in dB of a whole block. */
export function snrDb(input: ArrayLike<number>, output: ArrayLike<number>): number {
  return measureSnr(input, output).snrDb;
}

/**
 * Overall SNR accumulated over many blocks (batches), with its statistical spread
 * estimated from the batches themselves: the ratio estimator sum(S)/sum(E) is
 * linearised, so var(ln R) ~ B/(B-1) * sum_b (S_b/S - E_b/E)^2 over batch sums
 * S_b, E_b. Batches should be long compared with the signal's correlation time.
 */
export class SnrAccumulator {
  private readonly signalSums: Float64Array;
  private readonly noiseSums: Float64Array;
  private batches = 0;
  private samples = 0;
  private signal = 0;
  private noise = 0;

  constructor(readonly maxBatches = 4096) {
    this.signalSums = new Float64Array(maxBatches);
    this.noiseSums = new Float64Array(maxBatches);
  }

  reset(): void {
    this.batches = 0;
    this.samples = 0;
    this.signal = 0;
    this.noise = 0;
  }

  /** Adds samples [start, end) of one block as one batch. */
  add(
    input: ArrayLike<number>,
    output: ArrayLike<number>,
    start = 0,
    end = Math.min(input.length, output.length),
  ): void {
    if (this.batches >= this.maxBatches)
      throw new RangeError(`SnrAccumulator: more than ${this.maxBatches} batches`);
    sumEnergies(input, output, start, end, SUMS);
    const s = SUMS[0];
    const e = SUMS[1];
    this.signalSums[this.batches] = s;
    this.noiseSums[this.batches] = e;
    this.batches++;
    this.samples += end - start;
    this.signal += s;
    this.noise += e;
  }

  get count(): number {
    return this.samples;
  }

  get snrDb(): number {
    return 10 * Math.log10(this.signal / this.noise);
  }

  /** Standard error of snrDb in dB (NaN with fewer than two batches). */
  standardErrorDb(): number {
    const b = this.batches;
    if (b < 2) return NaN;
    let q = 0;
    for (let i = 0; i < b; i++) {
      const r = this.signalSums[i] / this.signal - this.noiseSums[i] / this.noise;
      q += r * r;
    }
    return (10 / Math.LN10) * Math.sqrt((q * b) / (b - 1));
  }
}
