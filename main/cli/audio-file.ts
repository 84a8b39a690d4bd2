// Audio files on disk for the command line: opening WAV or headerless G.711
// files and reading one channel in chunks (memory stays flat however long the
// file), and writing 16-bit PCM or G.711 WAV files and raw G.711 files. The
// formats themselves live in core/io; this module adds the file system and
// names the file in every error.
//
// Policies (see core/io/wav-header.ts for the header ones):
// - NaN or infinite float samples are refused, by the read() that meets them,
//   with the frame and time: the analysis has no meaning for them and silently
//   zeroing them would hide a broken recorder. Only the chosen channel is
//   decoded, so only it is checked.
// - Anything that is not a regular file (a directory, a FIFO, a device) is
//   refused before it is opened, so a FIFO cannot make the reader wait forever.
import { open, stat, unlink, writeFile, type FileHandle } from 'node:fs/promises';
import {
  WavFormatError,
  bytesPerSample,
  decodeChannel,
  pcm16Bytes,
  rawG711Layout,
  wavFileBytes,
  wavHeader,
  wavHeaderLength,
  wavHeaderSteps,
  wavPadLength,
  MAX_WAV_DATA_BYTES,
  type AudioLayout,
  type SampleEncoding,
  type WavOutputEncoding,
} from '../../core/io/index';

/** Frames per read from disk unless the caller says otherwise (64 Ki). */
export const DEFAULT_CHUNK_FRAMES = 65536;

/** Bytes read at once from the start of a WAV file to walk its header. */
const HEADER_PREFIX_BYTES = 65536;

export class AudioFileError extends Error {
  /** The path as given. */
  readonly file: string;
  /** The problem without the path. */
  readonly problem: string;
  constructor(file: string, problem: string) {
    super(`${file}: ${problem}`);
    this.name = 'AudioFileError';
    this.file = file;
    this.problem = problem;
  }
}

export interface AudioInfo {
  path: string;
  container: 'wav' | 'raw';
  encoding: SampleEncoding;
  /** Container bits per sample (8, 16, 24, 32, 64). */
  bitsPerSample: number;
  /** Significant bits; below bitsPerSample only in WAVE_FORMAT_EXTENSIBLE files that say so. */
  validBitsPerSample: number;
  /** fmt chunk tag as found (0xFFFE for extensible), 0 for raw files. */
  formatTag: number;
  channels: number;
  /** The channel read(), 0-based. */
  channel: number;
  sampleRate: number;
  frames: number;
}

export interface AudioReader {
  info: AudioInfo;
  /** Frames delivered so far. */
  readonly position: number;
  /**
   * Fills `out` with the next frames of the chosen channel as floats (int16 n ->
   * n / 32768 scale). Returns out.length except at the end of the file, 0 after it.
   * Rejects with AudioFileError on a NaN or infinite sample or a failed read, and
   * closes the file then (close() stays safe to call).
   */
  read(out: Float64Array): Promise<number>;
  close(): Promise<void>;
}

export interface OpenAudioOptions {
  /** 0-based channel to read; default 0. */
  channel?: number;
  /** Headerless G.711 at 8 kHz instead of WAV. */
  raw?: 'mu' | 'a';
  /** Frames per read from disk; default DEFAULT_CHUNK_FRAMES. */
  chunkFrames?: number;
}

const ERRNO_TEXT: Record<string, string> = {
  ENOENT: 'no such file',
  ENOTDIR: 'no such file (a part of the path is not a folder)',
  EACCES: 'permission denied',
  EPERM: 'permission denied',
  EISDIR: 'is a directory, not an audio file',
  EMFILE: 'too many open files',
  ENOSPC: 'no space left on the disk',
  EROFS: 'the file system is read-only',
  EIO: 'input/output error',
};

/** An fs error as a sentence; `doing` says what failed, for the unexpected ones. */
function fsProblem(err: unknown, doing: string): string {
  const code = (err as NodeJS.ErrnoException | null)?.code;
  if (code && ERRNO_TEXT[code]) return ERRNO_TEXT[code];
  return `${doing} failed (${code ?? (err instanceof Error ? err.message : String(err))})`;
}

function asAudioError(path: string, err: unknown, doing: string): AudioFileError {
  if (err instanceof AudioFileError) return err;
  if (err instanceof WavFormatError) return new AudioFileError(path, err.message);
  return new AudioFileError(path, fsProblem(err, doing));
}

/** Reads exactly `length` bytes at `position` into buf[0..length). */
async function readFully(fh: FileHandle, path: string, buf: Uint8Array, length: number, position: number) {
  let got = 0;
  while (got < length) {
    const { bytesRead } = await fh.read(buf, got, length - got, position + got);
    if (bytesRead === 0) {
      throw new AudioFileError(
        path,
        `ended early at byte ${position + got} (was it changed while being read?)`,
      );
    }
    got += bytesRead;
  }
}

/** Writes all of `bytes` at `position` (a write may take fewer bytes than offered). */
async function writeFully(fh: FileHandle, bytes: Uint8Array, position: number): Promise<void> {
  let done = 0;
  while (done < bytes.length) {
    const { bytesWritten } = await fh.write(bytes, done, bytes.length - done, position + done);
    done += bytesWritten;
  }
}

/** Walks the WAV header, serving requests from one read of the file's start when they fall in it. */
async function readWavLayout(fh: FileHandle, path: string, size: number): Promise<AudioLayout> {
  const prefix = new Uint8Array(Math.min(size, HEADER_PREFIX_BYTES));
  await readFully(fh, path, prefix, prefix.length, 0);
  const steps = wavHeaderSteps(size);
  let step = steps.next();
  while (!step.done) {
    const { offset, length } = step.value;
    let bytes: Uint8Array;
    if (offset + length <= prefix.length) {
      bytes = prefix.subarray(offset, offset + length);
    } else {
      bytes = new Uint8Array(length);
      await readFully(fh, path, bytes, length, offset);
    }
    step = steps.next(bytes);
  }
  return step.value;
}

function checkOptions(path: string, opts: OpenAudioOptions): { channel: number; chunkFrames: number } {
  const channel = opts.channel ?? 0;
  const chunkFrames = opts.chunkFrames ?? DEFAULT_CHUNK_FRAMES;
  if (!Number.isInteger(channel) || channel < 0) {
    throw new AudioFileError(path, `channel index ${channel} is not a whole number from 0`);
  }
  if (!Number.isInteger(chunkFrames) || chunkFrames < 1) {
    throw new AudioFileError(path, `chunk size ${chunkFrames} is not a positive whole number of frames`);
  }
  if (opts.raw !== undefined && opts.raw !== 'mu' && opts.raw !== 'a') {
    throw new AudioFileError(path, `raw law "${String(opts.raw)}" is neither mu nor a`);
  }
  return { channel, chunkFrames };
}

class FileAudioReader implements AudioReader {
  readonly info: AudioInfo;
  private pos = 0;
  private closed = false;
  private busy = false;
  private readonly buf: Uint8Array;

  constructor(
    private readonly fh: FileHandle,
    private readonly layout: AudioLayout,
    channel: number,
    private readonly chunkFrames: number,
    path: string,
  ) {
    this.info = {
      path,
      container: layout.container,
      encoding: layout.encoding,
      bitsPerSample: layout.bitsPerSample,
      validBitsPerSample: layout.validBitsPerSample,
      formatTag: layout.formatTag,
      channels: layout.channels,
      channel,
      sampleRate: layout.sampleRate,
      frames: layout.frames,
    };
    this.buf = new Uint8Array(Math.min(chunkFrames, layout.frames) * layout.blockAlign);
  }

  get position(): number {
    return this.pos;
  }

  async read(out: Float64Array): Promise<number> {
    const { path } = this.info;
    if (this.closed) throw new AudioFileError(path, 'read after close');
    if (this.busy) throw new AudioFileError(path, 'read while another read is in progress');
    this.busy = true;
    try {
      const { layout, buf } = this;
      let filled = 0;
      while (filled < out.length && this.pos < layout.frames) {
        const n = Math.min(out.length - filled, this.chunkFrames, layout.frames - this.pos);
        const at = layout.dataOffset + this.pos * layout.blockAlign;
        try {
          await readFully(this.fh, path, buf, n * layout.blockAlign, at);
        } catch (err) {
          throw asAudioError(path, err, 'reading');
        }
        const bad = decodeChannel(buf, 0, n, layout, this.info.channel, out, filled);
        if (bad >= 0) throw this.nonFinite(bad, this.pos + bad);
        filled += n;
        this.pos += n;
      }
      return filled;
    } catch (err) {
      // Nothing after a failed read can be trusted: release the file at once, so a
      // caller that moves on to the next file leaks no descriptor.
      await this.close().catch(() => undefined);
      throw err;
    } finally {
      this.busy = false;
    }
  }

  private nonFinite(inBlock: number, frame: number): AudioFileError {
    const { layout, info } = this;
    const p = inBlock * layout.blockAlign + info.channel * bytesPerSample(layout);
    const view = new DataView(this.buf.buffer, this.buf.byteOffset, this.buf.byteLength);
    const v = layout.bitsPerSample === 32 ? view.getFloat32(p, true) : view.getFloat64(p, true);
    const seconds = (frame / layout.sampleRate).toFixed(3);
    return new AudioFileError(
      info.path,
      `sample ${frame} (at ${seconds} s) of channel ${info.channel} is ${String(v)}; ` +
        'float samples must be finite',
    );
  }

  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    await this.fh.close();
  }
}

/** Opens a WAV file (or a headerless G.711 file with `raw`) for reading one channel in chunks. */
export async function openAudio(path: string, opts: OpenAudioOptions = {}): Promise<AudioReader> {
  const { channel, chunkFrames } = checkOptions(path, opts);
  let size: number;
  try {
    const st = await stat(path);
    if (st.isDirectory()) throw new AudioFileError(path, 'is a directory, not an audio file');
    if (!st.isFile()) throw new AudioFileError(path, 'is not a regular file');
    size = st.size;
  } catch (err) {
    throw asAudioError(path, err, 'looking up the file');
  }
  let fh: FileHandle;
  try {
    fh = await open(path, 'r');
  } catch (err) {
    throw asAudioError(path, err, 'opening');
  }
  try {
    const layout = opts.raw ? rawG711Layout(size, opts.raw) : await readWavLayout(fh, path, size);
    if (channel >= layout.channels) {
      throw new AudioFileError(
        path,
        `channel index ${channel} is out of range: the file has ${layout.channels} channel(s), ` +
          `0..${layout.channels - 1}`,
      );
    }
    return new FileAudioReader(fh, layout, channel, chunkFrames, path);
  } catch (err) {
    await fh.close().catch(() => undefined);
    throw asAudioError(path, err, 'reading the header');
  }
}

// --- writing -------------------------------------------------------------------

export interface WavData {
  encoding: WavOutputEncoding;
  sampleRate: number;
  /** For pcm16. */
  samples?: Int16Array;
  /** For mulaw / alaw: line characters. */
  codes?: Uint8Array;
}

function bodyOf(path: string, data: WavData): Int16Array | Uint8Array {
  const body = data.encoding === 'pcm16' ? data.samples : data.codes;
  if (!body) {
    throw new AudioFileError(
      path,
      data.encoding === 'pcm16'
        ? 'nothing to write: 16-bit PCM needs samples'
        : 'nothing to write: G.711 needs codes',
    );
  }
  return body;
}

/** Writes a whole mono WAV file: 16-bit PCM, or G.711 (format tag 7 / 6, fact chunk) at 8000 Hz. */
export async function writeWavFile(path: string, data: WavData): Promise<void> {
  let bytes: Uint8Array;
  try {
    bytes = wavFileBytes(data.encoding, data.sampleRate, bodyOf(path, data));
  } catch (err) {
    throw asAudioError(path, err, 'encoding');
  }
  try {
    await writeFile(path, bytes);
  } catch (err) {
    throw new AudioFileError(path, `cannot write: ${fsProblem(err, 'writing')}`);
  }
}

/** Writes headerless G.711 line characters. */
export async function writeRawFile(path: string, codes: Uint8Array): Promise<void> {
  try {
    await writeFile(path, codes);
  } catch (err) {
    throw new AudioFileError(path, `cannot write: ${fsProblem(err, 'writing')}`);
  }
}

export interface WavWriter {
  /** Frames written so far. */
  readonly frames: number;
  /** Appends samples (pcm16: Int16Array) or codes (G.711: Uint8Array). */
  write(block: Int16Array | Uint8Array): Promise<void>;
  /** Writes the pad byte and the final header; the file is complete after it. */
  close(): Promise<void>;
  /** Closes and deletes the file (for a run that failed half way). */
  abort(): Promise<void>;
}

/**
 * A mono WAV writer for files too long to hold in memory: the header is written
 * with a zero count first and rewritten with the real sizes by close().
 */
export async function createWavWriter(
  path: string,
  format: { encoding: WavOutputEncoding; sampleRate: number },
): Promise<WavWriter> {
  const { encoding, sampleRate } = format;
  try {
    wavHeader(encoding, sampleRate, 0);
  } catch (err) {
    throw asAudioError(path, err, 'encoding');
  }
  let fh: FileHandle;
  try {
    fh = await open(path, 'w');
  } catch (err) {
    throw new AudioFileError(path, `cannot write: ${fsProblem(err, 'writing')}`);
  }
  try {
    await writeFully(fh, wavHeader(encoding, sampleRate, 0), 0);
  } catch (err) {
    await fh.close().catch(() => undefined);
    throw new AudioFileError(path, `cannot write: ${fsProblem(err, 'writing')}`);
  }
  const width = encoding === 'pcm16' ? 2 : 1;
  let frames = 0;
  let offset = wavHeaderLength(encoding);
  let done = false;
  let scratch = new Uint8Array(0);
  const failed = (err: unknown) => new AudioFileError(path, `cannot write: ${fsProblem(err, 'writing')}`);
  return {
    get frames() {
      return frames;
    },
    async write(block) {
      if (done) throw new AudioFileError(path, 'write after close');
      if ((encoding === 'pcm16') !== block instanceof Int16Array) {
        throw new AudioFileError(
          path,
          `a ${encoding} file takes ${encoding === 'pcm16' ? 'Int16Array' : 'Uint8Array'} blocks`,
        );
      }
      if ((frames + block.length) * width > MAX_WAV_DATA_BYTES) {
        throw new AudioFileError(path, 'cannot write: a WAV file holds at most 4 GiB');
      }
      let bytes: Uint8Array;
      if (block instanceof Int16Array) {
        if (scratch.length < block.length * 2) scratch = new Uint8Array(block.length * 2);
        bytes = pcm16Bytes(block, scratch).subarray(0, block.length * 2);
      } else {
        bytes = block;
      }
      try {
        await writeFully(fh, bytes, offset);
      } catch (err) {
        throw failed(err);
      }
      offset += bytes.length;
      frames += block.length;
    },
    async close() {
      if (done) return;
      done = true;
      try {
        const pad = wavPadLength(encoding, frames);
        if (pad) await writeFully(fh, new Uint8Array(pad), offset);
        await writeFully(fh, wavHeader(encoding, sampleRate, frames), 0);
      } catch (err) {
        throw failed(err);
      } finally {
        await fh.close().catch(() => undefined);
      }
    },
    async abort() {
      if (!done) {
        done = true;
        await fh.close().catch(() => undefined);
      }
      await unlink(path).catch(() => undefined);
    },
  };
}
