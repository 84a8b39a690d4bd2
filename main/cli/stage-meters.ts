// An accumulator the command line keeps beside the Analyzer, fed from the channel
// path's buffers after each block (Analyzer.path.atRate[i]).

/**
 * SNR after each stage of a tandem channel: stage s's output against the channel's
 * Reference (the first stage's input), so the loss of an added stage is the drop
 * from the figure before it.
 */
export class StageSnr {
  private signal = 0;
  readonly errors: Float64Array;

  constructor(readonly stages: number) {
    this.errors = new Float64Array(stages);
  }

  add(reference: Float64Array, outputs: readonly Float64Array[], n: number): void {
    let s2 = 0;
    for (let i = 0; i < n; i++) s2 += reference[i] * reference[i];
    this.signal += s2;
    for (let s = 0; s < this.stages; s++) {
      const out = outputs[s];
      let e2 = 0;
      for (let i = 0; i < n; i++) {
        const d = out[i] - reference[i];
        e2 += d * d;
      }
      this.errors[s] += e2;
    }
  }

  /** SNR after stage s, dB; null with no signal or no error. */
  snrDb(s: number): number | null {
    const e = this.errors[s];
    return this.signal > 0 && e > 0 ? 10 * Math.log10(this.signal / e) : null;
  }
}
