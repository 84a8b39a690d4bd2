// Calibrated test signals of the live engine: a tone at a set dBm0, Gaussian noise at a
// set dBm0 and a stepped level sweep. Levels are tied to the quantizer that will carry
// them through its overload point and load capacity (core/units/levels.ts), so "0 dBm0"
// means the same power on every channel. Each signal has a streaming source whose
// fill() allocates nothing and gives the same samples however the stream is cut; the
// render functions are that source run over one block.
import { dbovFromDbm0, rmsFromDbov, sineAmplitudeForDbm0 } from '../units/levels';
import { Xoshiro128 } from './random';

const TWO_PI = 2 * Math.PI;

/** The two figures that tie a float level to dBm0 (every Quantizer carries both). */
export interface LevelReference {
  /** Float amplitude of the quantizer's overload point. */
  overloadPoint: number;
  /** Power of a sine peaking at the overload point, dBm0. */
  loadCapacityDbm0: number;
}

export interface TestToneOptions extends LevelReference {
  /** Power of the tone, dBm0. */
  dbm0: number;
  /** Default 1020 Hz, the reference frequency of G.712 (avoids sub-multiples of 8 kHz). */
  frequencyHz?: number;
  rate: number;
  seconds: number;
  /** Starting phase, radians; default 0. */
  phase?: number;
}

export interface TestNoiseOptions extends LevelReference {
  /** Power (RMS) of the noise, dBm0. */
  dbm0: number;
  rate: number;
  seconds: number;
  seed?: number;
}

export interface LevelSweepOptions extends LevelReference {
  fromDbm0: number;
  toDbm0: number;
  /** Size of one step, dB (> 0); the direction follows from and to. */
  stepDb: number;
  /** Time at each level, seconds; at least MIN_SWEEP_STEP_SECONDS. */
  stepSeconds: number;
  frequencyHz?: number;
  rate: number;
}

/**
 * Shortest step of a sweep. A level must hold for several 20 ms frames to be read, and
 * the howl detector tells a staircase from a build-up by its flat treads (howl.ts).
 */
export const MIN_SWEEP_STEP_SECONDS = 0.1;

function checkRate(rate: number): void {
  if (!(rate > 0) || !Number.isFinite(rate)) throw new RangeError(`rate must be > 0 (got ${rate})`);
}

function checkLevels(ref: LevelReference): void {
  if (!(ref.overloadPoint > 0)) throw new RangeError(`overload point must be > 0 (got ${ref.overloadPoint})`);
  if (!Number.isFinite(ref.loadCapacityDbm0)) throw new RangeError('load capacity must be finite');
}

function checkFrequency(f: number, rate: number): void {
  if (!(f > 0 && 2 * f < rate)) throw new RangeError(`tone of ${f} Hz does not fit below half of ${rate} Hz`);
}

function sampleCount(rate: number, seconds: number): number {
  if (!(seconds >= 0) || !Number.isFinite(seconds))
    throw new RangeError(`seconds must be >= 0 (got ${seconds})`);
  return Math.round(rate * seconds);
}

/**
 * Phase, in cycles, of sample n of a tone. Whole-number frequency and rate take the
 * phase modulo the period exactly, so an hour-long tone is as clean as its first second.
 */
function cyclesAt(n: number, frequencyHz: number, rate: number, exact: boolean): number {
  if (exact) return ((frequencyHz * n) % rate) / rate;
  const c = (frequencyHz / rate) * n;
  return c - Math.floor(c);
}

/** A sine of fixed amplitude, streaming. */
export class TestToneSource {
  readonly amplitude: number;
  private readonly exact: boolean;
  private n = 0;

  constructor(
    readonly rate: number,
    readonly frequencyHz: number,
    amplitude: number,
    readonly phase = 0,
  ) {
    checkRate(rate);
    checkFrequency(frequencyHz, rate);
    this.amplitude = amplitude;
    this.exact = Number.isInteger(frequencyHz) && Number.isInteger(rate);
  }

  /** A tone at a level in dBm0 on the channel that `ref` describes. */
  static atDbm0(
    ref: LevelReference,
    dbm0: number,
    rate: number,
    frequencyHz = 1020,
    phase = 0,
  ): TestToneSource {
    checkLevels(ref);
    return new TestToneSource(
      rate,
      frequencyHz,
      sineAmplitudeForDbm0(dbm0, ref.overloadPoint, ref.loadCapacityDbm0),
      phase,
    );
  }

  /** Samples produced since construction or reset. */
  get position(): number {
    return this.n;
  }

  reset(): void {
    this.n = 0;
  }

  /** Writes the next end - start samples into out[start, end). */
  fill(out: Float32Array | Float64Array, start = 0, end = out.length): void {
    const a = this.amplitude;
    let n = this.n;
    for (let i = start; i < end; i++, n++) {
      out[i] = a * Math.sin(TWO_PI * cyclesAt(n, this.frequencyHz, this.rate, this.exact) + this.phase);
    }
    this.n = n;
  }
}

/** White Gaussian noise of fixed RMS, streaming (Box-Muller, the spare kept for the next sample). */
export class TestNoiseSource {
  private readonly rng: Xoshiro128;
  private spare = 0;
  private hasSpare = false;

  constructor(
    readonly rms: number,
    readonly seed = 1,
  ) {
    if (!(rms >= 0)) throw new RangeError(`noise RMS must be >= 0 (got ${rms})`);
    this.rng = new Xoshiro128(seed);
  }

  /** Noise whose power is `dbm0` on the channel that `ref` describes. */
  static atDbm0(ref: LevelReference, dbm0: number, seed = 1): TestNoiseSource {
    checkLevels(ref);
    return new TestNoiseSource(
      rmsFromDbov(dbovFromDbm0(dbm0, ref.loadCapacityDbm0), ref.overloadPoint),
      seed,
    );
  }

  fill(out: Float32Array | Float64Array, start = 0, end = out.length): void {
    const s = this.rms;
    for (let i = start; i < end; i++) {
      if (this.hasSpare) {
        out[i] = s * this.spare;
        this.hasSpare = false;
        continue;
      }
      const r = Math.sqrt(-2 * Math.log(this.rng.nextOpenFloat()));
      const angle = TWO_PI * this.rng.nextFloat();
      out[i] = s * r * Math.cos(angle);
      this.spare = r * Math.sin(angle);
      this.hasSpare = true;
    }
  }
}

/** Levels of a stepped sweep, dBm0, in playing order. */
export function sweepLevels(fromDbm0: number, toDbm0: number, stepDb: number): Float64Array {
  if (!(stepDb > 0)) throw new RangeError(`sweep step must be > 0 dB (got ${stepDb})`);
  if (!Number.isFinite(fromDbm0) || !Number.isFinite(toDbm0))
    throw new RangeError('sweep levels must be finite');
  const span = Math.abs(toDbm0 - fromDbm0);
  const count = Math.floor(span / stepDb + 1e-9) + 1;
  if (count > 10_000) throw new RangeError(`sweep of ${count} steps is too long`);
  const dir = toDbm0 >= fromDbm0 ? 1 : -1;
  const out = new Float64Array(count);
  for (let j = 0; j < count; j++) out[j] = fromDbm0 + dir * j * stepDb;
  return out;
}

/**
 * A tone stepping through the levels of sweepLevels(), each held stepSeconds; the phase
 * runs on across steps. Streaming, it starts over after the last step (loop) or falls
 * silent (no loop).
 */
export class LevelSweepSource {
  readonly levelsDbm0: Float64Array;
  /** Amplitude of each step. */
  readonly amplitudes: Float64Array;
  readonly stepSamples: number;
  readonly frequencyHz: number;
  readonly rate: number;
  private readonly exact: boolean;
  private n = 0;

  constructor(
    opts: Omit<LevelSweepOptions, 'rate'> & { rate: number },
    readonly loop = true,
  ) {
    checkRate(opts.rate);
    checkLevels(opts);
    this.rate = opts.rate;
    this.frequencyHz = opts.frequencyHz ?? 1020;
    checkFrequency(this.frequencyHz, opts.rate);
    if (!(opts.stepSeconds >= MIN_SWEEP_STEP_SECONDS)) {
      throw new RangeError(
        `sweep steps must last at least ${MIN_SWEEP_STEP_SECONDS} s (got ${opts.stepSeconds})`,
      );
    }
    this.levelsDbm0 = sweepLevels(opts.fromDbm0, opts.toDbm0, opts.stepDb);
    this.amplitudes = new Float64Array(this.levelsDbm0.length);
    for (let j = 0; j < this.amplitudes.length; j++) {
      this.amplitudes[j] = sineAmplitudeForDbm0(
        this.levelsDbm0[j],
        opts.overloadPoint,
        opts.loadCapacityDbm0,
      );
    }
    this.stepSamples = Math.round(opts.stepSeconds * opts.rate);
    this.exact = Number.isInteger(this.frequencyHz) && Number.isInteger(opts.rate);
  }

  /** Samples in one pass of the sweep. */
  get length(): number {
    return this.stepSamples * this.levelsDbm0.length;
  }

  /** Index of the step that sample n (from the start) plays, or -1 past the end without loop. */
  stepAt(n: number): number {
    const total = this.length;
    if (!this.loop && n >= total) return -1;
    return Math.floor((n % total) / this.stepSamples);
  }

  get position(): number {
    return this.n;
  }

  reset(): void {
    this.n = 0;
  }

  fill(out: Float32Array | Float64Array, start = 0, end = out.length): void {
    const total = this.length;
    const step = this.stepSamples;
    let n = this.n;
    for (let i = start; i < end; i++, n++) {
      if (!this.loop && n >= total) {
        out[i] = 0;
        continue;
      }
      const a = this.amplitudes[Math.floor((n % total) / step)];
      out[i] = a * Math.sin(TWO_PI * cyclesAt(n, this.frequencyHz, this.rate, this.exact));
    }
    this.n = n;
  }
}

/** A tone at `dbm0` for the quantizer described by the options. */
export function renderTestTone(opts: TestToneOptions): Float32Array<ArrayBuffer> {
  const src = TestToneSource.atDbm0(opts, opts.dbm0, opts.rate, opts.frequencyHz ?? 1020, opts.phase ?? 0);
  const out = new Float32Array(sampleCount(opts.rate, opts.seconds));
  src.fill(out);
  return out;
}

/** White Gaussian noise whose RMS is `dbm0` for the quantizer described by the options. */
export function renderTestNoise(opts: TestNoiseOptions): Float32Array<ArrayBuffer> {
  checkRate(opts.rate);
  const src = TestNoiseSource.atDbm0(opts, opts.dbm0, opts.seed ?? 1);
  const out = new Float32Array(sampleCount(opts.rate, opts.seconds));
  src.fill(out);
  return out;
}

/** One pass of a stepped level sweep. */
export function renderLevelSweep(opts: LevelSweepOptions): Float32Array<ArrayBuffer> {
  const src = new LevelSweepSource(opts, false);
  const out = new Float32Array(src.length);
  src.fill(out);
  return out;
}
