// quantiscope analyze FILE... : the measurement engine over recordings.
import type { TableLookup } from '../../../core/spec/tables';
import { numberOption, valueOf, type ParsedArgs } from '../args';
import type { AnalyzeTask, ChannelResult, FileResult } from '../analyze-file';
import type { CliContext, Command } from '../context';
import { csvLine, fixed, percent, signed, table } from '../format';
import {
  analyseAll,
  canonical,
  CHANNEL_OPTION,
  channelsOf,
  exitStatus,
  HELP_OPTION,
  inputOptionsOf,
  JOBS_OPTION,
  jobsOf,
  needFiles,
  printReports,
  RAW_OPTION,
  reportFormOf,
  shown,
  TABLE_OPTION,
  tablesOf,
  TRACK_OPTION,
} from './common';

export const DEFAULT_ANALYZE_CHANNELS = ['g711-mu'];

function segmentRows(c: ChannelResult, tables?: TableLookup): string[][] {
  return [
    [shown(c.name, tables), 'share %', ...c.segments.map((s) => percent(s.share))],
    ['', 'SNR dB', ...c.segments.map((s) => fixed(s.snrDb))],
  ];
}

/** The terminal form of one file's figures. */
export function fileTable(r: FileResult, tables?: TableLookup): string[] {
  const lines: string[] = [];
  const rate =
    r.pathRate === r.sampleRate ? `${r.sampleRate} Hz` : `${r.sampleRate} Hz, converted to ${r.pathRate} Hz`;
  lines.push(`${r.file}  (${rate}, ${r.seconds.toFixed(2)} s)`);
  if (r.alignedToDbov !== null) {
    lines.push(
      `  aligned: gain ${signed(r.gainDb, 2)} dB brings the active level from ${fixed(r.measuredActiveLevelDbov, 2)} ` +
        `to ${fixed(r.alignedToDbov, 2)} dBov (P.56)`,
    );
  }
  const at = r.channels[0];
  lines.push(
    `  talker at ${shown(at.name, tables)}: active level ${fixed(r.activeLevelDbov, 2)} dBov, activity ${percent(r.activityFactor)} %, ` +
      `peak ${fixed(r.peakDbov, 2)} dBov, overloads ${r.overloads}`,
  );
  const weighted = r.channels.some((c) => c.weightedSnrDb !== undefined);
  const head = [
    '  channel',
    'rate',
    'kbit/s',
    'SNR dB',
    ...(weighted ? ['O.41 dB'] : []),
    'segSNR',
    'p5',
    'p50',
    'p95',
    'overloads',
  ];
  lines.push(
    ...table([
      head,
      ...r.channels.map((c) => [
        `  ${shown(c.name, tables)}`,
        String(c.rate),
        String(c.bitRate / 1000),
        fixed(c.snrDb, 2),
        ...(weighted ? [fixed(c.weightedSnrDb, 2)] : []),
        fixed(c.segSnrDb.mean, 2),
        fixed(c.segSnrDb.p5),
        fixed(c.segSnrDb.p50),
        fixed(c.segSnrDb.p95),
        String(c.overloads),
      ]),
    ]),
  );
  const most = Math.max(...r.channels.map((c) => c.segments.length));
  lines.push('  segments, softest first:');
  lines.push(
    ...table([
      ['', 'segment', ...Array.from({ length: most }, (_, s) => String(s + 1))],
      ...r.channels.flatMap((c) => segmentRows(c, tables)),
    ]).map((l) => `    ${l}`),
  );
  for (const c of r.channels) {
    if (c.stages.length < 2) continue;
    const parts = c.stages.map((s, k) =>
      k === 0
        ? `${shown(s.name, tables)} ${fixed(s.snrDb, 2)} dB`
        : `> ${shown(s.name, tables)} ${fixed(s.snrDb, 2)} dB (loss ${fixed(s.lossDb, 2)})`,
    );
    lines.push(`  tandem ${shown(c.name, tables)}, SNR after each stage: ${parts.join(' ')}`);
  }
  return lines;
}

const CSV_HEAD = [
  'file',
  'channel',
  'rate',
  'bitRate',
  'gainDb',
  'activeLevelDbov',
  'activityFactor',
  'peakDbov',
  'overloads',
  'snrDb',
  'segSnrMeanDb',
  'segSnrP5Db',
  'segSnrP50Db',
  'segSnrP95Db',
  'channelOverloads',
];

/** One CSV row per file and channel; segments and stages fill as many columns as the widest channel needs. */
export function resultsCsv(results: readonly FileResult[]): string[] {
  const segs = Math.max(0, ...results.flatMap((r) => r.channels.map((c) => c.segments.length)));
  const stages = Math.max(0, ...results.flatMap((r) => r.channels.map((c) => c.stages.length)));
  const head = [...CSV_HEAD];
  for (let s = 1; s <= segs; s++) head.push(`seg${s}Share`, `seg${s}SnrDb`);
  for (let s = 1; s <= stages; s++) head.push(`stage${s}SnrDb`);
  const rows = [csvLine(head)];
  for (const r of results) {
    for (const c of r.channels) {
      const row: (string | number | null)[] = [
        r.file,
        c.name,
        c.rate,
        c.bitRate,
        r.gainDb,
        r.activeLevelDbov,
        r.activityFactor,
        r.peakDbov,
        r.overloads,
        c.snrDb,
        c.segSnrDb.mean,
        c.segSnrDb.p5,
        c.segSnrDb.p50,
        c.segSnrDb.p95,
        c.overloads,
      ];
      for (let s = 0; s < segs; s++) row.push(c.segments[s]?.share ?? null, c.segments[s]?.snrDb ?? null);
      for (let s = 0; s < stages; s++) row.push(c.stages[s]?.snrDb ?? null);
      rows.push(csvLine(row));
    }
  }
  return rows;
}

async function run(args: ParsedArgs, ctx: CliContext): Promise<number> {
  const files = needFiles(args);
  const tables = await tablesOf(args);
  const channels = canonical(channelsOf(args, DEFAULT_ANALYZE_CHANNELS, tables));
  const form = reportFormOf(args);
  const alignText = valueOf(args, 'align');
  const alignDbov = alignText === undefined ? null : numberOption('align', alignText, { min: -100, max: 0 });
  const input = inputOptionsOf(args);
  const tasks: AnalyzeTask[] = files.map((file) => ({
    file,
    channels,
    alignDbov,
    weighting: args.flags.has('weighting'),
    ...input,
  }));
  const settled = await analyseAll('analyze', tasks, jobsOf(args, ctx), ctx);
  const results = settled.flatMap((s) => (s.ok ? [s.value.result] : []));
  printReports(ctx, form, results, resultsCsv, (r) => fileTable(r, tables));
  const failed = settled.length - results.length;
  return exitStatus(ctx, 'analyze', failed > 0 ? `${failed} of ${settled.length} files failed` : null);
}

export const analyzeCommand: Command = {
  name: 'analyze',
  summary: 'SNR, segments and talker levels of recordings through channels',
  synopsis: 'FILE... [--channel SPEC]... [--table FILE]... [--json | --csv] [--align DBOV] [--jobs N]',
  description: [
    'Runs each file through the channel path and every channel given (default g711-mu) and reports, per file',
    'and channel: the P.56 active level and activity, peak and overloads where the first channel meets the',
    'talker, overall SNR, segmental SNR (20 ms frames: mean and percentiles), and per-segment occupancy and',
    'SNR. A tandem channel (stages joined by >) also shows the SNR after each stage and the loss each adds.',
    'Files whose rate is not a whole multiple of the channel rates are converted to the nearest common',
    'multiple of them (48000 Hz for 8 and 16 kHz channels) first.',
    'JSON: an array with one object per file analysed: file, activeLevelDbov, activityFactor, peakDbov,',
    'overloads, channels [{name, snrDb, segSnrDb {mean, p5, p50, p95}, segments [{index, share, snrDb}],',
    'stages [{name, snrDb, lossDb}], ...}], and sampleRate, seconds, gainDb, alignedToDbov. Figures that',
    'do not exist (silence, no error) are null. A table channel is named in JSON and CSV by its full text',
    '(every level), however it was given; the terminal table shows a named table as table:NAME.',
    'Exit status 1 when any file failed (each is named on stderr with its reason; the others are still',
    'analysed and reported), 2 for a usage mistake.',
  ],
  options: [
    CHANNEL_OPTION,
    TABLE_OPTION,
    { name: 'json', help: 'print one JSON array' },
    { name: 'csv', help: 'print CSV, one row per file and channel' },
    {
      name: 'align',
      value: 'DBOV',
      help: 'first measure the active level (P.56), then analyse with the gain that brings it to DBOV (for example -26)',
    },
    { name: 'weighting', help: 'also report the O.41 psophometrically weighted SNR' },
    JOBS_OPTION,
    TRACK_OPTION,
    RAW_OPTION,
    HELP_OPTION,
  ],
  run,
};
