// The channel specification: what a channel is, as data. The same objects
// come from the command line, the UI presets, session files and the worklet.

/** Options every configurable stage accepts; absent means the default. */
export interface StageOptions {
  /** Overload point on the float scale (default 1.0). */
  overloadPoint?: number;
  /** Load capacity in dBm0 (default +3.14). */
  loadCapacityDbm0?: number;
  /** Segment count for the ledgers (default 8). */
  segments?: number;
}

export interface UniformStage extends StageOptions {
  law: 'uniform';
  bits: number;
  /** Mid-tread (a level at zero, two's complement like PCM) or mid-rise. */
  form: 'tread' | 'rise';
}

export interface MuStage extends StageOptions {
  law: 'mu';
  mu: number;
  bits: number;
}

export interface AStage extends StageOptions {
  law: 'a';
  a: number;
  bits: number;
}

export interface G711MuStage {
  law: 'g711-mu';
  /** Send 0x02 instead of the all-zero code (G.711 section 3.2). */
  zeroSuppression?: boolean;
}

export interface G711AStage {
  law: 'g711-a';
}

export interface TableStage extends StageOptions {
  law: 'table';
  /** L-1 ascending decision values, float scale. */
  decisions: number[];
  /** L ascending output values, float scale. */
  outputs: number[];
  /** Short name for display (letters, digits, '-' and '_'). */
  name?: string;
}

export type StageSpec = UniformStage | MuStage | AStage | G711MuStage | G711AStage | TableStage;

/** Rate the quantizer runs at: a sample rate in Hz, or the input's own rate. */
export type ChannelRate = number | 'native';

export interface ChannelSpec {
  /** One stage, or several in tandem (for example a gateway: mu -> A -> mu). */
  stages: StageSpec[];
  rate: ChannelRate;
}

export const DEFAULT_RATE = 8000;
export const DEFAULT_SEGMENTS = 8;
export const DEFAULT_LOAD_CAPACITY_DBM0 = 3.14;
