// The compute worker's requests and replies: plain data only (structured clone), one
// reply per request, matched by id.
import type { FrameLevels, Recommendation } from '../../core/design/index';
import type { SweepMethod, SweepResult } from '../../core/sweep/index';
import type { DensityShape } from '../../core/theory/densities';

export interface SweepRequest {
  kind: 'sweep';
  /** Channel texts, swept in turn (A then B). */
  channels: string[];
  method: SweepMethod;
  fromDbm0: number;
  toDbm0: number;
  stepDb: number;
}

export interface DesignRequest {
  kind: 'design';
  frames: FrameLevels;
  bits: number;
}

export interface RecommendRequest {
  kind: 'recommend';
  frames: FrameLevels;
  targetSnrDb: number;
  share: number;
  /** The channels in use, added to the candidates so they can be highlighted. */
  channels: string[];
}

/** Exact SNR of a channel's first stage for a signal model at the given levels (dBm0, the signal's power). */
export interface TheoryRequest {
  kind: 'theory';
  channel: string;
  model: DensityShape;
  levelsDbm0: number[];
}

export type ComputeRequest = SweepRequest | DesignRequest | RecommendRequest | TheoryRequest;

export interface DesignResult {
  /** Stage text of the designed table quantizer (options and rate left to the form). */
  stage: string;
  predictedSnrDb: number;
}

export interface RecommendResult {
  recommendation: Recommendation;
  /** Per channel in use: its index among the candidates, or -1 (tandems, tables). */
  highlight: number[];
}

export interface ComputeResults {
  sweep: SweepResult[];
  design: DesignResult;
  recommend: RecommendResult;
  /** SNR in dB per level (NaN where undefined). */
  theory: number[];
}

export type ToCompute = ComputeRequest & { id: number };

export type FromCompute =
  | { id: number; ok: true; result: ComputeResults[ComputeRequest['kind']] }
  | { id: number; ok: false; message: string };
