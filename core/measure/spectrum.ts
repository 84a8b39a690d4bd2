// Averaged power spectrum (Welch: Hann window; frames back to back by default, or
// 50 % overlapped) of a stream, for the error and signal spectra that show what the
// noise sounds like. Transforms by the npm package fft.js (pure JavaScript, no
// environment APIs). Back-to-back frames halve the cost of 50 % overlap and still
// give an unbiased average; overlap only tightens its spread.
//
// Scale: bin k holds power, so the bins of a spectrum add up to the signal's mean
// square (Parseval, window power compensated; the bins between 0 and N/2 carry
// both halves of a two-sided spectrum). A tone of amplitude A shows A^2/2 spread
// over the window's main lobe.
import FFT from 'fft.js';

export interface SpectrumSnapshot {
  size: number;
  rate: number;
  /** Width of one bin, Hz (bin k is centred on k * binHz). */
  binHz: number;
  /** Frames averaged since reset. */
  frames: number;
  /** size/2 + 1 bins: the mean over all frames since reset (zeros before the first). */
  mean: Float64Array;
  /** size/2 + 1 bins: an exponential average with time constant recentSeconds. */
  recent: Float64Array;
  recentSeconds: number;
}

export function emptySpectrumSnapshot(size: number): SpectrumSnapshot {
  return {
    size,
    rate: 0,
    binHz: 0,
    frames: 0,
    mean: new Float64Array(size / 2 + 1),
    recent: new Float64Array(size / 2 + 1),
    recentSeconds: 0,
  };
}

/** Transform length for a rate: the power of two nearest 32 ms of samples (8 kHz: 256). */
export function defaultSpectrumSize(rate: number): number {
  const target = Math.max(16, rate * 0.032);
  return 2 ** Math.round(Math.log2(target));
}

export class PowerSpectrum {
  readonly size: number;
  readonly hop: number;
  readonly bins: number;
  private readonly fft: FFT;
  private readonly window: Float64Array;
  private readonly scale: Float64Array; // per bin: one-sided factor / (N * sum w^2)
  private readonly buffer: Float64Array; // raw samples of the frame being filled (overlapped frames)
  private readonly frame: Float64Array; // windowed frame, the transform's input
  private readonly spectrum: Float64Array; // 2N interleaved complex output
  private readonly sum: Float64Array;
  private readonly recent: Float64Array;
  private readonly alpha: number;
  private recentWeight = 0;
  private fill = 0;
  private frames = 0;

  constructor(
    readonly rate: number,
    size = defaultSpectrumSize(rate),
    readonly recentSeconds = 1,
    /** Share of a frame that the next one repeats: 0 (default) or 0.5. */
    readonly overlap: 0 | 0.5 = 0,
  ) {
    if (!Number.isInteger(size) || size < 4 || (size & (size - 1)) !== 0) {
      throw new RangeError(`spectrum size must be a power of two >= 4 (got ${size})`);
    }
    this.size = size;
    this.hop = overlap === 0.5 ? size / 2 : size;
    this.bins = size / 2 + 1;
    this.fft = new FFT(size);
    this.window = new Float64Array(size);
    let u = 0;
    for (let i = 0; i < size; i++) {
      // Periodic Hann: its 50 % overlapped copies add to a constant.
      const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / size);
      this.window[i] = w;
      u += w * w;
    }
    this.scale = new Float64Array(this.bins);
    for (let k = 0; k < this.bins; k++) this.scale[k] = (k === 0 || k === size / 2 ? 1 : 2) / (size * u);
    this.buffer = new Float64Array(overlap === 0.5 ? size : 0);
    this.frame = new Float64Array(size);
    this.spectrum = new Float64Array(2 * size);
    this.sum = new Float64Array(this.bins);
    this.recent = new Float64Array(this.bins);
    this.alpha = Math.exp(-this.hop / (rate * recentSeconds));
  }

  reset(): void {
    this.buffer.fill(0);
    this.frame.fill(0);
    this.sum.fill(0);
    this.recent.fill(0);
    this.recentWeight = 0;
    this.fill = 0;
    this.frames = 0;
  }

  /** Adds `length` samples of x from index `from`. */
  add(x: ArrayLike<number>, from: number, length: number): void {
    const n = this.size;
    const w = this.window;
    // Back to back: window straight into the transform's input. Overlapped: keep the raw
    // frame, since its second half starts the next one.
    const direct = this.hop === n;
    const buf = direct ? this.frame : this.buffer;
    let i = 0;
    while (i < length) {
      const take = Math.min(length - i, n - this.fill);
      const at = this.fill;
      if (direct) for (let j = 0; j < take; j++) buf[at + j] = x[from + i + j] * w[at + j];
      else for (let j = 0; j < take; j++) buf[at + j] = x[from + i + j];
      this.fill += take;
      i += take;
      if (this.fill === n) {
        if (!direct) {
          const f = this.frame;
          for (let j = 0; j < n; j++) f[j] = buf[j] * w[j];
          buf.copyWithin(0, this.hop, n);
        }
        this.transform();
        this.fill = n - this.hop;
      }
    }
  }

  /** Power of the windowed frame in `frame`, into the averages. */
  private transform(): void {
    this.fft.realTransform(this.spectrum, this.frame);
    const out = this.spectrum;
    const a = this.alpha;
    const b = 1 - a;
    const scale = this.scale;
    const sum = this.sum;
    const recent = this.recent;
    for (let k = 0; k < this.bins; k++) {
      const re = out[2 * k];
      const im = out[2 * k + 1];
      const p = (re * re + im * im) * scale[k];
      sum[k] += p;
      recent[k] = a * recent[k] + b * p;
    }
    this.recentWeight = a * this.recentWeight + b;
    this.frames++;
  }

  /** Frames averaged since reset. */
  get frameCount(): number {
    return this.frames;
  }

  /**
   * The mean over frames of sum_k P(k) w(k): with no weights the mean square of the
   * framed samples (Parseval); with size/2 + 1 power weights |W(f_k)|^2 the power of
   * the stream filtered by W. 0 before the first frame.
   */
  meanPower(weights?: Float64Array): number {
    if (this.frames === 0) return 0;
    const sum = this.sum;
    let p = 0;
    if (weights === undefined) {
      for (let k = 0; k < this.bins; k++) p += sum[k];
    } else {
      if (weights.length !== this.bins) throw new RangeError('spectrum: weights do not match the bins');
      for (let k = 0; k < this.bins; k++) p += sum[k] * weights[k];
    }
    return p / this.frames;
  }

  snapshot(into: SpectrumSnapshot = emptySpectrumSnapshot(this.size)): SpectrumSnapshot {
    if (into.mean.length !== this.bins || into.recent.length !== this.bins) {
      throw new RangeError('spectrum snapshot: buffers do not match this meter');
    }
    into.size = this.size;
    into.rate = this.rate;
    into.binHz = this.rate / this.size;
    into.frames = this.frames;
    into.recentSeconds = this.recentSeconds;
    const inv = this.frames > 0 ? 1 / this.frames : 0;
    const rinv = this.recentWeight > 0 ? 1 / this.recentWeight : 0;
    for (let k = 0; k < this.bins; k++) {
      into.mean[k] = this.sum[k] * inv;
      into.recent[k] = this.recent[k] * rinv;
    }
    return into;
  }
}
