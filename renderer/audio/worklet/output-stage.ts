// Output safety after the monitor mix: mute and master volume (both ramped, so
// neither clicks), then a hard ceiling. The limiter's gain drops at once to whatever
// keeps the sample under the ceiling and recovers slowly, so no sample ever leaves
// above it, whatever the volume or the signal.

/** Volume and mute ramp time constant, seconds (common practice, no source). */
const RAMP_S = 0.01;
/** Limiter recovery time constant, seconds (common practice, no source). */
const RELEASE_S = 0.1;

const GAIN = 0;
const LIMIT = 1;
const PEAK = 2;
const MIN_GAIN = 3;

export class OutputStage {
  muted = true;
  private volume = 0;
  /** Running values in a typed array: double fields would box on every store. */
  private readonly state = new Float64Array(4);
  private readonly rampCoeff: number;
  private readonly releaseCoeff: number;
  readonly ceiling: number;

  constructor(rate: number, ceilingDbfs: number, volumeDb: number) {
    this.rampCoeff = 1 - Math.exp(-1 / (RAMP_S * rate));
    this.releaseCoeff = 1 - Math.exp(-1 / (RELEASE_S * rate));
    this.ceiling = Math.pow(10, ceilingDbfs / 20);
    this.setVolumeDb(volumeDb);
    this.state[LIMIT] = 1;
    this.state[MIN_GAIN] = 1;
  }

  setVolumeDb(db: number): void {
    this.volume = Math.pow(10, db / 20);
  }

  /** out[i] = limited(in[i] * ramped gain), i in [0, n). */
  run(input: Float64Array, out: Float32Array, n: number): void {
    const st = this.state;
    const target = this.muted ? 0 : this.volume;
    const ramp = this.rampCoeff;
    const release = this.releaseCoeff;
    const ceiling = this.ceiling;
    for (let i = 0; i < n; i++) {
      const gain = st[GAIN] + (target - st[GAIN]) * ramp;
      st[GAIN] = gain;
      const x = input[i] * gain;
      const ax = Math.abs(x);
      if (ax > st[PEAK]) st[PEAK] = ax;
      let lim = st[LIMIT] + (1 - st[LIMIT]) * release;
      if (ax * lim > ceiling) lim = ceiling / ax;
      st[LIMIT] = lim;
      if (lim < st[MIN_GAIN]) st[MIN_GAIN] = lim;
      // Float32 rounding could lift a sample a hair above the ceiling; clamp it.
      out[i] = Math.min(ceiling, Math.max(-ceiling, x * lim));
    }
    // Below the float32 range the ramp has arrived: snap, so a muted output is exact zero.
    if (Math.abs(target - st[GAIN]) < 1e-9) st[GAIN] = target;
  }

  /** The ramped volume (0 when muted) at the end of the last block. */
  get gain(): number {
    return this.state[GAIN];
  }

  get periodPeak(): number {
    return this.state[PEAK];
  }

  get periodMinGain(): number {
    return this.state[MIN_GAIN];
  }

  /** Largest |x| before the limiter and smallest limiter gain restart here. */
  resetPeriod(): void {
    this.state[PEAK] = 0;
    this.state[MIN_GAIN] = 1;
  }
}
