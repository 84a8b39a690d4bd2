// Measured level distributions turned into design densities. A histogram of sample
// values (signed) or magnitudes becomes an even, piecewise-constant density: the
// design is always symmetric, so a signed histogram is folded onto magnitudes (the
// density is the average of the histogram and its mirror image).
import { type DensityShape, densityOf } from '../theory/densities';
import { PiecewiseDensity } from './design-density';

/**
 * Histogram of instantaneous magnitude in dBov bins, as the level-spread meter keeps it
 * (its counts with loDbov -96 and binDb 0.5, its underflow as belowCount and its
 * overload as overloadCount).
 */
export interface DbovHistogram {
  /** Lower edge of the first bin, dBov (for example -96). */
  loDbov: number;
  /** Bin width, dB (for example 0.5). */
  binDb: number;
  /** Samples per bin, bin i covering [lo + i bin, lo + (i+1) bin) dBov. */
  counts: ArrayLike<number>;
  /** Samples below the first bin, zeros included (spread over [0, first edge]). */
  belowCount?: number;
  /** Samples beyond the overload point (spread over one bin above it). */
  overloadCount?: number;
}

/** Density from a magnitude histogram: bin i covers |x| in [edges[i], edges[i+1]). */
export function densityFromMagnitudes(
  edges: ArrayLike<number>,
  counts: ArrayLike<number>,
  label = 'measured',
): PiecewiseDensity {
  return new PiecewiseDensity(label, edges, counts);
}

/**
 * Density from a histogram of signed sample values (bin i covers [edges[i], edges[i+1])),
 * folded onto magnitudes: each bin's count is spread evenly over its magnitude range.
 */
export function densityFromValues(
  edges: ArrayLike<number>,
  counts: ArrayLike<number>,
  label = 'measured',
): PiecewiseDensity {
  const n = counts.length;
  if (n < 1 || edges.length !== n + 1) {
    throw new RangeError(`histogram: needs one edge more than bins (${edges.length} edges, ${n} bins)`);
  }
  for (let i = 0; i < n; i++) {
    if (!(edges[i + 1] > edges[i]) || !Number.isFinite(edges[i]) || !Number.isFinite(edges[i + 1])) {
      throw new RangeError(`histogram: edge ${i + 2} does not ascend or is not finite`);
    }
  }
  const cuts = new Set<number>([0]);
  for (let i = 0; i <= n; i++) cuts.add(Math.abs(edges[i]));
  const mag = Float64Array.from([...cuts].sort((a, b) => a - b));
  const mass = new Float64Array(mag.length - 1);
  const spread = (lo: number, hi: number, count: number): void => {
    if (!(hi > lo) || !(count > 0)) return;
    const density = count / (hi - lo);
    for (let j = 0; j < mass.length; j++) {
      const a = Math.max(lo, mag[j]);
      const b = Math.min(hi, mag[j + 1]);
      if (b > a) mass[j] += density * (b - a);
    }
  };
  for (let i = 0; i < n; i++) {
    const c = counts[i];
    if (!(c >= 0) || !Number.isFinite(c)) throw new RangeError(`histogram: bin ${i + 1} has a bad count`);
    const a = edges[i];
    const b = edges[i + 1];
    if (a >= 0) spread(a, b, c);
    else if (b <= 0) spread(-b, -a, c);
    else {
      // A bin across zero: its two sides by their widths.
      spread(0, -a, (c * -a) / (b - a));
      spread(0, b, (c * b) / (b - a));
    }
  }
  return new PiecewiseDensity(label, mag, mass);
}

/** Density from a dBov magnitude histogram of a channel whose overload point is given. */
export function densityFromDbov(
  h: DbovHistogram,
  overloadPoint: number,
  label = 'measured',
): PiecewiseDensity {
  if (!(h.binDb > 0) || !Number.isFinite(h.loDbov)) throw new RangeError('histogram: bad dBov bins');
  const n = h.counts.length;
  const below = h.belowCount ?? 0;
  const over = h.overloadCount ?? 0;
  const edges: number[] = [0];
  const mass: number[] = [below];
  for (let i = 0; i <= n; i++) edges.push(overloadPoint * Math.pow(10, (h.loDbov + i * h.binDb) / 20));
  for (let i = 0; i < n; i++) mass.push(h.counts[i]);
  const top = edges[edges.length - 1];
  if (over > 0) {
    edges.push(top * Math.pow(10, h.binDb / 20));
    mass.push(over);
  }
  return new PiecewiseDensity(label, edges, mass);
}

/**
 * Histogram of sample magnitudes in dBov bins, as the level-spread meter keeps it
 * (samples at or beyond the overload point go to the overload count).
 */
export function dbovHistogramOf(
  samples: ArrayLike<number>,
  overloadPoint: number,
  loDbov = -96,
  binDb = 0.5,
): DbovHistogram {
  const bins = Math.round(-loDbov / binDb);
  const counts = new Float64Array(bins);
  let belowCount = 0;
  let overloadCount = 0;
  const floor = overloadPoint * Math.pow(10, loDbov / 20);
  for (let i = 0; i < samples.length; i++) {
    const m = Math.abs(samples[i]);
    if (m > overloadPoint) overloadCount++;
    else if (m < floor) belowCount++;
    else {
      const k = Math.floor((20 * Math.log10(m / overloadPoint) - loDbov) / binDb);
      counts[k < 0 ? 0 : k >= bins ? bins - 1 : k]++;
    }
  }
  return { loDbov, binDb, counts, belowCount, overloadCount };
}

/**
 * Long-term density of a talker whose frames each have the given shape at their own
 * RMS level: the mixture of those frame densities, weighted by the frames, laid on a
 * fine magnitude grid (0.05 dB bins from 80 dB below the softest frame) with each
 * bin's exact mass. The input's full scale clips every frame (`clip`, default the
 * overload point the levels refer to): the mass beyond it goes to the top bin, just
 * below full scale, so a quantizer designed for the talker never reaches past it.
 */
export function talkerDensity(
  levelsDbov: ArrayLike<number>,
  weights: ArrayLike<number>,
  shape: Exclude<DensityShape, 'sine'>,
  overloadPoint = 1,
  clip = overloadPoint,
): PiecewiseDensity {
  const k = levelsDbov.length;
  if (k < 1 || weights.length !== k) throw new RangeError('talker: needs one weight per level');
  let lo = Infinity;
  let hi = -Infinity;
  let total = 0;
  for (let i = 0; i < k; i++) {
    if (!Number.isFinite(levelsDbov[i]) || !(weights[i] >= 0))
      throw new RangeError(`talker: bad level ${i + 1}`);
    if (weights[i] > 0) {
      lo = Math.min(lo, levelsDbov[i]);
      hi = Math.max(hi, levelsDbov[i]);
      total += weights[i];
    }
  }
  if (!(total > 0)) throw new RangeError('talker: no frames');
  const parts = [];
  for (let i = 0; i < k; i++) {
    if (weights[i] > 0) {
      parts.push({
        d: densityOf(shape, overloadPoint * Math.pow(10, levelsDbov[i] / 20)),
        w: weights[i] / total,
      });
    }
  }
  // Gaussian mass beyond 9 sigma is below 1e-18, Laplacian beyond 30 sigma below 1e-18.
  const reachDb = 20 * Math.log10(shape === 'gaussian' ? 9 : 30);
  const stepDb = 0.05;
  const startDb = lo - 80;
  const topDb = Math.min(hi + reachDb, 20 * Math.log10(clip / overloadPoint));
  const count = Math.max(1, Math.ceil((topDb - startDb) / stepDb));
  const edges = new Float64Array(count + 2);
  for (let i = 0; i <= count; i++)
    edges[i + 1] = overloadPoint * Math.pow(10, (topDb - (count - i) * stepDb) / 20);
  const tails = new Float64Array(3);
  const upper = new Float64Array(parts.length);
  const mass = new Float64Array(count + 1);
  for (let j = 0; j < parts.length; j++) {
    parts[j].d.tails(0, tails, 0);
    upper[j] = tails[0];
  }
  for (let i = 1; i < edges.length; i++) {
    let m = 0;
    for (let j = 0; j < parts.length; j++) {
      parts[j].d.tails(edges[i], tails, 0);
      m += parts[j].w * (upper[j] - tails[0]);
      upper[j] = tails[0];
    }
    mass[i - 1] = 2 * m;
  }
  // What lies beyond the top edge (clipped samples) joins the top bin.
  let beyond = 0;
  for (let j = 0; j < parts.length; j++) beyond += parts[j].w * upper[j];
  mass[count] += 2 * beyond;
  return new PiecewiseDensity('talker', edges, mass);
}
