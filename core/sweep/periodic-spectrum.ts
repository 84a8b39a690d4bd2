// Power in DFT bins of one period of a periodic real signal. The sweep stimuli repeat
// exactly over the analysed block, and a memoryless quantizer keeps the error periodic
// too, so every component falls exactly on a bin: no window, no leakage, and the
// power in a band is a plain sum of bins. Single bins come from a cosine/sine table of
// one period (index k n mod N); whole bands of a power-of-two period from a radix-2 FFT,
// of any other period from the few bins on the smaller side of the band (Parseval).

const TWO_PI = 2 * Math.PI;

export class PeriodicSpectrum {
  readonly length: number;
  private readonly cos: Float64Array;
  private readonly sin: Float64Array;
  /** FFT work arrays and bit-reversal table, for power-of-two periods only. */
  private readonly fftRe: Float64Array | null = null;
  private readonly fftIm: Float64Array | null = null;
  private readonly reversed: Uint32Array | null = null;

  constructor(length: number) {
    if (!Number.isInteger(length) || length < 2) {
      throw new RangeError(`spectrum: period must be a whole number of samples >= 2 (got ${length})`);
    }
    this.length = length;
    this.cos = new Float64Array(length);
    this.sin = new Float64Array(length);
    for (let i = 0; i < length; i++) {
      this.cos[i] = Math.cos((TWO_PI * i) / length);
      this.sin[i] = Math.sin((TWO_PI * i) / length);
    }
    if ((length & (length - 1)) === 0) {
      this.fftRe = new Float64Array(length);
      this.fftIm = new Float64Array(length);
      this.reversed = new Uint32Array(length);
      const bits = Math.round(Math.log2(length));
      for (let i = 0; i < length; i++) {
        let r = 0;
        for (let b = 0; b < bits; b++) r |= ((i >> b) & 1) << (bits - 1 - b);
        this.reversed[i] = r;
      }
    }
  }

  /** In-place iterative radix-2 FFT of x[at .. at+N) into fftRe/fftIm (power-of-two N). */
  private fft(x: ArrayLike<number>, at: number, re: Float64Array, im: Float64Array, rev: Uint32Array): void {
    const n = this.length;
    const c = this.cos;
    const s = this.sin;
    for (let i = 0; i < n; i++) {
      re[rev[i]] = x[at + i];
      im[i] = 0;
    }
    for (let size = 2; size <= n; size <<= 1) {
      const half = size >> 1;
      const stride = n / size;
      for (let start = 0; start < n; start += size) {
        for (let j = 0; j < half; j++) {
          const wr = c[j * stride];
          const wi = -s[j * stride];
          const a = start + j;
          const b = a + half;
          const tr = wr * re[b] - wi * im[b];
          const ti = wr * im[b] + wi * re[b];
          re[b] = re[a] - tr;
          im[b] = im[a] - ti;
          re[a] += tr;
          im[a] += ti;
        }
      }
    }
  }

  /** Highest bin of the one-sided spectrum (N/2, rounded down). */
  get lastBin(): number {
    return this.length >> 1;
  }

  /** Real part of bin k, sum of x[n] cos(2 pi k n / N), over x[at .. at+N). */
  private re(x: ArrayLike<number>, at: number, k: number): number {
    const n = this.length;
    const c = this.cos;
    let idx = 0;
    let s = 0;
    for (let i = 0; i < n; i++) {
      s += x[at + i] * c[idx];
      idx += k;
      if (idx >= n) idx -= n;
    }
    return s;
  }

  private im(x: ArrayLike<number>, at: number, k: number): number {
    const n = this.length;
    const t = this.sin;
    let idx = 0;
    let s = 0;
    for (let i = 0; i < n; i++) {
      s -= x[at + i] * t[idx];
      idx += k;
      if (idx >= n) idx -= n;
    }
    return s;
  }

  /** Writes bin k's complex value (unnormalised DFT) into out[0], out[1]. */
  bin(x: ArrayLike<number>, k: number, out: Float64Array, at = 0): void {
    out[0] = this.re(x, at, k);
    out[1] = this.im(x, at, k);
  }

  /** Share of the mean square carried by bin k (0 <= k <= N/2), one-sided. */
  binPower(x: ArrayLike<number>, k: number, at = 0): number {
    const n = this.length;
    const r = this.re(x, at, k);
    const i = this.im(x, at, k);
    const twoSided = k === 0 || 2 * k === n ? 1 : 2;
    return (twoSided * (r * r + i * i)) / (n * n);
  }

  /** Mean square over one period. */
  meanSquare(x: ArrayLike<number>, at = 0): number {
    const n = this.length;
    let s = 0;
    for (let i = 0; i < n; i++) s += x[at + i] * x[at + i];
    return s / n;
  }

  /**
   * Mean square carried by bins lo..hi (inclusive, 0 <= lo <= hi <= N/2). Computes
   * whichever side is smaller, the band itself or its complement (Parseval).
   */
  bandPower(x: ArrayLike<number>, lo: number, hi: number, at = 0): number {
    const last = this.lastBin;
    if (!(lo >= 0 && hi <= last && lo <= hi)) {
      throw new RangeError(`spectrum: band ${lo}..${hi} is outside bins 0..${last}`);
    }
    if (this.fftRe !== null && this.fftIm !== null && this.reversed !== null) {
      const re = this.fftRe;
      const im = this.fftIm;
      this.fft(x, at, re, im, this.reversed);
      const n = this.length;
      let p = 0;
      for (let k = lo; k <= hi; k++) {
        const twoSided = k === 0 || 2 * k === n ? 1 : 2;
        p += twoSided * (re[k] * re[k] + im[k] * im[k]);
      }
      return p / (n * n);
    }
    const inside = hi - lo + 1;
    if (2 * inside <= last + 1) {
      let p = 0;
      for (let k = lo; k <= hi; k++) p += this.binPower(x, k, at);
      return p;
    }
    let out = 0;
    for (let k = 0; k < lo; k++) out += this.binPower(x, k, at);
    for (let k = hi + 1; k <= last; k++) out += this.binPower(x, k, at);
    const p = this.meanSquare(x, at) - out;
    return p > 0 ? p : 0;
  }

  /** Lowest and highest bin whose frequency lies in [loHz, hiHz] at a sample rate. */
  binsOf(loHz: number, hiHz: number, rateHz: number): [number, number] {
    const n = this.length;
    const lo = Math.ceil((loHz * n) / rateHz - 1e-9);
    const hi = Math.min(Math.floor((hiHz * n) / rateHz + 1e-9), this.lastBin);
    if (!(lo <= hi)) throw new RangeError(`spectrum: no bin lies in ${loHz}..${hiHz} Hz`);
    return [Math.max(lo, 0), hi];
  }
}
