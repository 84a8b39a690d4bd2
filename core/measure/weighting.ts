// ITU-T O.41 psophometric weighting of the error, as a linear-phase FIR designed
// by frequency sampling at the channel rate.
import FFT from 'fft.js';

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

/** Default FIR length: about 8 ms of taps (125 Hz resolution), odd, at most 513. */
export function defaultPsophometricTaps(rate: number): number {
  return Math.min(513, 2 * Math.round(rate * 0.008) + 1);
}

/**
 * Taps of a linear-phase (odd length, symmetric) FIR whose magnitude follows the
 * O.41 curve: the curve sampled at k * rate / taps, an inverse DFT of the
 * zero-phase samples, a Hann taper against ripple between the samples, then a
 * scale that makes the gain at 800 Hz exactly 0 dB.
 */
export function designPsophometricFir(rate: number, taps = defaultPsophometricTaps(rate)): Float64Array {
  if (!(rate > 0)) throw new RangeError(`rate must be > 0 (got ${rate})`);
  if (!Number.isInteger(taps) || taps < 3 || taps % 2 === 0) {
    throw new RangeError(`FIR length must be an odd whole number >= 3 (got ${taps})`);
  }
  const m = (taps - 1) / 2;
  const amp = new Float64Array(m + 1);
  for (let k = 0; k <= m; k++) amp[k] = Math.pow(10, psophometricWeightDb((k * rate) / taps) / 20);
  const h = new Float64Array(taps);
  for (let n = 0; n < taps; n++) {
    let s = amp[0];
    for (let k = 1; k <= m; k++) s += 2 * amp[k] * Math.cos((2 * Math.PI * k * (n - m)) / taps);
    const taper = 0.5 + 0.5 * Math.cos((Math.PI * (n - m)) / (m + 1));
    h[n] = (s / taps) * taper;
  }
  const g = Math.abs(firGainAt(h, 800, rate));
  for (let n = 0; n < taps; n++) h[n] /= g;
  return h;
}

/** Zero-phase gain (real) of a symmetric odd-length FIR at a frequency. */
export function firGainAt(h: Float64Array, hz: number, rate: number): number {
  const m = (h.length - 1) / 2;
  const w = (2 * Math.PI * hz) / rate;
  let s = h[m];
  for (let k = 1; k <= m; k++) s += 2 * h[m + k] * Math.cos(w * k);
  return s;
}

/**
 * Streaming psophometric filter that adds up the energy of its output: the
 * error's weighted power is what the SNR needs, not the waveform. The FIR runs by
 * fast convolution (overlap-save with fft.js): blocks of N - L + 1 new samples,
 * N a power of two at least 4 L, so a 129-tap filter costs about as much per
 * sample as a 16-tap direct one. Output energy is therefore added a block at a
 * time; `outputs` says how many outputs it covers.
 */
export class PsophometricFilter {
  readonly taps: Float64Array;
  readonly fftSize: number;
  /** New samples per block. */
  readonly blockLength: number;
  private readonly fft: FFT;
  private readonly response: Float64Array; // complex spectrum of the zero-padded taps
  private readonly input: Float64Array; // L - 1 samples of history, then the new block
  private readonly spectrum: Float64Array;
  private readonly output: Float64Array;
  private fill: number;
  /** Sum of squared outputs since reset, and how many outputs it holds. */
  energySum = 0;
  outputs = 0;

  constructor(
    readonly rate: number,
    tapCount = defaultPsophometricTaps(rate),
  ) {
    this.taps = designPsophometricFir(rate, tapCount);
    const L = this.taps.length;
    let n = 16;
    while (n < 4 * L) n *= 2;
    this.fftSize = n;
    this.blockLength = n - L + 1;
    this.fft = new FFT(n);
    const padded = new Float64Array(n);
    padded.set(this.taps);
    this.response = new Float64Array(2 * n);
    this.fft.realTransform(this.response, padded);
    this.fft.completeSpectrum(this.response);
    this.input = new Float64Array(n);
    this.spectrum = new Float64Array(2 * n);
    this.output = new Float64Array(2 * n);
    this.fill = L - 1;
  }

  reset(): void {
    this.input.fill(0);
    this.fill = this.taps.length - 1;
    this.energySum = 0;
    this.outputs = 0;
  }

  /** Filters `length` samples of x from `from`, adding the squared outputs of each full block to energySum. */
  add(x: ArrayLike<number>, from: number, length: number): void {
    const n = this.fftSize;
    const buf = this.input;
    let i = 0;
    while (i < length) {
      const take = Math.min(length - i, n - this.fill);
      const at = this.fill;
      for (let j = 0; j < take; j++) buf[at + j] = x[from + i + j];
      this.fill += take;
      i += take;
      if (this.fill === n) this.block();
    }
  }

  private block(): void {
    const n = this.fftSize;
    const L = this.taps.length;
    const X = this.spectrum;
    const H = this.response;
    this.fft.realTransform(X, this.input);
    this.fft.completeSpectrum(X);
    for (let k = 0; k < 2 * n; k += 2) {
      const xr = X[k];
      const xi = X[k + 1];
      const hr = H[k];
      const hi = H[k + 1];
      X[k] = xr * hr - xi * hi;
      X[k + 1] = xr * hi + xi * hr;
    }
    this.fft.inverseTransform(this.output, X);
    // Outputs L-1 .. n-1 are free of the circular wrap (overlap-save); the output is real.
    const y = this.output;
    let e = 0;
    for (let t = L - 1; t < n; t++) {
      const v = y[2 * t];
      e += v * v;
    }
    this.energySum += e;
    this.outputs += n - L + 1;
    this.input.copyWithin(0, n - L + 1, n);
    this.fill = L - 1;
  }
}
