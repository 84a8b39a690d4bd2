// The segment ledger: for each segment (chord) of a quantizer, how many input
// samples fell in it and their signal and error energy, so each segment has its own
// occupancy and SNR. The segment of a sample is the quantizer's (from its code).
// ChannelMeter.add fills the arrays in its single pass over each piece (segment
// numbers outside the ledger are not counted); the ledger holds and reads them.

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

  /** SNR of each segment into `out`: NaN where a segment has no samples, +Infinity where it has no error. */
  snrDb(out: Float64Array = new Float64Array(this.segmentCount)): Float64Array {
    const counts = this.counts;
    const signal = this.signalEnergy;
    const error = this.errorEnergy;
    for (let s = 0; s < this.segmentCount; s++) {
      // One store per branch: a conditional expression joining the NaN and Infinity
      // constants with a computed double boxed every computed one.
      if (counts[s] === 0) out[s] = NaN;
      else if (error[s] === 0) out[s] = Infinity;
      else out[s] = 10 * Math.log10(signal[s] / error[s]);
    }
    return out;
  }
}
