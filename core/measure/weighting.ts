// ITU-T O.41 psophometric weighting of the error, applied to its power spectrum.
//
// The SNR needs only the weighted error's power, not its waveform. By Parseval that
// power is the sum over frequency of the error's power spectrum times |W(f)|^2, so
// the channel meter weights the bins of the averaged error spectrum it keeps anyway
// (spectrum.ts) instead of running a filter: no work per sample, only a sum over
// size/2 + 1 bins when a snapshot is taken. The Hann-window estimate smears each
// bin over about two neighbours (+-31 Hz at 8 kHz with the default 256-point
// frames), negligible against a smooth curve that changes by about 1 dB per 100 Hz
// above 600 Hz and 4 dB at worst, near 300 Hz; a DC offset leaks only into bin 1,
// where the curve is some 70 dB down.
//
// The curve, relative to 800 Hz (ITU-T O.41 Table 1, from memory; the points the
// brief fixes are 300 Hz -10.6, 800 Hz 0, 1000 Hz +1.0, 2000 Hz -3.0,
// 3000 Hz -5.6 dB; the others are recalled too and less certain). Between points
// the weight is interpolated linearly in dB over log frequency; below the first
// point and above the last it is held (our choice).
export const O41_WEIGHTS_DB: readonly (readonly [number, number])[] = Object.freeze([
  [16.66, -85.0],
  [50, -63.0],
  [100, -41.0],
  [200, -21.0],
  [300, -10.6],
  [400, -6.3],
  [500, -3.6],
  [600, -2.0],
  [700, -0.9],
  [800, 0.0],
  [900, 0.6],
  [1000, 1.0],
  [1200, 0.0],
  [1400, -0.9],
  [1600, -1.7],
  [1800, -2.4],
  [2000, -3.0],
  [2500, -4.2],
  [3000, -5.6],
  [3500, -8.5],
  [4000, -15.0],
  [4500, -25.0],
  [5000, -36.0],
  [6000, -43.0],
] as const);

/** O.41 weight in dB at a frequency (see the table's note for what lies between points). */
export function psophometricWeightDb(hz: number): number {
  const t = O41_WEIGHTS_DB;
  if (hz <= t[0][0]) return t[0][1];
  const last = t[t.length - 1];
  if (hz >= last[0]) return last[1];
  let i = 1;
  while (t[i][0] < hz) i++;
  const [f0, w0] = t[i - 1];
  const [f1, w1] = t[i];
  const u = Math.log(hz / f0) / Math.log(f1 / f0);
  return w0 + u * (w1 - w0);
}

/** |W(f)|^2, the O.41 power weight, at a frequency. */
export function psophometricPowerWeight(hz: number): number {
  return Math.pow(10, psophometricWeightDb(hz) / 10);
}

/**
 * Power weights for the size/2 + 1 bins of a power spectrum of `size` points at
 * `rate` (bin k centred on k * rate / size), in the layout of PowerSpectrum.
 */
export function psophometricBinWeights(rate: number, size: number): Float64Array {
  if (!(rate > 0)) throw new RangeError(`rate must be > 0 (got ${rate})`);
  if (!Number.isInteger(size) || size < 4 || (size & (size - 1)) !== 0) {
    throw new RangeError(`spectrum size must be a power of two >= 4 (got ${size})`);
  }
  const w = new Float64Array(size / 2 + 1);
  for (let k = 0; k < w.length; k++) w[k] = psophometricPowerWeight((k * rate) / size);
  return w;
}
