// The monitor's crossfade between Reference, A, B and the quantization errors.
// Ref, A, B (and Hidden, which is one of them) are strongly correlated, so they
// fade linearly (equal gain keeps the envelope flat); the error is nearly
// uncorrelated with them, so fades to or from it are equal-power. A request that
// arrives during a fade waits for it to end, so the weights never jump.
import type { ChannelPath } from '../../../core/channel/path';

/** Sources the mix can play: the path's 48 kHz outputs. */
export const SOURCE_REF = 0;
export const SOURCE_A = 1;
export const SOURCE_B = 2;
export const SOURCE_ERROR_A = 3;
export const SOURCE_ERROR_B = 4;

const isError = (s: number) => s === SOURCE_ERROR_A || s === SOURCE_ERROR_B;
const HALF_PI = Math.PI / 2;

export class MonitorMix {
  /** Source playing (or faded from) and source faded to; equal outside a fade. */
  current = SOURCE_REF;
  target = SOURCE_REF;
  private pending = -1;
  private position = 0;
  private equalPower = false;
  /** Weights of `current` and `target` for each sample of the block prepared last. */
  readonly weightFrom: Float64Array;
  readonly weightTo: Float64Array;
  private blockFrom = SOURCE_REF;
  private blockTo = SOURCE_REF;
  /** Linear gain of the error sources. */
  errorGain = 1;

  constructor(
    readonly fadeLength: number,
    maxBlock: number,
    start = SOURCE_REF,
  ) {
    this.current = start;
    this.target = start;
    this.weightFrom = new Float64Array(maxBlock);
    this.weightTo = new Float64Array(maxBlock);
  }

  get fading(): boolean {
    return this.current !== this.target;
  }

  /** The source that will be playing once every fade asked for has run. */
  get destination(): number {
    return this.pending >= 0 ? this.pending : this.target;
  }

  request(source: number): void {
    if (this.fading) {
      this.pending = source === this.target ? -1 : source;
      return;
    }
    this.begin(source);
  }

  private begin(source: number): void {
    if (source === this.current) return;
    this.target = source;
    this.position = 0;
    this.equalPower = isError(this.current) || isError(source);
  }

  /** Computes the weights of the next n samples and advances the fade. */
  prepare(n: number): void {
    if (!this.fading && this.pending >= 0) {
      const next = this.pending;
      this.pending = -1;
      this.begin(next);
    }
    const wf = this.weightFrom;
    const wt = this.weightTo;
    this.blockFrom = this.current;
    this.blockTo = this.target;
    if (!this.fading) {
      for (let i = 0; i < n; i++) {
        wf[i] = 0;
        wt[i] = 1;
      }
      return;
    }
    const len = this.fadeLength;
    for (let i = 0; i < n; i++) {
      const p = this.position < len ? (this.position + 1) / len : 1;
      if (this.position < len) this.position++;
      if (this.equalPower) {
        wf[i] = Math.cos(p * HALF_PI);
        wt[i] = Math.sin(p * HALF_PI);
      } else {
        wf[i] = 1 - p;
        wt[i] = p;
      }
    }
    if (this.position >= len) this.current = this.target;
  }

  /** Adds the mix of `path`'s outputs for the prepared block into out[0, n). */
  mixInto(path: ChannelPath, out: Float64Array, n: number): void {
    // Each source is g * (main - k * sub): plain outputs have k = 0, errors k = 1.
    // Resolved once per block and summed inline: a helper returning a double per
    // sample would box it whenever it is not inlined.
    const from = this.blockFrom;
    const to = this.blockTo;
    const g = this.errorGain;
    const tMain = mainOf(path, to);
    const tSub = subOf(path, to);
    const tk = isError(to) ? 1 : 0;
    const tg = isError(to) ? g : 1;
    if (from === to) {
      for (let i = 0; i < n; i++) out[i] += tg * (tMain[i] - tk * tSub[i]);
      return;
    }
    const fMain = mainOf(path, from);
    const fSub = subOf(path, from);
    const fk = isError(from) ? 1 : 0;
    const fg = isError(from) ? g : 1;
    const wf = this.weightFrom;
    const wt = this.weightTo;
    for (let i = 0; i < n; i++) {
      out[i] += wf[i] * fg * (fMain[i] - fk * fSub[i]) + wt[i] * tg * (tMain[i] - tk * tSub[i]);
    }
  }
}

function mainOf(path: ChannelPath, source: number): Float64Array {
  switch (source) {
    case SOURCE_A:
    case SOURCE_ERROR_A:
      return path.output48[0];
    case SOURCE_B:
    case SOURCE_ERROR_B:
      return path.output48[1];
    default:
      return path.reference48;
  }
}

function subOf(path: ChannelPath, source: number): Float64Array {
  if (source === SOURCE_ERROR_A) return path.references48[0];
  if (source === SOURCE_ERROR_B) return path.references48[1];
  return path.reference48;
}
