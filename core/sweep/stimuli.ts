// Test stimuli of the level sweeps, built to repeat exactly over the analysed block so
// that the spectrum of the quantization error is exact (see periodic-spectrum.ts).
import { fillGaussian } from '../signals/noise';
import { Xoshiro128 } from '../signals/random';
import { fillSine } from '../signals/tone';

const TWO_PI = 2 * Math.PI;

function gcd(a: number, b: number): number {
  while (b !== 0) {
    const t = a % b;
    a = b;
    b = t;
  }
  return a;
}

/**
 * Samples in one exact period of a tone of a whole number of Hz at a whole-number
 * rate: rate / gcd(rate, f). For 1020 Hz at 8 kHz that is 400 samples (51 cycles),
 * so the tone meets only 400 distinct phases however long it runs.
 */
export function tonePeriodSamples(frequencyHz: number, rateHz: number): number {
  if (!Number.isInteger(frequencyHz) || !Number.isInteger(rateHz) || frequencyHz <= 0 || rateHz <= 0) {
    throw new RangeError(
      `sweep: tone and rate must be whole numbers of Hz (got ${frequencyHz} at ${rateHz})`,
    );
  }
  if (2 * frequencyHz >= rateHz) {
    throw new RangeError(`sweep: a ${frequencyHz} Hz tone does not fit below half of ${rateHz} Hz`);
  }
  return rateHz / gcd(rateHz, frequencyHz);
}

/**
 * `takes` periods of a unit-amplitude tone, each a whole period on its own, take j
 * starting at phase 2 pi (j + 1/2) / (period * takes). Together the takes meet
 * period * takes equally spaced phases (a midpoint grid, symmetric about the peak), so
 * a short block samples the sine's amplitude density as finely as a tone at a
 * frequency with that many distinct phases would, while each take stays a pure
 * 1020 Hz tone analysed on its own.
 */
export function fillToneTakes(out: Float64Array, frequencyHz: number, rateHz: number, takes: number): void {
  const period = tonePeriodSamples(frequencyHz, rateHz);
  if (out.length !== period * takes) throw new RangeError('sweep: tone block has the wrong length');
  for (let j = 0; j < takes; j++) {
    const phase = (TWO_PI * (j + 0.5)) / (period * takes);
    fillSine(out.subarray(j * period, (j + 1) * period), 1, frequencyHz, rateHz, phase);
  }
}

/**
 * Gaussian noise band-limited to [loHz, hiHz], periodic in `length` samples, unit RMS.
 * Built as periodic white Gaussian noise through an ideal (brick-wall) band-pass filter
 * applied circularly: the DFT of white Gaussian noise has independent Gaussian real and
 * imaginary parts in every bin, so keeping the bins inside the band with such seeded
 * coefficients and zeroing the rest is exactly that filter. Every sample is then a
 * sum of many independent Gaussian terms: Gaussian. The block is scaled to unit RMS so
 * that the level of each sweep point is exact.
 */
export function periodicBandNoise(
  length: number,
  rateHz: number,
  loHz: number,
  hiHz: number,
  seed: number,
): Float64Array {
  if (!(loHz > 0 && hiHz > loHz && 2 * hiHz < rateHz)) {
    throw new RangeError(`sweep: noise band ${loHz}..${hiHz} Hz must lie inside 0..${rateHz / 2} Hz`);
  }
  const kLo = Math.ceil((loHz * length) / rateHz - 1e-9);
  const kHi = Math.floor((hiHz * length) / rateHz + 1e-9);
  if (kHi < kLo)
    throw new RangeError(`sweep: noise band ${loHz}..${hiHz} Hz holds no bin of ${length} samples`);
  const coef = new Float64Array(2 * (kHi - kLo + 1));
  fillGaussian(new Xoshiro128(seed), coef);
  const cos = new Float64Array(length);
  const sin = new Float64Array(length);
  for (let i = 0; i < length; i++) {
    cos[i] = Math.cos((TWO_PI * i) / length);
    sin[i] = Math.sin((TWO_PI * i) / length);
  }
  const out = new Float64Array(length);
  for (let k = kLo; k <= kHi; k++) {
    const a = coef[2 * (k - kLo)];
    const b = coef[2 * (k - kLo) + 1];
    let idx = 0;
    for (let n = 0; n < length; n++) {
      out[n] += a * cos[idx] + b * sin[idx];
      idx += k;
      if (idx >= length) idx -= length;
    }
  }
  let ms = 0;
  for (let n = 0; n < length; n++) ms += out[n] * out[n];
  const g = 1 / Math.sqrt(ms / length);
  for (let n = 0; n < length; n++) out[n] *= g;
  return out;
}
