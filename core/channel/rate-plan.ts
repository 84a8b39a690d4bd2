// How a channel rate is reached from the input rate: the whole decimation factor
// split into stages, and the lowpass each stage needs. Interpolation back to the
// input rate runs the same stages in reverse with the same filters.
//
// Band edges: the 8 kHz channel passes 0-3400 Hz (the voice band's upper edge) and
// stops from 4000 Hz, the strict choice: nothing aliases into 0-4000 Hz at all. The
// 16 kHz (wideband) channel passes 0-7000 Hz and stops from 8000 Hz. Other rates
// keep the 16 kHz proportions (pass 0.4375 rate, stop rate / 2).
//
// Stages: prime factors in descending order (48 kHz -> 8 kHz: by 3, then by 2), so
// the sharp filter runs last, at the lowest rate, where its many taps cost least.
// An early stage only has to stop what would alias into 0 .. rate/2 of the final
// channel: from (its output rate - channel rate / 2). The later stages remove the
// rest, so the early filters are short.
import { designLowpass, type LowpassDesign } from './fir-design';

/** The attenuation every stopband must reach (issue 3), dB. */
export const STOPBAND_REQUIRED_DB = 60;
/** What the Kaiser formulas are asked for: the required figure plus a margin for their approximation. */
export const STOPBAND_DESIGN_DB = 64;
/** Passband ripple allowed on the 8 kHz path, dB peak to peak (issue 3). */
export const PASSBAND_RIPPLE_ALLOWED_DB = 0.5;

export interface ChannelBand {
  passHz: number;
  stopHz: number;
}

/** Pass and stop edges of the channel at `rateHz`. */
export function channelBand(rateHz: number): ChannelBand {
  if (rateHz === 8000) return { passHz: 3400, stopHz: 4000 };
  return { passHz: 0.4375 * rateHz, stopHz: rateHz / 2 };
}

export interface RateStage {
  factor: number;
  /** Rate at the stage's high side (its decimator input, its interpolator output). */
  highRateHz: number;
  lowRateHz: number;
  design: LowpassDesign;
}

export interface RatePlan {
  inputRateHz: number;
  channelRateHz: number;
  /** inputRateHz / channelRateHz, a whole number. */
  factor: number;
  /** In decimation order (highest rate first); empty when the factor is 1. */
  stages: RateStage[];
  /**
   * Group delay of the decimation chain in input samples: channel sample m (taken
   * at input index factor * m) shows the band-limited input of index factor * m - this.
   */
  decimationLatency: number;
  /** Decimation and interpolation back to the input rate, input samples. */
  roundTripLatency: number;
}

/** Prime factors of n in descending order. */
export function stageFactors(n: number): number[] {
  const f: number[] = [];
  let m = n;
  for (let p = 2; p * p <= m; p++) {
    while (m % p === 0) {
      f.push(p);
      m /= p;
    }
  }
  if (m > 1) f.push(m);
  return f.sort((a, b) => b - a);
}

export function planRate(inputRateHz: number, channelRateHz: number): RatePlan {
  if (!(Number.isInteger(inputRateHz) && inputRateHz > 0))
    throw new RangeError(`input rate must be a whole number of Hz (got ${inputRateHz})`);
  const factor = inputRateHz / channelRateHz;
  if (!Number.isInteger(factor) || factor < 1) {
    throw new RangeError(
      `a ${channelRateHz} Hz channel needs an input rate that is a whole multiple of it (got ${inputRateHz} Hz)`,
    );
  }
  const band = channelBand(channelRateHz);
  const stages: RateStage[] = [];
  let rate = inputRateHz;
  let latency = 0;
  const factors = stageFactors(factor);
  factors.forEach((m, i) => {
    const low = rate / m;
    const last = i === factors.length - 1;
    const design = designLowpass({
      rateHz: rate,
      passHz: band.passHz,
      stopHz: last ? band.stopHz : low - channelRateHz / 2,
      attenuationDb: STOPBAND_DESIGN_DB,
    });
    stages.push({ factor: m, highRateHz: rate, lowRateHz: low, design });
    latency += design.delay * (inputRateHz / rate);
    rate = low;
  });
  return {
    inputRateHz,
    channelRateHz,
    factor,
    stages,
    decimationLatency: latency,
    roundTripLatency: 2 * latency,
  };
}
