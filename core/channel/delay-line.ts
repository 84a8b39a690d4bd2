// A whole-sample delay for block streams: what lines the faster channel paths up
// with the slowest one, so every listening output shares one latency.

export class DelayLine {
  readonly delay: number;
  private readonly ring: Float64Array;
  private pos = 0;

  constructor(delay: number) {
    if (!Number.isInteger(delay) || delay < 0) throw new RangeError(`delay must be a whole number >= 0`);
    this.delay = delay;
    this.ring = new Float64Array(Math.max(1, delay));
  }

  reset(): void {
    this.ring.fill(0);
    this.pos = 0;
  }

  /** output[i] = input delayed by `delay` samples, for i < n (input and output must differ). */
  process(input: ArrayLike<number>, n: number, output: Float64Array): void {
    const d = this.delay;
    if (d === 0) {
      for (let i = 0; i < n; i++) output[i] = input[i];
      return;
    }
    const ring = this.ring;
    let p = this.pos;
    for (let i = 0; i < n; i++) {
      const y = ring[p];
      ring[p] = input[i];
      output[i] = y;
      p = p + 1 === d ? 0 : p + 1;
    }
    this.pos = p;
  }
}
