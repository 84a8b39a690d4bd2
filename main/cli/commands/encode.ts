// quantiscope encode IN OUT --law mu|a and quantiscope decode IN OUT: G.711 files.
// encode runs the file through the channel path to 8 kHz (the voice-band filter
// and decimation of every analysis; none for a file already at 8 kHz, which is
// coded sample for sample) and writes the G.711 codes of the path's quantizer, as
// sent on the line. The path's delay is taken out, so the codes line up with the
// input in time (within half an 8 kHz sample, the part of the filters' delay that
// is not a whole sample) and the output lasts as long as the input.
import { open, unlink, type FileHandle } from 'node:fs/promises';
import { ChannelPath } from '../../../core/channel/path';
import { choiceOption, UsageError, valueOf, type ParsedArgs } from '../args';
import { AudioFileError, createWavWriter, type WavWriter } from '../audio-file';
import { EXIT_OK, type CliContext, type Command } from '../context';
import { INPUT_BLOCK, openInput } from '../input';
import { Progress } from '../progress';
import { HELP_OPTION, inputOptionsOf, RAW_OPTION, TRACK_OPTION } from './common';

const G711_RATE = 8000;

function twoFiles(args: ParsedArgs): [string, string] {
  if (args.operands.length !== 2)
    throw new UsageError(`give an input and an output file (got ${args.operands.length} operands)`);
  const [a, b] = args.operands;
  return [a, b];
}

/** Sink for codes: a WAV writer, or a headerless file written as the codes come. */
interface CodeSink {
  write(codes: Uint8Array): Promise<void>;
  close(): Promise<void>;
  abort(): Promise<void>;
}

async function codeSink(path: string, law: 'mu' | 'a', raw: boolean): Promise<CodeSink> {
  if (!raw) {
    const w: WavWriter = await createWavWriter(path, {
      encoding: law === 'mu' ? 'mulaw' : 'alaw',
      sampleRate: G711_RATE,
    });
    return { write: (c) => w.write(c), close: () => w.close(), abort: () => w.abort() };
  }
  let fh: FileHandle;
  try {
    fh = await open(path, 'w');
  } catch (err) {
    throw new AudioFileError(path, `cannot write: ${(err as NodeJS.ErrnoException).code ?? String(err)}`);
  }
  const failed = (err: unknown) =>
    new AudioFileError(path, `cannot write: ${(err as NodeJS.ErrnoException).code ?? String(err)}`);
  return {
    write: async (c) => {
      try {
        await fh.write(c);
      } catch (err) {
        throw failed(err);
      }
    },
    close: () => fh.close(),
    abort: async () => {
      await fh.close().catch(() => undefined);
      await unlink(path).catch(() => undefined);
    },
  };
}

async function runEncode(args: ParsedArgs, ctx: CliContext): Promise<number> {
  const [from, to] = twoFiles(args);
  const lawText = valueOf(args, 'law');
  if (lawText === undefined) throw new UsageError('give the law: --law mu or --law a');
  const law = choiceOption('law', lawText, ['mu', 'a'] as const);
  const input = await openInput(from, inputOptionsOf(args), [G711_RATE]);
  let sink: CodeSink | null = null;
  const progress = new Progress(ctx.io.status, 'encode');
  try {
    const path = new ChannelPath({
      inputRate: input.rate,
      channels: [law === 'mu' ? 'g711-mu' : 'g711-a'],
      maxBlock: INPUT_BLOCK,
      listen: false,
    });
    const at = path.atRate[0];
    // Channel-rate samples before the first that shows input time 0, and how many the input makes.
    let skip = Math.floor((input.latency + at.latency) / at.factor + 1e-9);
    const total = Math.round((input.info.frames * G711_RATE) / input.info.sampleRate);
    let written = 0;
    sink = await codeSink(to, law, args.flags.has('raw-out'));
    const block = new Float64Array(INPUT_BLOCK);
    const codes = new Uint8Array(at.capacity);
    let ended = false;
    while (written < total) {
      let n = ended ? 0 : await input.read(block);
      if (n === 0) {
        // Past the end the filters still hold the last of the input: push it out with silence.
        ended = true;
        block.fill(0);
        n = block.length;
      }
      path.process(block, n);
      const from0 = Math.min(skip, at.length);
      skip -= from0;
      const count = Math.min(at.length - from0, total - written);
      for (let i = 0; i < count; i++) codes[i] = at.codes[from0 + i];
      if (count > 0) await sink.write(codes.subarray(0, count));
      written += count;
      progress.update(written / total);
    }
    await sink.close();
    sink = null;
    return EXIT_OK;
  } finally {
    progress.done();
    if (sink !== null) await sink.abort();
    await input.close();
  }
}

async function runDecode(args: ParsedArgs, ctx: CliContext): Promise<number> {
  const [from, to] = twoFiles(args);
  const input = await openInput(from, inputOptionsOf(args), ['native']);
  let writer: WavWriter | null = null;
  const progress = new Progress(ctx.io.status, 'decode');
  try {
    writer = await createWavWriter(to, { encoding: 'pcm16', sampleRate: input.info.sampleRate });
    const block = new Float64Array(INPUT_BLOCK);
    const pcm = new Int16Array(INPUT_BLOCK);
    for (;;) {
      const n = await input.read(block);
      if (n === 0) break;
      for (let i = 0; i < n; i++) {
        const v = Math.round(block[i] * 32768);
        pcm[i] = v > 32767 ? 32767 : v < -32768 ? -32768 : v;
      }
      await writer.write(pcm.subarray(0, n));
      progress.update(input.position / input.info.frames);
    }
    await writer.close();
    writer = null;
    return EXIT_OK;
  } finally {
    progress.done();
    if (writer !== null) await writer.abort();
    await input.close();
  }
}

export const encodeCommand: Command = {
  name: 'encode',
  summary: 'write a G.711 file (8000 Hz) from an audio file',
  synopsis: 'IN OUT --law mu|a [--raw-out]',
  description: [
    'OUT is a WAV file with the standard format tag of the law (7 mu-law, 6 A-law), or with --raw-out a',
    'headerless file of line characters. Input at another rate than 8000 Hz goes through the channel path',
    '(voice-band lowpass and decimation; rates that are not a multiple of 8000 Hz are converted to 48000 Hz',
    'first); the filter delay is taken out so the output lines up with the input.',
  ],
  options: [
    { name: 'law', value: 'mu|a', help: 'G.711 mu-law or A-law' },
    { name: 'raw-out', help: 'write headerless G.711 instead of WAV' },
    TRACK_OPTION,
    RAW_OPTION,
    HELP_OPTION,
  ],
  run: runEncode,
};

export const decodeCommand: Command = {
  name: 'decode',
  summary: 'write 16-bit PCM WAV from a G.711 (or any) audio file',
  synopsis: 'IN OUT [--raw mu|a]',
  description: [
    'G.711 codes decode by the G.711 tables to 16-bit PCM (14-bit mu-law values shifted left by 2, 13-bit',
    'A-law by 3) at the input rate. Other inputs are rounded to 16 bits and clipped at full scale.',
  ],
  options: [TRACK_OPTION, RAW_OPTION, HELP_OPTION],
  run: runDecode,
};
