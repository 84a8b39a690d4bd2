// How a channel rate is reached from the input rate: the whole decimation factor
// split into stages, and the lowpass each stage needs. Interpolation back to the
// input rate runs the same stages in reverse with the same filters.
//
// Band edges: the 8 kHz channel passes 0-3400 Hz (the voice band's upper edge) and
// stops from 4600 Hz. Why 4600 and not 4000: after decimation to 8 kHz a component
// at f in 4000-4600 Hz lands at 8000 - f, in 3400-4000 Hz, above the 300-3400 Hz
// band our requirements constrain, and the Reference goes through the same path, so no SNR
// figure counts it. Everything that could land in 0-3400 Hz (4600 Hz and up) is at
// least 60 dB down. 4.6 kHz is also where PCM practice starts guarding against
// aliasing (ITU-T G.712's discrimination against out-of-band input, from memory).
// The edges 3400 and 4600 sit symmetric about 4000 Hz, a quarter of 16 kHz, so the
// 16k -> 8k stage is a half-band filter, every other tap zero (fir-design.ts).
// The 16 kHz (wideband) channel passes 0-7000 Hz and stops from 8000 Hz. Other
// rates keep the 16 kHz proportions (pass 0.4375 rate, stop rate / 2).
//
// Stages: prime factors in descending order (48 kHz -> 8 kHz: by 3, then by 2), so
// the sharp filter runs last, at the lowest rate, where its many taps cost least.
// An early stage only has to stop what would alias, at its own output rate, into
// 0 .. the channel's stop edge (what the later stages let through): from (its
// output rate - channel stop edge), so 48k -> 16k stops from 16000 - 4600 = 11400
// Hz. The later stages remove the rest, so the early filters are short, and the
// chain as a whole is >= 60 dB down from the channel's stop edge to the input's
// half rate, as one filter would be. Interpolation images alike: those of 0-4600 Hz
// at 16 kHz are held down by the 48 kHz filter, the rest by the half-band; only the
// mirror of 3400-4000 Hz into 4000-4600 Hz is left, as by any filter with these
// edges. (Stopping from 12600 Hz would still keep 0-3400 Hz clean and save two of
// the 48 kHz filter's 25 taps, but would let the 11400-12600 Hz band through the
// chain and its images through the round trip.)
//
// A stage by 2 whose edges fit within a half-band (pass + stop <= its high rate / 2)
// is made one, its pass edge widened to (high rate / 2 - stop), when that keeps at
// least half of the plain filter's transition width: it then needs about half the
// multiplies of the plain lowpass (32 kHz -> 16 kHz on the way to 8 kHz, say).
import { designHalfband, designLowpass, type LowpassDesign } from './fir-design';

/** The attenuation every stopband must reach, dB (our requirement; common practice, no source). */
export const STOPBAND_REQUIRED_DB = 60;
/** What the Kaiser formulas are asked for: the required figure plus a margin for their approximation. */
export const STOPBAND_DESIGN_DB = 64;
/** Passband ripple allowed on the 8 kHz path, dB peak to peak (ours; common practice, no source). */
export const PASSBAND_RIPPLE_ALLOWED_DB = 0.5;

export interface ChannelBand {
  passHz: number;
  stopHz: number;
}

/** Pass and stop edges of the channel at `rateHz`. */
export function channelBand(rateHz: number): ChannelBand {
  if (rateHz === 8000) return { passHz: 3400, stopHz: 4600 };
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

/** The lowpass of one stage at `rateHz`, by `factor`: a half-band where one fits well. */
function stageDesign(rateHz: number, factor: number, passHz: number, stopHz: number): LowpassDesign {
  const attenuationDb = STOPBAND_DESIGN_DB;
  const halfPass = rateHz / 2 - stopHz;
  if (factor === 2 && halfPass >= passHz && stopHz - halfPass >= (stopHz - passHz) / 2)
    return designHalfband({ rateHz, passHz: halfPass, stopHz, attenuationDb });
  return designLowpass({ rateHz, passHz, stopHz, attenuationDb });
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
    const design = stageDesign(rate, m, band.passHz, last ? band.stopHz : low - band.stopHz);
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
