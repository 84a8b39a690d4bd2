// Snapshots: plain objects with typed arrays inside, which views draw, the worklet
// posts (structured clone) and sessions store. Each meter creates one of the right
// shape with createSnapshot() and fills it again and again with snapshot(into),
// allocating nothing after the first.
//
// Conventions: levels in dBov relative to the snapshot's overloadPoint (dBm0 =
// dBov + 3.01 + loadCapacityDbm0, core/units/levels.ts); energies are sums of
// squares on the float scale; a figure that does not exist yet (no samples, no
// signal, no speech) is null, never NaN or -Infinity. Typed arrays per segment use
// NaN for "no samples" and are documented where they do.
import type { ActiveLevelResult } from './active-level';
import { emptyActiveLevelResult } from './active-level';
import { LEVEL_BIN_COUNT, LEVEL_BIN_DB, LEVEL_MIN_DBOV } from './levels';
import { emptySignalMeterSnapshot, type SignalMeterSnapshot } from './meters';
import { emptySegmentalSnapshot, type SegmentalSnapshot } from './segmental';
import { emptySpectrumSnapshot, type SpectrumSnapshot } from './spectrum';

export interface LevelSpreadSnapshot {
  /** Bin width (0.5 dB) and the lower edge of bin 0 (-96 dBov). */
  binDb: number;
  minDbov: number;
  /** Samples per bin; bin k spans minDbov + k*binDb .. + binDb, the top bin closed at 0 dBov. */
  counts: Float64Array;
  /** Samples below minDbov, zeros included. */
  underflow: number;
  /** Samples with |x| above the overload point. */
  overload: number;
  total: number;
}

/** Talker statistics, measured on the quantizer's input at the channel rate (after input gain). */
export interface TalkerSnapshot {
  rate: number;
  overloadPoint: number;
  loadCapacityDbm0: number;
  meter: SignalMeterSnapshot;
  levels: LevelSpreadSnapshot;
  /** ITU-T P.56 method B since reset, and over the sliding window. */
  activeLongTerm: ActiveLevelResult;
  activeWindow: ActiveLevelResult;
  windowSeconds: number;
}

export interface SegmentLedgerSnapshot {
  /** segmentCount + 1 edges in dBov (the first, magnitude 0, is -Infinity). */
  edgesDbov: Float64Array;
  /** Occupancy: input samples per segment. */
  counts: Float64Array;
  signalEnergy: Float64Array;
  errorEnergy: Float64Array;
  /** SNR per segment, dB: NaN where a segment has no samples, +Infinity where it has no error. */
  snrDb: Float64Array;
}

/** What one quantizer does: its output against its input, at the channel rate. */
export interface ChannelSnapshot {
  label: string;
  quantizerKind: string;
  bits: number;
  rate: number;
  overloadPoint: number;
  loadCapacityDbm0: number;
  samples: number;
  /** Input samples with |x| above the overload point (clipped). */
  overloads: number;
  /** Mean squares of input and of error (output - input). */
  signalPower: number;
  errorPower: number;
  /** Overall SNR, dB; null with no samples, no signal or no error. */
  snrDb: number | null;
  /** O.41 psophometric weighting of the error, when enabled (else nulls). */
  weighted: boolean;
  weightedErrorPower: number | null;
  weightedSnrDb: number | null;
  segments: SegmentLedgerSnapshot;
  /** Per-code occupancy (G.711: by line character); empty for quantizers with more than 256 codes. */
  codes: Float64Array;
  segmental: SegmentalSnapshot;
  signalSpectrum: SpectrumSnapshot;
  errorSpectrum: SpectrumSnapshot;
}

export function emptyLevelSpreadSnapshot(): LevelSpreadSnapshot {
  return {
    binDb: LEVEL_BIN_DB,
    minDbov: LEVEL_MIN_DBOV,
    counts: new Float64Array(LEVEL_BIN_COUNT),
    underflow: 0,
    overload: 0,
    total: 0,
  };
}

export function emptyTalkerSnapshot(): TalkerSnapshot {
  return {
    rate: 0,
    overloadPoint: 1,
    loadCapacityDbm0: 0,
    meter: emptySignalMeterSnapshot(),
    levels: emptyLevelSpreadSnapshot(),
    activeLongTerm: emptyActiveLevelResult(),
    activeWindow: emptyActiveLevelResult(),
    windowSeconds: 0,
  };
}

export interface ChannelSnapshotShape {
  segmentCount: number;
  codeCount: number;
  traceFrames: number;
  spectrumSize: number;
}

export function emptyChannelSnapshot(shape: ChannelSnapshotShape): ChannelSnapshot {
  const s = shape.segmentCount;
  return {
    label: '',
    quantizerKind: '',
    bits: 0,
    rate: 0,
    overloadPoint: 1,
    loadCapacityDbm0: 0,
    samples: 0,
    overloads: 0,
    signalPower: 0,
    errorPower: 0,
    snrDb: null,
    weighted: false,
    weightedErrorPower: null,
    weightedSnrDb: null,
    segments: {
      edgesDbov: new Float64Array(s + 1),
      counts: new Float64Array(s),
      signalEnergy: new Float64Array(s),
      errorEnergy: new Float64Array(s),
      snrDb: new Float64Array(s),
    },
    codes: new Float64Array(shape.codeCount),
    segmental: emptySegmentalSnapshot(shape.traceFrames),
    signalSpectrum: emptySpectrumSnapshot(shape.spectrumSize),
    errorSpectrum: emptySpectrumSnapshot(shape.spectrumSize),
  };
}

/** SNR in dB from signal and error energy, or null where it has no finite value. */
export function snrDbOrNull(signal: number, error: number): number | null {
  return signal > 0 && error > 0 ? 10 * Math.log10(signal / error) : null;
}
