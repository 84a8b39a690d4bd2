// SNR-versus-level sweeps of a channel's quantizer(s), run directly at the channel
// rate: the stimulus is generated at that rate and fed to the first quantizer, so the
// level (dBm0) is defined at that quantizer's input through its load capacity.
// Tandem channels run every stage; the error is the last stage's output minus the
// first stage's input.
//
// Every point reports two figures:
// - wideband: error = output - input over the whole band 0 .. rate/2, harmonics and
//   noise included. This is what the exact theory of the quantizer (core/theory)
//   predicts, and what the theory check compares.
// - in-band: what ITU-T G.712 judges (from memory): the distortion at the channel's
//   output within the voice band (default 300-3400 Hz) with the tone itself removed,
//   against the tone's power at the output. Error power outside the band (a white
//   error puts 22 percent of itself outside 300-3400 Hz at 8 kHz) is not counted, so
//   this figure is about 1 dB above the wideband one. The acceptance mask is held
//   against it: bare G.711 mu-law dips to 34.7 dB wideband near -27.5 dBm0 in exact
//   theory, below the mask's 35 dB, yet passes in-band.
//
// Sine method: 1020 Hz, the ITU-T O.6 / G.712 reference frequency (from memory), which
// is not a sub-multiple of 8 kHz. At 8 kHz it repeats every 400 samples and meets only
// 400 distinct phases, which samples the sine's amplitude density coarsely (its SNR
// strays 0.2-0.5 dB from the sine-density theory at some levels). So a point is 10
// takes of one period each (4000 samples, 0.5 s at 8 kHz), take j starting at phase
// 2 pi (j + 1/2) / 4000: a fixed phase offset per take, not a random dither, so that
// together the takes meet 4000 equally spaced phases and the figure stays within a few
// hundredths of a dB of the theory. Each take is a pure 1020 Hz tone whose error
// spectrum lies exactly on the 20 Hz bins of its period, and the mask is judged at
// that tone. Deterministic: no random numbers at all.
//
// Noise method, after ITU-T O.131 (from memory: pseudo-random Gaussian noise in a band
// of roughly 350-550 Hz): Gaussian noise periodic in 4096 samples (0.51 s at 8 kHz,
// 1.95 Hz bins; a power of two for the FFT), band-limited to 350-550 Hz by an ideal
// circular band-pass (see stimuli.ts), seeded, the same noise at every level. Its
// level is its RMS power in dBm0. 4096 samples keep the statistical spread of the
// error power near 2 percent (0.1 dB) at about a millisecond per point. One
// realisation has fewer extreme samples than the Gaussian density, so near overload
// (above about -8 dBm0) it reads up to 1 dB off the Gaussian theory. Its in-band figure
// counts all error in the analysis band (there is no tone to remove); no mask applies
// to it by default (the noise-method limits of G.712 are not recalled with confidence).
import { createQuantizer } from '../quantizers/index';
import type { Quantizer } from '../quantizers/types';
import { formatChannel } from '../spec/format';
import { parseChannel } from '../spec/parse';
import type { ChannelSpec } from '../spec/types';
import { densityOf } from '../theory/densities';
import { theoryOf } from '../theory/snr-curves';
import { dbovFromDbm0, rmsFromDbov } from '../units/levels';
import { G712_SINE_MASK, type Mask, type MaskJudgement, judgeAgainstMask } from './mask';
import { PeriodicSpectrum } from './periodic-spectrum';
import { fillToneTakes, periodicBandNoise, tonePeriodSamples } from './stimuli';

export type SweepMethod = 'sine' | 'noise';

export interface SweepOptions {
  method?: SweepMethod;
  /** First and last level (dBm0) and the step (dB); default -60 to +3 in 1 dB steps. */
  fromDbm0?: number;
  toDbm0?: number;
  stepDb?: number;
  /** Sine method: tone frequency (whole Hz), default 1020. */
  frequencyHz?: number;
  /** Sine method: one-period takes per point, default 10. */
  takes?: number;
  /** Noise method: stimulus band, default 350-550 Hz. */
  noiseBandHz?: readonly [number, number];
  /** Noise method: period and length of the noise, default 4096 samples. */
  noiseLength?: number;
  /** Noise method: seed of the noise, default 1. */
  seed?: number;
  /** Band of the in-band figure, default 300-3400 Hz. */
  analysisBandHz?: readonly [number, number];
  /**
   * Mask to judge; default the G.712 sine mask for the sine method and none for the
   * noise method. null: no mask.
   */
  mask?: Mask | null;
  /** Which figure the mask is held against, default 'in-band'. */
  maskFigure?: 'in-band' | 'wideband';
}

export interface SweepPoint {
  /** Level at the first quantizer's input. */
  dbm0: number;
  dbov: number;
  /** Signal to total distortion, error = output - input over 0 .. rate/2. */
  widebandDb: number;
  /** Output signal to output distortion inside the analysis band (tone removed for the sine). */
  inBandDb: number;
  /** Exact theory of a single-stage channel (sine or Gaussian density); null for tandems. */
  theoryDb: number | null;
  /** Share of samples beyond the first quantizer's overload point. */
  overloadShare: number;
}

export interface SweepStimulus {
  method: SweepMethod;
  /** Sine: the tone; noise: null. */
  frequencyHz: number | null;
  /** Noise: its band; sine: null. */
  bandHz: [number, number] | null;
  /** Samples of one exact period, the unit of analysis. */
  periodSamples: number;
  /** Periods per point (sine takes; 1 for noise). */
  periods: number;
  /** Noise seed; null for the sine. */
  seed: number | null;
}

/** Plain serialisable result of one sweep (numbers, strings, arrays, null). */
export interface SweepResult {
  channel: string;
  stages: string[];
  rateHz: number;
  stimulus: SweepStimulus;
  samplesPerPoint: number;
  analysisBandHz: [number, number];
  /** Of the first stage, which defines the level scale. */
  overloadPoint: number;
  loadCapacityDbm0: number;
  points: SweepPoint[];
  judgement: MaskJudgement | null;
}

const DEFAULT_RATE_FOR_NATIVE = 8000;

/** Level points from `from` to `to` inclusive in steps, rounded so they print cleanly. */
export function sweepLevels(fromDbm0: number, toDbm0: number, stepDb: number): number[] {
  if (!Number.isFinite(fromDbm0) || !Number.isFinite(toDbm0) || !(toDbm0 >= fromDbm0)) {
    throw new RangeError(`sweep: levels must run upwards (got ${fromDbm0} to ${toDbm0} dBm0)`);
  }
  if (!(stepDb > 0) || !Number.isFinite(stepDb))
    throw new RangeError(`sweep: step must be > 0 dB (got ${stepDb})`);
  const count = Math.floor((toDbm0 - fromDbm0) / stepDb + 1e-9) + 1;
  if (count > 10000) throw new RangeError(`sweep: ${count} level points are too many`);
  const out: number[] = [];
  for (let i = 0; i < count; i++) out.push(Math.round((fromDbm0 + i * stepDb) * 1e9) / 1e9);
  return out;
}

/**
 * Figures are held inside [-100, +200] dB so a result stays finite for JSON: a silent
 * output (a tone below the first decision value) reads -100, a lossless one +200.
 */
export const SWEEP_FLOOR_DB = -100;
export const SWEEP_CEILING_DB = 200;

function ratioDb(signal: number, noise: number): number {
  // A silent output has no signal to speak of, even when it has no distortion either.
  if (!(signal > 0)) return SWEEP_FLOOR_DB;
  if (!(noise > 0)) return SWEEP_CEILING_DB;
  const db = 10 * Math.log10(signal / noise);
  return db < SWEEP_FLOOR_DB ? SWEEP_FLOOR_DB : db > SWEEP_CEILING_DB ? SWEEP_CEILING_DB : db;
}

/** Runs a block through every stage in turn; returns first-stage overloads. */
function runStages(
  stages: Quantizer[],
  input: Float64Array,
  output: Float64Array,
  scratch: Float64Array,
): number {
  const overloads = stages[0].quantizeBlock(input, output);
  for (let s = 1; s < stages.length; s++) {
    scratch.set(output);
    stages[s].quantizeBlock(scratch, output);
  }
  return overloads;
}

/** SNR-versus-level sweep of a channel (its text form or its spec). */
export function runSweep(channel: string | ChannelSpec, options: SweepOptions = {}): SweepResult {
  const spec = typeof channel === 'string' ? parseChannel(channel) : channel;
  const method = options.method ?? 'sine';
  const rateHz = spec.rate === 'native' ? DEFAULT_RATE_FOR_NATIVE : spec.rate;
  const stages = spec.stages.map((s) => createQuantizer(s));
  const first = stages[0];
  const levels = sweepLevels(options.fromDbm0 ?? -60, options.toDbm0 ?? 3, options.stepDb ?? 1);
  const band = options.analysisBandHz ?? [300, 3400];
  if (!(band[0] >= 0 && band[1] > band[0] && 2 * band[1] <= rateHz)) {
    throw new RangeError(
      `sweep: analysis band ${band[0]}..${band[1]} Hz must lie inside 0..${rateHz / 2} Hz`,
    );
  }
  const theory = stages.length === 1 ? theoryOf(first) : null;

  let stimulus: SweepStimulus;
  let unit: Float64Array;
  if (method === 'sine') {
    const f = options.frequencyHz ?? 1020;
    const takes = options.takes ?? 10;
    if (!Number.isInteger(takes) || takes < 1 || takes > 1000) {
      throw new RangeError(`sweep: takes must be a whole number from 1 to 1000 (got ${takes})`);
    }
    const period = tonePeriodSamples(f, rateHz);
    if (period > 16000) throw new RangeError(`sweep: a ${f} Hz tone repeats only every ${period} samples`);
    if (!(f >= band[0] && f <= band[1]))
      throw new RangeError(`sweep: the ${f} Hz tone lies outside the analysis band`);
    unit = new Float64Array(period * takes);
    fillToneTakes(unit, f, rateHz, takes);
    stimulus = { method, frequencyHz: f, bandHz: null, periodSamples: period, periods: takes, seed: null };
  } else if (method === 'noise') {
    const nb = options.noiseBandHz ?? [350, 550];
    const length = options.noiseLength ?? 4096;
    const seed = options.seed ?? 1;
    if (!Number.isInteger(length) || length < 64 || length > 65536) {
      throw new RangeError(`sweep: noise length must be a whole number from 64 to 65536 (got ${length})`);
    }
    unit = periodicBandNoise(length, rateHz, nb[0], nb[1], seed);
    stimulus = { method, frequencyHz: null, bandHz: [nb[0], nb[1]], periodSamples: length, periods: 1, seed };
  } else {
    throw new RangeError(`sweep: unknown method "${String(method)}" (use sine or noise)`);
  }

  const period = stimulus.periodSamples;
  const spectrum = new PeriodicSpectrum(period);
  const [lo, hi] = spectrum.binsOf(band[0], band[1], rateHz);
  const toneBin = stimulus.frequencyHz === null ? -1 : Math.round((stimulus.frequencyHz * period) / rateHz);
  const input = new Float64Array(unit.length);
  const output = new Float64Array(unit.length);
  const scratch = new Float64Array(unit.length);
  const error = new Float64Array(unit.length);
  const bx = new Float64Array(2);
  const be = new Float64Array(2);

  const points: SweepPoint[] = [];
  for (const dbm0 of levels) {
    const dbov = dbovFromDbm0(dbm0, first.loadCapacityDbm0);
    const rms = rmsFromDbov(dbov, first.overloadPoint);
    // The tone takes have unit amplitude (RMS 1/sqrt 2), the noise unit RMS.
    const gain = method === 'sine' ? rms * Math.SQRT2 : rms;
    for (let i = 0; i < unit.length; i++) input[i] = gain * unit[i];
    const overloads = runStages(stages, input, output, scratch);
    let signal = 0;
    let noise = 0;
    for (let i = 0; i < unit.length; i++) {
      const e = output[i] - input[i];
      error[i] = e;
      signal += input[i] * input[i];
      noise += e * e;
    }
    let bandSignal = 0;
    let bandNoise = 0;
    for (let p = 0; p < stimulus.periods; p++) {
      const at = p * period;
      if (toneBin < 0) {
        bandSignal += spectrum.meanSquare(input, at);
        bandNoise += spectrum.bandPower(error, lo, hi, at);
      } else {
        // Output at the tone = input's bin + error's bin; the rest of the band is distortion.
        spectrum.bin(input, toneBin, bx, at);
        spectrum.bin(error, toneBin, be, at);
        const re = bx[0] + be[0];
        const im = bx[1] + be[1];
        bandSignal += (2 * (re * re + im * im)) / (period * period);
        const eTone = (2 * (be[0] * be[0] + be[1] * be[1])) / (period * period);
        const d = spectrum.bandPower(error, lo, hi, at) - eTone;
        bandNoise += d > 0 ? d : 0;
      }
    }
    let theoryDb: number | null = null;
    if (theory !== null) {
      theoryDb = theory.evaluate(densityOf(method === 'sine' ? 'sine' : 'gaussian', rms)).snrDb;
    }
    points.push({
      dbm0,
      dbov,
      widebandDb: ratioDb(signal, noise),
      inBandDb: ratioDb(bandSignal, bandNoise),
      theoryDb,
      overloadShare: overloads / unit.length,
    });
  }

  const mask = options.mask === undefined ? (method === 'sine' ? G712_SINE_MASK : null) : options.mask;
  const figure = options.maskFigure ?? 'in-band';
  const judgement =
    mask === null
      ? null
      : judgeAgainstMask(
          mask,
          points.map((p) => p.dbm0),
          points.map((p) => (figure === 'in-band' ? p.inBandDb : p.widebandDb)),
          figure,
        );

  return {
    channel: formatChannel(spec),
    stages: stages.map((q) => q.label),
    rateHz,
    stimulus,
    samplesPerPoint: unit.length,
    analysisBandHz: [band[0], band[1]],
    overloadPoint: first.overloadPoint,
    loadCapacityDbm0: first.loadCapacityDbm0,
    points,
    judgement,
  };
}
