// An audio file as the channel path wants it: one channel of float samples at a
// rate the path can divide down to every channel rate. A file whose rate is such
// a multiple goes in as it is; any other (44.1 kHz, 22.05 kHz, 11.025 kHz ...) is
// converted first by the rational resampler (core/channel/rational.ts) to the
// common multiple of the channel rates nearest 48 kHz, so it meets the very same
// channel filters as a 48 kHz file.
import { planInputRate, RationalResampler, type InputRatePlan } from '../../core/channel/rational';
import type { ChannelRate } from '../../core/spec/types';
import { AudioFileError, openAudio, type AudioInfo, type AudioReader } from './audio-file';

export interface InputOptions {
  /** 0-based channel of the file. */
  track?: number;
  /** Headerless G.711 at 8 kHz. */
  raw?: 'mu' | 'a';
}

/** Input samples handed to the path per read (also the resampler's block). */
export const INPUT_BLOCK = 16384;

export interface Input {
  readonly info: AudioInfo;
  readonly plan: InputRatePlan;
  /** Rate of the samples read() gives. */
  readonly rate: number;
  /** Delay of the samples read() gives against the file, samples at `rate` (the resampler's; 0 when direct). */
  readonly latency: number;
  /** File frames consumed so far (for progress). */
  readonly position: number;
  /** Fills `out` (at most INPUT_BLOCK long) with the next samples; fewer only at the end, 0 after it. */
  read(out: Float64Array): Promise<number>;
  close(): Promise<void>;
}

class DirectInput implements Input {
  readonly rate: number;
  readonly latency = 0;
  constructor(
    private readonly reader: AudioReader,
    readonly plan: InputRatePlan,
  ) {
    this.rate = plan.pathRateHz;
  }
  get info(): AudioInfo {
    return this.reader.info;
  }
  get position(): number {
    return this.reader.position;
  }
  read(out: Float64Array): Promise<number> {
    return this.reader.read(out);
  }
  close(): Promise<void> {
    return this.reader.close();
  }
}

/** File samples through the rational resampler; converted samples wait in `pending` for the next read. */
class ResampledInput implements Input {
  readonly rate: number;
  readonly latency: number;
  private readonly resampler: RationalResampler;
  private readonly scratch = new Float64Array(INPUT_BLOCK);
  private readonly pending: Float64Array;
  private pendingAt = 0;
  private pendingEnd = 0;
  private ended = false;

  constructor(
    private readonly reader: AudioReader,
    readonly plan: InputRatePlan,
  ) {
    this.rate = plan.pathRateHz;
    this.resampler = new RationalResampler(plan.fileRateHz, plan.pathRateHz, INPUT_BLOCK);
    this.latency = this.resampler.latency;
    this.pending = new Float64Array(this.resampler.capacity);
  }
  get info(): AudioInfo {
    return this.reader.info;
  }
  get position(): number {
    return this.reader.position;
  }
  async read(out: Float64Array): Promise<number> {
    let filled = 0;
    while (filled < out.length) {
      if (this.pendingAt < this.pendingEnd) {
        const n = Math.min(out.length - filled, this.pendingEnd - this.pendingAt);
        out.set(this.pending.subarray(this.pendingAt, this.pendingAt + n), filled);
        this.pendingAt += n;
        filled += n;
        continue;
      }
      if (this.ended) break;
      const got = await this.reader.read(this.scratch);
      if (got === 0) {
        this.ended = true;
        break;
      }
      const made = this.resampler.process(this.scratch, got);
      this.pending.set(this.resampler.output.subarray(0, made));
      this.pendingAt = 0;
      this.pendingEnd = made;
    }
    return filled;
  }
  close(): Promise<void> {
    return this.reader.close();
  }
}

/** Opens a file for channels at the given rates; refuses a file with no samples. */
export async function openInput(
  path: string,
  options: InputOptions,
  channelRates: readonly ChannelRate[],
): Promise<Input> {
  const track = options.track ?? 0;
  let reader = await openAudio(path, { raw: options.raw });
  try {
    if (track >= reader.info.channels) {
      throw new AudioFileError(
        path,
        `--track ${track + 1}: the file has ${reader.info.channels} channel${reader.info.channels === 1 ? '' : 's'}`,
      );
    }
    if (track > 0) {
      await reader.close();
      reader = await openAudio(path, { channel: track, raw: options.raw });
    }
    if (reader.info.frames === 0) throw new AudioFileError(path, 'holds no samples');
    let plan: InputRatePlan;
    try {
      plan = planInputRate(reader.info.sampleRate, channelRates);
    } catch (err) {
      throw new AudioFileError(
        path,
        `cannot run these channels at the file's ${reader.info.sampleRate} Hz: ${(err as Error).message}`,
      );
    }
    return plan.direct ? new DirectInput(reader, plan) : new ResampledInput(reader, plan);
  } catch (err) {
    await reader.close().catch(() => undefined);
    throw err;
  }
}

/** The reason a file failed, without the path and without a stack. */
export function reasonOf(err: unknown, file: string): string {
  const text =
    err !== null && typeof err === 'object' && 'problem' in err && typeof err.problem === 'string'
      ? err.problem
      : err instanceof Error
        ? err.message
        : String(err);
  return text.startsWith(`${file}: `) ? text.slice(file.length + 2) : text;
}

/**
 * Calls `fn` on each block of the input in turn, reading the next block from disk
 * while `fn` works on the current one (two buffers), so the analysis does not sit
 * idle waiting for the file.
 */
export async function forEachBlock(
  input: Input,
  fn: (block: Float64Array, n: number) => void,
  size = INPUT_BLOCK,
): Promise<void> {
  let current = new Float64Array(size);
  let spare = new Float64Array(size);
  let pending = input.read(current);
  for (;;) {
    const n = await pending;
    if (n === 0) break;
    // A short block is the last one.
    pending = n < size ? Promise.resolve(0) : input.read(spare);
    // Settles the read's rejection handling even if fn throws before the await above is reached again.
    pending.catch(() => undefined);
    fn(current, n);
    [current, spare] = [spare, current];
  }
}
