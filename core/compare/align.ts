// Lining up a channel's output with the signal that was fed to it, for channels
// that are not ours (a device's or a firmware's output recorded against its input):
// the delay by cross-correlation, the gain by least squares.
//
// Model: out[n] = g ref[n - d] + e[n], e the channel's own error. The delay d is
// the lag that maximises the normalised cross-correlation
//   rho(d) = sum_n ref[n] out[n + d] / sqrt(sum ref^2 sum out^2)   (sums over the overlap)
// in magnitude (a channel may invert the polarity), computed for every lag at once
// by FFT (fft.js) with zero padding, so nothing wraps around. The gain minimising
// sum (out[n] - g ref[n - d])^2 is g = sum ref out / sum ref^2. For this model
// rho^2 = S / (S + N) with S / N the channel's SNR, so a low |rho| means either a
// poor channel or a bad match, and the figures that follow mean little.
import FFT from 'fft.js';

export interface DelayEstimate {
  /** out[n] lines up with ref[n - delay]; negative when the output leads. */
  delay: number;
  /** rho at that lag (signed: negative for an inverted output). */
  correlation: number;
  /** Parabolic refinement of the peak, -0.5 .. 0.5 samples: the delay is about delay + fraction. */
  fraction: number;
  /** Largest |rho| outside the peak's main lobe over |rho| at the peak (1 for a periodic signal). */
  ambiguity: number;
  /** Overlap the figures rest on, samples. */
  overlap: number;
}

function nextPow2(n: number): number {
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

/**
 * Raw cross-correlation r[d] = sum_n a[n] b[n + d] for d = -maxLag .. maxLag, as
 * out[d + maxLag] (terms outside either signal are zero).
 */
export function crossCorrelation(a: ArrayLike<number>, b: ArrayLike<number>, maxLag: number): Float64Array {
  if (!Number.isInteger(maxLag) || maxLag < 0)
    throw new RangeError(`maxLag must be a whole number >= 0 (got ${maxLag})`);
  const size = Math.max(4, nextPow2(a.length + b.length + 1));
  const fft = new FFT(size);
  const pa = new Float64Array(size);
  const pb = new Float64Array(size);
  for (let i = 0; i < a.length; i++) pa[i] = a[i];
  for (let i = 0; i < b.length; i++) pb[i] = b[i];
  const fa = new Float64Array(2 * size);
  const fb = new Float64Array(2 * size);
  fft.realTransform(fa, pa);
  fft.completeSpectrum(fa);
  fft.realTransform(fb, pb);
  fft.completeSpectrum(fb);
  // conj(A) B: its inverse is the correlation, lag d at index d mod size.
  const prod = new Float64Array(2 * size);
  for (let k = 0; k < size; k++) {
    const ar = fa[2 * k];
    const ai = fa[2 * k + 1];
    const br = fb[2 * k];
    const bi = fb[2 * k + 1];
    prod[2 * k] = ar * br + ai * bi;
    prod[2 * k + 1] = ar * bi - ai * br;
  }
  const corr = new Float64Array(2 * size);
  fft.inverseTransform(corr, prod);
  const out = new Float64Array(2 * maxLag + 1);
  for (let d = -maxLag; d <= maxLag; d++) {
    const inside = d > -a.length && d < b.length;
    out[d + maxLag] = inside ? corr[2 * (((d % size) + size) % size)] : 0;
  }
  return out;
}

/** Energy of x[from .. to) from prefix sums of squares. */
function rangeEnergy(prefix: Float64Array, from: number, to: number): number {
  return to > from ? prefix[to] - prefix[from] : 0;
}

function prefixSquares(x: ArrayLike<number>): Float64Array {
  const p = new Float64Array(x.length + 1);
  for (let i = 0; i < x.length; i++) p[i + 1] = p[i] + x[i] * x[i];
  return p;
}

/** Overlap of ref[n - d] and out[n]: n from max(0, d) to min(out.length, ref.length + d). */
function overlapOf(refLength: number, outLength: number, d: number): [number, number] {
  return [Math.max(0, d), Math.min(outLength, refLength + d)];
}

/**
 * The delay between `ref` and `out` within +-maxLag samples, with its normalised
 * correlation. Lags whose overlap is shorter than half the shorter signal are not
 * considered, so a lucky match of a few samples at the edge cannot win.
 */
export function estimateDelay(ref: ArrayLike<number>, out: ArrayLike<number>, maxLag: number): DelayEstimate {
  const r = crossCorrelation(ref, out, maxLag);
  const pr = prefixSquares(ref);
  const po = prefixSquares(out);
  const minOverlap = Math.max(1, Math.floor(Math.min(ref.length, out.length) / 2));
  const rho = new Float64Array(r.length);
  let best = -1;
  for (let d = -maxLag; d <= maxLag; d++) {
    const [from, to] = overlapOf(ref.length, out.length, d);
    const k = d + maxLag;
    if (to - from < minOverlap) continue;
    const er = rangeEnergy(pr, from - d, to - d);
    const eo = rangeEnergy(po, from, to);
    rho[k] = er > 0 && eo > 0 ? r[k] / Math.sqrt(er * eo) : 0;
    if (best < 0 || Math.abs(rho[k]) > Math.abs(rho[best])) best = k;
  }
  if (best < 0) return { delay: 0, correlation: 0, fraction: 0, ambiguity: 1, overlap: 0 };
  const peak = Math.abs(rho[best]);
  let fraction = 0;
  if (best > 0 && best < rho.length - 1) {
    const a = Math.abs(rho[best - 1]);
    const c = Math.abs(rho[best + 1]);
    const den = a - 2 * peak + c;
    if (den < 0) fraction = Math.max(-0.5, Math.min(0.5, (0.5 * (a - c)) / den));
  }
  // Main lobe: out to where |rho| first falls below half the peak on either side.
  let lo = best;
  while (lo > 0 && Math.abs(rho[lo - 1]) >= 0.5 * peak) lo--;
  let hi = best;
  while (hi < rho.length - 1 && Math.abs(rho[hi + 1]) >= 0.5 * peak) hi++;
  let side = 0;
  for (let k = 0; k < rho.length; k++)
    if ((k < lo - 1 || k > hi + 1) && Math.abs(rho[k]) > side) side = Math.abs(rho[k]);
  const delay = best - maxLag;
  const [from, to] = overlapOf(ref.length, out.length, delay);
  return {
    delay,
    correlation: rho[best],
    fraction,
    ambiguity: peak > 0 ? side / peak : 1,
    overlap: to - from,
  };
}

export interface GainEstimate {
  /** Least-squares gain g of out[n] = g ref[n - delay]. */
  gain: number;
  /** Normalised correlation over the overlap. */
  correlation: number;
  /** SNR of out against g ref over the overlap, dB (null without signal or error). */
  snrDb: number | null;
}

/** Least-squares gain at a known delay, over the overlap of the two signals. */
export function leastSquaresGain(
  ref: ArrayLike<number>,
  out: ArrayLike<number>,
  delay: number,
): GainEstimate {
  const [from, to] = overlapOf(ref.length, out.length, delay);
  let rr = 0;
  let ro = 0;
  let oo = 0;
  for (let n = from; n < to; n++) {
    const x = ref[n - delay];
    const y = out[n];
    rr += x * x;
    ro += x * y;
    oo += y * y;
  }
  const gain = rr > 0 ? ro / rr : 0;
  // Residual energy sum (y - g x)^2 = oo - ro^2 / rr, kept from going negative by rounding.
  const residual = Math.max(0, oo - gain * ro);
  const signal = gain * gain * rr;
  return {
    gain,
    correlation: rr > 0 && oo > 0 ? ro / Math.sqrt(rr * oo) : 0,
    snrDb: signal > 0 && residual > 0 ? 10 * Math.log10(signal / residual) : null,
  };
}
