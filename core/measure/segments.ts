// The segment ledger: for each segment (chord) of a quantizer, how many input
// samples fell in it and their signal and error energy, so each segment has its own
// occupancy and SNR. The segment of a sample is the quantizer's (from its code).

export class SegmentLedger {
  readonly counts: Float64Array;
  readonly signalEnergy: Float64Array;
  readonly errorEnergy: Float64Array;

  constructor(readonly segmentCount: number) {
    if (!Number.isInteger(segmentCount) || segmentCount < 1 || segmentCount > 256) {
      throw new RangeError(`segment count must be a whole number from 1 to 256 (got ${segmentCount})`);
    }
    this.counts = new Float64Array(segmentCount);
    this.signalEnergy = new Float64Array(segmentCount);
    this.errorEnergy = new Float64Array(segmentCount);
  }

  reset(): void {
    this.counts.fill(0);
    this.signalEnergy.fill(0);
    this.errorEnergy.fill(0);
  }

  /**
   * Adds samples: signal[i] and error[i] (output - input) for segments[i], with
   * signal and error indexed from `from`, segments from `segFrom`, `length` samples.
   * Segment numbers outside the range are ignored.
   */
  add(
    signal: ArrayLike<number>,
    error: ArrayLike<number>,
    from: number,
    segments: ArrayLike<number>,
    segFrom: number,
    length: number,
  ): void {
    const c = this.counts;
    const se = this.signalEnergy;
    const ee = this.errorEnergy;
    const top = this.segmentCount;
    for (let i = 0; i < length; i++) {
      const s = segments[segFrom + i];
      if (s >= top) continue;
      const x = signal[from + i];
      const e = error[from + i];
      c[s]++;
      se[s] += x * x;
      ee[s] += e * e;
    }
  }

  /** SNR of each segment into `out`: NaN where a segment has no samples, +Infinity where it has no error. */
  snrDb(out: Float64Array = new Float64Array(this.segmentCount)): Float64Array {
    for (let s = 0; s < this.segmentCount; s++) {
      out[s] =
        this.counts[s] === 0
          ? NaN
          : this.errorEnergy[s] === 0
            ? Infinity
            : 10 * Math.log10(this.signalEnergy[s] / this.errorEnergy[s]);
    }
    return out;
  }
}
