// quantiscope design FILE... --bits N | --recommend: quantizers for the files' talker.
//
// A first pass runs the files through the channel path to the design rate and keeps
// the levels of the talker's active 20 ms frames, tallied over all files exactly as the
// page tallies them (FrameLevelTally over the segmental meter's frame trace). --bits
// designs for them as the page does (designForTalker: each frame a Laplacian at its
// level); the predicted SNR is the exact integral over that model, and a second pass
// measures it on the files. --recommend ranks the candidate channels by bit rate for
// the same frames, against the page's default target unless told otherwise.
import { FrameLevelTally } from '../../../core/design/frame-tally';
import { recommend, type FrameLevels, type Recommendation } from '../../../core/design/recommend';
import { DEFAULT_TALKER_TARGET, designForTalker } from '../../../core/design/talker-design';
import { ChannelSpecError } from '../../../core/spec/errors';
import { formatChannel } from '../../../core/spec/format';
import { parseRate } from '../../../core/spec/parse';
import { storedTable, TABLE_NAME } from '../../../core/spec/tables';
import type { ChannelSpec } from '../../../core/spec/types';
import { PCM16_SCALE } from '../../../core/units/levels';
import { choiceOption, numberOption, UsageError, valueOf, type ParsedArgs } from '../args';
import type { AnalyzeOutcome, AnalyzeTask, LevelsResult } from '../analyze-file';
import type { CliContext, Command } from '../context';
import { fixed, percent, signed, table } from '../format';
import { checkOutput, writeTableFile } from '../table-files';
import type { Settled } from '../workers';
import {
  analyseAll,
  exitStatus,
  HELP_OPTION,
  inputOptionsOf,
  JOBS_OPTION,
  jobsOf,
  needFiles,
  printLines,
  RAW_OPTION,
  TRACK_OPTION,
} from './common';

/** The active frames of all files in one record, as one session on the page would keep them; null for none. */
export function mergeLevels(all: readonly LevelsResult[]): FrameLevels | null {
  const tally = new FrameLevelTally();
  for (const l of all) tally.merge(l.frames);
  return tally.levels();
}

export interface DesignReport {
  files: string[];
  /** Active 20 ms frames designed for. */
  frames: number;
  rateHz: number;
  method: 'lloyd-max' | 'panter-dite';
  bits: number;
  /** The table's name: table:NAME in a channel where its tables file is given. */
  name: string;
  /** Full channel text, every level in it. */
  channel: string;
  /** The tables file written by --table-out, or null. */
  tableFile: string | null;
  /** Positive half: decision values t_1 .. t_{M-1} and outputs y_1 .. y_M (float scale). */
  decisions: number[];
  outputs: number[];
  predictedSnrDb: number;
  measuredSnrDb: number | null;
  measuredSegSnrDb: number | null;
  iterations: number;
  converged: boolean;
}

function combined(settled: readonly Settled[]): { snrDb: number | null; segSnrDb: number | null } {
  let s = 0;
  let e = 0;
  let frames = 0;
  let segSum = 0;
  for (const r of settled) {
    if (!r.ok) continue;
    const c = r.value.sums[0];
    s += c.signalEnergy;
    e += c.errorEnergy;
    if (c.segSnrMeanDb !== null) {
      frames += c.measuredFrames;
      segSum += c.segSnrMeanDb * c.measuredFrames;
    }
  }
  return {
    snrDb: s > 0 && e > 0 ? 10 * Math.log10(s / e) : null,
    segSnrDb: frames > 0 ? segSum / frames : null,
  };
}

export function designTable(d: DesignReport): string[] {
  const m = d.outputs.length;
  const rows = [['  level', 'decision from', '(16-bit)', 'output', '(16-bit)']];
  for (let i = 0; i < m; i++) {
    const from = i === 0 ? 0 : d.decisions[i - 1];
    rows.push([
      `  ${i + 1}`,
      from.toPrecision(6),
      (from * PCM16_SCALE).toFixed(1),
      d.outputs[i].toPrecision(6),
      (d.outputs[i] * PCM16_SCALE).toFixed(1),
    ]);
  }
  return [
    `${d.method} quantizer, ${d.bits} bits (${2 * m} levels, odd-symmetric; positive half below) at ${d.rateHz} Hz,`,
    `designed for the ${d.frames} active frames of ${d.files.length} file(s)${d.converged ? '' : ` (stopped after ${d.iterations} steps)`}`,
    ...table(rows),
    `  predicted SNR ${fixed(d.predictedSnrDb, 2)} dB (the table integrated over the talker: each frame Laplacian at its level)`,
    `  measured SNR  ${fixed(d.measuredSnrDb, 2)} dB on the files (segmental ${fixed(d.measuredSegSnrDb, 2)} dB)`,
    `  channel text: ${d.channel}`,
    ...(d.tableFile === null ? [] : [`  stored as table:${d.name} in ${d.tableFile}`]),
  ];
}

export function recommendTable(r: Recommendation): string[] {
  const rows = [['   ', 'channel', 'family', 'bits', 'kbit/s', 'share %', 'SNR at share', 'margin', '']];
  r.candidates.forEach((c, i) => {
    rows.push([
      i === r.chosen ? '  >' : '   ',
      c.id,
      c.family,
      String(c.bits),
      String(c.bitRate / 1000),
      percent(c.predictedShare, 2),
      fixed(c.snrAtShareDb, 2),
      signed(c.snrMarginDb, 2),
      c.meets ? 'meets' : '',
    ]);
  });
  const chosen = r.chosen < 0 ? null : r.candidates[r.chosen];
  return [
    `Candidates for ${r.frames} active frames (${r.frameShape} frames at ${r.rateHz} Hz), cheapest first:`,
    `target ${fixed(r.targetSnrDb, 1)} dB in ${percent(r.share, 2)} % of the frames`,
    ...table(rows, ['left', 'left', 'left', 'right', 'right', 'right', 'right', 'right', 'left']),
    chosen === null
      ? '  no candidate meets the target'
      : `  cheapest that meets it: ${chosen.id} at ${chosen.bitRate / 1000} kbit/s`,
  ];
}

function successes(settled: readonly Settled[]): AnalyzeOutcome[] {
  return settled.flatMap((s) => (s.ok ? [s.value] : []));
}

async function run(args: ParsedArgs, ctx: CliContext): Promise<number> {
  const files = needFiles(args);
  const bitsText = valueOf(args, 'bits');
  const wantRecommend = args.flags.has('recommend');
  if (bitsText === undefined && !wantRecommend) throw new UsageError('give --bits N, --recommend, or both');
  const bits =
    bitsText === undefined ? null : numberOption('bits', bitsText, { integer: true, min: 1, max: 12 });
  const method = choiceOption('method', valueOf(args, 'method') ?? 'lloyd-max', [
    'lloyd-max',
    'panter-dite',
  ] as const);
  let rate: number;
  try {
    const r = parseRate(valueOf(args, 'rate') ?? '8k');
    if (r === 'native') throw new UsageError('--rate needs a rate in Hz (8k, 16k, ...), not native');
    rate = r;
  } catch (err) {
    if (err instanceof ChannelSpecError) throw new UsageError(`--rate: ${err.message}`);
    throw err;
  }
  const target = valueOf(args, 'target-snr');
  const share = valueOf(args, 'share');
  if (!wantRecommend && (target !== undefined || share !== undefined))
    throw new UsageError('--target-snr and --share go with --recommend');
  const targetSnrDb =
    target === undefined
      ? DEFAULT_TALKER_TARGET.targetSnrDb
      : numberOption('target-snr', target, { min: -20, max: 150 });
  const shareValue =
    share === undefined ? DEFAULT_TALKER_TARGET.share : numberOption('share', share, { min: 1e-6, max: 1 });
  const shape = choiceOption('shape', valueOf(args, 'shape') ?? 'laplacian', [
    'laplacian',
    'gaussian',
  ] as const);
  const alignText = valueOf(args, 'align');
  const alignDbov = alignText === undefined ? null : numberOption('align', alignText, { min: -100, max: 0 });
  const json = args.flags.has('json');
  const input = inputOptionsOf(args);
  const jobs = jobsOf(args, ctx);
  const name = valueOf(args, 'name');
  if (name !== undefined && !TABLE_NAME.test(name))
    throw new UsageError(
      `--name ${name}: a table name is letters, digits, - and _, starting with a letter, at most 32`,
    );
  const tableOut = valueOf(args, 'table-out') ?? null;
  const force = args.flags.has('force');
  if (bits === null && (tableOut !== null || name !== undefined))
    throw new UsageError('--table-out and --name go with --bits');
  if (force && tableOut === null) throw new UsageError('--force goes with --table-out');
  // Refused before the long analysis; checked again just before writing.
  if (tableOut !== null) await checkOutput(tableOut, '--table-out', files, force);

  // 16-bit linear PCM at the design rate: a transparent meter of the talker.
  const probe = formatChannel({ stages: [{ law: 'uniform', bits: 16, form: 'tread' }], rate });
  const task = (file: string, channel: string, collectLevels: boolean): AnalyzeTask => ({
    file,
    channels: [channel],
    alignDbov,
    collectLevels,
    ...input,
  });
  const first = await analyseAll(
    'design',
    files.map((f) => task(f, probe, true)),
    jobs,
    ctx,
  );
  const good = successes(first);
  let failed = first.length - good.length;
  if (good.length === 0) {
    return exitStatus(ctx, 'design', 'no file could be read, so there is nothing to design for');
  }
  const frames = mergeLevels(good.map((o) => o.levels as LevelsResult));
  if (frames === null) return exitStatus(ctx, 'design', 'the files hold no active frames to design for');
  const frameCount = (frames.weights ?? []).reduce((a, w) => a + w, 0);
  const okFiles = good.map((o) => o.result.file);
  const out: { design?: DesignReport; recommendation?: Recommendation } = {};
  let writeFailure: string | null = null;

  if (bits !== null) {
    const d = designForTalker(frames, bits, { method, name });
    const spec: ChannelSpec = { stages: [d.stage], rate };
    const channel = formatChannel(spec);
    const second = await analyseAll(
      'design',
      okFiles.map((f) => task(f, channel, false)),
      jobs,
      ctx,
    );
    failed += second.length - successes(second).length;
    const measured = combined(second);
    const half = d.stage.outputs.length / 2;
    let tableFile: string | null = null;
    if (tableOut !== null) {
      const listed =
        okFiles.slice(0, 5).join(', ') + (okFiles.length > 5 ? ` and ${okFiles.length - 5} more` : '');
      const note = `${method} ${bits} bits at ${rate} Hz, designed by quantiscope design from ${listed}`;
      try {
        await checkOutput(tableOut, '--table-out', files, force);
        await writeTableFile(tableOut, [storedTable(d.stage, { note, created: new Date().toISOString() })]);
        tableFile = tableOut;
      } catch (err) {
        // The design itself is still reported below; only the file is missing.
        writeFailure = err instanceof Error ? err.message : String(err);
      }
    }
    out.design = {
      files: okFiles,
      frames: frameCount,
      rateHz: rate,
      method,
      bits,
      name: d.stage.name ?? '',
      channel,
      tableFile,
      decisions: d.stage.decisions.slice(half),
      outputs: d.stage.outputs.slice(half),
      predictedSnrDb: d.snrDb,
      measuredSnrDb: measured.snrDb,
      measuredSegSnrDb: measured.segSnrDb,
      iterations: d.iterations,
      converged: d.converged,
    };
  }
  if (wantRecommend) {
    out.recommendation = recommend(frames, {
      targetSnrDb,
      share: shareValue,
      frameShape: shape,
      rateHz: rate,
    });
  }
  if (json) ctx.io.out(JSON.stringify(out, null, 2));
  else {
    if (out.design !== undefined) printLines(ctx, designTable(out.design));
    if (out.design !== undefined && out.recommendation !== undefined) ctx.io.out('');
    if (out.recommendation !== undefined) printLines(ctx, recommendTable(out.recommendation));
  }
  if (writeFailure !== null) return exitStatus(ctx, 'design', writeFailure);
  return exitStatus(
    ctx,
    'design',
    failed > 0 ? `${failed} file run(s) failed; the figures above leave them out` : null,
  );
}

export const designCommand: Command = {
  name: 'design',
  summary: "design a quantizer for the files' talker, or recommend a channel",
  synopsis: 'FILE... (--bits N [--table-out FILE [--force]] | --recommend [--target-snr DB] [--share S])',
  description: [
    'Runs the files through the channel path to the design rate (default 8000 Hz) and gathers the levels of',
    'their active 20 ms frames (those above the -60 dBov silence floor of the segmental SNR), as the page',
    'gathers them from a talker, so both design and recommend the same for the same recording.',
    '--bits N designs an N-bit odd-symmetric quantizer for those frames, each taken as a Laplacian at its',
    'own level (Lloyd-Max, or Panter-Dite with --method panter-dite), and prints its table, its predicted',
    'SNR (exact for that talker model) and the SNR measured running the files through it; the channel text',
    'it prints goes to --channel elsewhere.',
    '--table-out FILE also writes the table to a tables file under its name (--name, default talker-lm-N or',
    'talker-pd-N), so other commands take it as --table FILE --channel table:NAME. The file is written',
    'whole and renamed into place; an existing file is replaced only with --force, an input file never.',
    '--recommend ranks uniform, mu-law, A-law, G.711 and designed candidates by bit rate for a target SNR',
    `met by a share of the active frames (default ${DEFAULT_TALKER_TARGET.targetSnrDb} dB in ` +
      `${100 * DEFAULT_TALKER_TARGET.share} %, as on the page) and marks the cheapest that meets it.`,
  ],
  options: [
    { name: 'bits', value: 'N', help: 'design an N-bit quantizer (1 to 12)' },
    { name: 'method', value: 'lloyd-max|panter-dite', help: 'design method (default lloyd-max)' },
    { name: 'name', value: 'NAME', help: 'name of the designed table (letters, digits, - and _)' },
    { name: 'table-out', value: 'FILE', help: 'write the designed table to this tables file' },
    { name: 'force', help: 'let --table-out replace an existing file' },
    { name: 'recommend', help: 'rank candidate channels by bit rate' },
    {
      name: 'target-snr',
      value: 'DB',
      help: `SNR the frames must reach (default ${DEFAULT_TALKER_TARGET.targetSnrDb})`,
    },
    {
      name: 'share',
      value: 'S',
      help: `share of active frames that must reach it, 0..1 (default ${DEFAULT_TALKER_TARGET.share})`,
    },
    {
      name: 'shape',
      value: 'laplacian|gaussian',
      help: 'amplitude density of a frame for the recommender (default laplacian)',
    },
    { name: 'rate', value: 'RATE', help: 'channel rate of the design (default 8k)' },
    {
      name: 'align',
      value: 'DBOV',
      help: 'bring each file to this active level first, as analyze --align does',
    },
    { name: 'json', help: 'print JSON: {design, recommendation}' },
    JOBS_OPTION,
    TRACK_OPTION,
    RAW_OPTION,
    HELP_OPTION,
  ],
  run,
};
