// quantiscope compare REF OUT: a channel that is not ours, judged from the signal
// fed to it (REF) and what came out (OUT).
//
// REF is brought to OUT's rate through the channel path (the same voice-band
// lowpass and decimation as every analysis; rates that are no multiple of OUT's are
// converted first), so bandwidth OUT's channel lacks by design still counts as
// error only where REF's band exceeds the path's. Then:
// 1. the delay by cross-correlation and the gain by least squares over the first
//    30 s (core/compare/align.ts), with warnings when |rho| is low, when another lag
//    matches almost as well, or when the delay falls between samples;
// 2. a second pass pairs g ref[n - d] with out[n] and feeds the accumulators of
//    `analyze`: talker statistics on g ref, overall SNR, the segment ledger of a
//    chosen channel (default by OUT's encoding: G.711 chords) and 20 ms frames.
import { estimateDelay, leastSquaresGain } from '../../../core/compare/align';
import { ChannelPath } from '../../../core/channel/path';
import { ChannelMeter } from '../../../core/measure/channel-meter';
import { TalkerMeter } from '../../../core/measure/talker-meter';
import { createQuantizer } from '../../../core/quantizers/index';
import { formatChannel } from '../../../core/spec/format';
import type { TableLookup } from '../../../core/spec/tables';
import type { ChannelSpec } from '../../../core/spec/types';
import { numberOption, UsageError, valueOf, type ParsedArgs } from '../args';
import type { SegmentResult } from '../analyze-file';
import { EXIT_OK, type CliContext, type Command } from '../context';
import { fixed, finiteOrNull, percent, signed, table } from '../format';
import { INPUT_BLOCK, openInput, type Input, type InputOptions } from '../input';
import { Progress } from '../progress';
import {
  HELP_OPTION,
  inputOptionsOf,
  parseChannelOption,
  printLines,
  RAW_OPTION,
  shown,
  TABLE_OPTION,
  tablesOf,
  TRACK_OPTION,
} from './common';

/** Below this |rho| the match is called unreliable: the channel's SNR would be under about 6 dB. */
export const RELIABLE_CORRELATION = 0.9;
/** Another lag matching this well (relative to the peak) makes the delay ambiguous. */
export const AMBIGUOUS_RATIO = 0.9;
/** A delay this far between samples limits what an integer alignment can show. */
export const FRACTION_WARNING = 0.25;
const WINDOW_SECONDS = 30;

/** Samples of one file at a rate: REF through the path to OUT's rate, or OUT as it is. */
class RateStream {
  private readonly block = new Float64Array(INPUT_BLOCK);
  private readonly path: ChannelPath | null;
  private pending = new Float64Array(0);
  private pendingAt = 0;
  private pendingEnd = 0;
  private ended = false;

  constructor(
    readonly input: Input,
    readonly rate: number,
  ) {
    if (input.rate === rate) this.path = null;
    else {
      // Only the Reference (the band-limited, decimated input) is read; the quantizer is a placeholder.
      const probe: ChannelSpec = { stages: [{ law: 'uniform', bits: 16, form: 'tread' }], rate };
      this.path = new ChannelPath({
        inputRate: input.rate,
        channels: [probe],
        maxBlock: INPUT_BLOCK,
        listen: false,
      });
    }
  }

  /** Fills out with the next samples; fewer only at the end. */
  async read(out: Float64Array, n = out.length): Promise<number> {
    // Input.read fills what it is given except at the end of the file.
    if (this.path === null) return this.input.read(n === out.length ? out : out.subarray(0, n));
    let filled = 0;
    while (filled < n) {
      if (this.pendingAt < this.pendingEnd) {
        const k = Math.min(n - filled, this.pendingEnd - this.pendingAt);
        out.set(this.pending.subarray(this.pendingAt, this.pendingAt + k), filled);
        this.pendingAt += k;
        filled += k;
        continue;
      }
      if (this.ended) break;
      const got = await this.input.read(this.block);
      if (got === 0) {
        this.ended = true;
        break;
      }
      this.path.process(this.block, got);
      const at = this.path.atRate[0];
      if (this.pending.length < at.length) this.pending = new Float64Array(at.capacity);
      this.pending.set(at.reference.subarray(0, at.length));
      this.pendingAt = 0;
      this.pendingEnd = at.length;
    }
    return filled;
  }

  /** Drops the next n samples. */
  async skip(n: number): Promise<number> {
    const scratch = new Float64Array(Math.min(INPUT_BLOCK, Math.max(1, n)));
    let left = n;
    while (left > 0) {
      const k = await this.read(scratch, Math.min(left, scratch.length));
      if (k === 0) break;
      left -= k;
    }
    return n - left;
  }

  close(): Promise<void> {
    return this.input.close();
  }
}

async function openPair(refPath: string, outPath: string, opts: InputOptions) {
  const out = await openInput(outPath, opts, ['native']);
  try {
    const ref = await openInput(refPath, { track: opts.track }, [out.info.sampleRate]);
    return { ref: new RateStream(ref, out.info.sampleRate), out: new RateStream(out, out.info.sampleRate) };
  } catch (err) {
    await out.close();
    throw err;
  }
}

async function readUpTo(s: RateStream, n: number): Promise<Float64Array> {
  const buf = new Float64Array(n);
  const got = await s.read(buf);
  return buf.subarray(0, got);
}

export interface CompareReport {
  reference: string;
  file: string;
  rate: number;
  delaySamples: number;
  delayMs: number;
  /** Sub-sample part of the delay estimate (parabolic), samples. */
  delayFraction: number;
  gain: number;
  gainDb: number | null;
  correlation: number;
  ambiguity: number;
  reliable: boolean;
  warnings: string[];
  samples: number;
  seconds: number;
  activeLevelDbov: number | null;
  activityFactor: number | null;
  peakDbov: number | null;
  overloads: number;
  /** The channel whose segments the ledger uses. */
  ledger: string;
  snrDb: number | null;
  segSnrDb: { mean: number | null; p5: number | null; p50: number | null; p95: number | null };
  segments: SegmentResult[];
}

export function compareTable(r: CompareReport, tables?: TableLookup): string[] {
  const m = r.segments;
  return [
    `${r.file} against ${r.reference}  (${r.rate} Hz, ${r.seconds.toFixed(2)} s compared)`,
    `  delay ${r.delaySamples} samples (${fixed(r.delayMs, 3)} ms; peak at ${signed(r.delayFraction, 2)} from it), ` +
      `gain ${r.gain.toPrecision(5)} (${signed(r.gainDb, 2)} dB), correlation ${r.correlation.toFixed(4)}` +
      `${r.reliable ? '' : '  UNRELIABLE'}`,
    ...r.warnings.map((w) => `  warning: ${w}`),
    `  talker (gained reference): active level ${fixed(r.activeLevelDbov, 2)} dBov, activity ${percent(r.activityFactor)} %, ` +
      `peak ${fixed(r.peakDbov, 2)} dBov, overloads ${r.overloads}`,
    `  SNR ${fixed(r.snrDb, 2)} dB; segmental ${fixed(r.segSnrDb.mean, 2)} dB (p5 ${fixed(r.segSnrDb.p5)}, ` +
      `p50 ${fixed(r.segSnrDb.p50)}, p95 ${fixed(r.segSnrDb.p95)})`,
    `  segments of ${shown(r.ledger, tables)}, softest first:`,
    ...table([
      ['segment', ...m.map((s) => String(s.index + 1))],
      ['share %', ...m.map((s) => percent(s.share))],
      ['SNR dB', ...m.map((s) => fixed(s.snrDb))],
    ]).map((l) => `    ${l}`),
  ];
}

async function run(args: ParsedArgs, ctx: CliContext): Promise<number> {
  if (args.operands.length !== 2)
    throw new UsageError(
      `give the reference and the channel's output (got ${args.operands.length} operands)`,
    );
  const [refPath, outPath] = args.operands;
  const maxDelayText = valueOf(args, 'max-delay');
  const maxDelayS =
    maxDelayText === undefined ? 1 : numberOption('max-delay', maxDelayText, { min: 0, max: 10 });
  const ledgerText = valueOf(args, 'ledger');
  const tables = await tablesOf(args);
  // Read before the long first pass, so a bad --ledger is refused at once.
  const ledgerGiven = ledgerText === undefined ? null : parseChannelOption(ledgerText, tables, '--ledger');
  const opts = inputOptionsOf(args);
  const progress = new Progress(ctx.io.status, 'compare');

  // Pass 1: delay and gain from the start of both files.
  let pair = await openPair(refPath, outPath, opts);
  const rate = pair.out.rate;
  const outFrames = pair.out.input.info.frames;
  const outEncoding = pair.out.input.info.encoding;
  const maxLag = Math.round(maxDelayS * rate);
  let ref: Float64Array;
  let out: Float64Array;
  try {
    const window = Math.round(WINDOW_SECONDS * rate);
    ref = await readUpTo(pair.ref, window + maxLag);
    out = await readUpTo(pair.out, window + maxLag);
  } finally {
    await pair.ref.close();
    await pair.out.close();
  }
  const lag = Math.max(0, Math.min(maxLag, Math.floor(Math.min(ref.length, out.length) / 2)));
  const est = estimateDelay(ref, out, lag);
  const fit = leastSquaresGain(ref, out, est.delay);
  const warnings: string[] = [];
  const reliable =
    Math.abs(fit.correlation) >= RELIABLE_CORRELATION && est.ambiguity < AMBIGUOUS_RATIO && est.overlap > 0;
  if (Math.abs(fit.correlation) < RELIABLE_CORRELATION)
    warnings.push(
      `alignment unreliable: normalised correlation ${fit.correlation.toFixed(3)} is below ${RELIABLE_CORRELATION} ` +
        '(wrong pair of files, a delay beyond --max-delay, or a channel too poor to line up)',
    );
  if (est.ambiguity >= AMBIGUOUS_RATIO)
    warnings.push(
      `alignment unreliable: another delay matches ${(100 * est.ambiguity).toFixed(0)} % as well ` +
        '(a periodic signal cannot fix the delay)',
    );
  if (Math.abs(est.fraction) > FRACTION_WARNING)
    warnings.push(
      `the delay falls between samples (about ${(est.delay + est.fraction).toFixed(2)}); ` +
        'whole-sample alignment leaves part of the mismatch as error',
    );
  if (fit.gain < 0) warnings.push('the output is inverted (negative gain)');

  // Pass 2: stream both, paired at the delay, through the accumulators.
  const ledgerSpec: ChannelSpec =
    ledgerGiven !== null
      ? ledgerGiven
      : { stages: [{ law: outEncoding === 'mulaw' ? 'g711-mu' : 'g711-a' }], rate };
  const q = createQuantizer(ledgerSpec.stages[0]);
  const meter = new ChannelMeter({ quantizer: q, rate });
  const talker = new TalkerMeter({
    rate,
    overloadPoint: q.overloadPoint,
    loadCapacityDbm0: q.loadCapacityDbm0,
  });
  pair = await openPair(refPath, outPath, opts);
  let samples = 0;
  try {
    if (est.delay > 0) await pair.out.skip(est.delay);
    else if (est.delay < 0) await pair.ref.skip(-est.delay);
    const a = new Float64Array(INPUT_BLOCK);
    const b = new Float64Array(INPUT_BLOCK);
    const g = fit.gain;
    for (;;) {
      const na = await pair.ref.read(a);
      const nb = await pair.out.read(b, na);
      const n = Math.min(na, nb);
      if (n === 0) break;
      for (let i = 0; i < n; i++) a[i] *= g;
      talker.add(a, 0, n);
      meter.add(a, b, undefined, undefined, 0, n);
      samples += n;
      progress.update(samples / Math.max(1, outFrames));
      if (n < INPUT_BLOCK) break;
    }
  } finally {
    progress.done();
    await pair.ref.close();
    await pair.out.close();
  }
  const ch = meter.snapshot();
  const tk = talker.snapshot();
  const seg = ch.segments;
  const report: CompareReport = {
    reference: refPath,
    file: outPath,
    rate,
    delaySamples: est.delay,
    delayMs: (1000 * est.delay) / rate,
    delayFraction: est.fraction,
    gain: fit.gain,
    gainDb: fit.gain !== 0 ? 20 * Math.log10(Math.abs(fit.gain)) : null,
    correlation: fit.correlation,
    ambiguity: est.ambiguity,
    reliable,
    warnings,
    samples,
    seconds: samples / rate,
    activeLevelDbov: tk.activeLongTerm.activeLevelDbov,
    activityFactor: tk.activeLongTerm.activityFactor,
    peakDbov: tk.meter.peakDbov,
    overloads: tk.meter.overloadCount,
    ledger: formatChannel(ledgerSpec),
    snrDb: ch.snrDb,
    segSnrDb: {
      mean: ch.segmental.meanDb,
      p5: ch.segmental.p5Db,
      p50: ch.segmental.p50Db,
      p95: ch.segmental.p95Db,
    },
    segments: Array.from(seg.counts, (c, s) => ({
      index: s,
      fromDbov: finiteOrNull(seg.edgesDbov[s]),
      toDbov: seg.edgesDbov[s + 1],
      share: ch.samples > 0 ? c / ch.samples : 0,
      snrDb: finiteOrNull(seg.snrDb[s]),
    })),
  };
  if (args.flags.has('json')) ctx.io.out(JSON.stringify(report, null, 2));
  else printLines(ctx, compareTable(report, tables));
  for (const w of warnings) if (w.startsWith('alignment unreliable')) ctx.io.err(`quantiscope compare: ${w}`);
  return EXIT_OK;
}

export const compareCommand: Command = {
  name: 'compare',
  summary: "judge another channel's output against the signal fed to it",
  synopsis: 'REF OUT [--max-delay S] [--ledger SPEC] [--table FILE]... [--json]',
  description: [
    'REF is the signal fed to the channel, OUT what the channel gave back (a device or firmware recorded',
    "against it). REF is brought to OUT's rate through the channel path; the delay comes from the",
    'cross-correlation over the first 30 s (within +-1 s, or --max-delay), the gain from least squares.',
    'Then OUT is measured against the gained, delayed reference as analyze does: talker levels, overall SNR,',
    'the segment ledger (segments of --ledger SPEC; default the G.711 chords of OUT, or A-law chords, which',
    'are 6 dB bands, for linear files) and 20 ms frames. A low normalised correlation (below 0.9) or an',
    'ambiguous peak is reported as an unreliable alignment, on stdout and stderr.',
  ],
  options: [
    { name: 'max-delay', value: 'S', help: 'largest delay searched either way, seconds (default 1)' },
    { name: 'ledger', value: 'SPEC', help: 'channel whose segments the ledger uses' },
    TABLE_OPTION,
    { name: 'json', help: 'print one JSON object' },
    TRACK_OPTION,
    { ...RAW_OPTION, help: 'OUT is headerless G.711 (8000 Hz) of this law' },
    HELP_OPTION,
  ],
  run,
};
