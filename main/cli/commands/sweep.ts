// quantiscope sweep --channel SPEC... : SNR versus level against the acceptance mask.
import { formatStage } from '../../../core/spec/format';
import type { TableLookup } from '../../../core/spec/tables';
import type { ChannelSpec } from '../../../core/spec/types';
import {
  G712_SINE_MASK,
  MaskError,
  parseMask,
  runSweep,
  type Mask,
  type SweepResult,
} from '../../../core/sweep/index';
import { choiceOption, numberOption, UsageError, valueOf, type ParsedArgs } from '../args';
import type { CliContext, Command } from '../context';
import { csvLine, fixed, signed, table } from '../format';
import {
  CHANNEL_OPTION,
  channelsOf,
  exitStatus,
  HELP_OPTION,
  printReports,
  reportFormOf,
  shown,
  TABLE_OPTION,
  tablesOf,
} from './common';

/** In-band and wideband figures after the first s stages of a tandem, per level. */
export interface StageSweep {
  /** Text form of stages 1..s. */
  channel: string;
  /** The stage added last. */
  stage: string;
  inBandDb: number[];
  widebandDb: number[];
}

export interface SweepReport extends SweepResult {
  /** One entry per stage of a tandem (empty for a single stage): the sweep after stages 1..s. */
  stageSweeps: StageSweep[];
}

function prefix(spec: ChannelSpec, s: number): ChannelSpec {
  return { stages: spec.stages.slice(0, s), rate: spec.rate };
}

export function sweepReport(spec: ChannelSpec, options: Parameters<typeof runSweep>[1]): SweepReport {
  const result = runSweep(spec, options);
  const stageSweeps: StageSweep[] = [];
  if (spec.stages.length > 1) {
    for (let s = 1; s <= spec.stages.length; s++) {
      const r = s === spec.stages.length ? result : runSweep(prefix(spec, s), { ...options, mask: null });
      stageSweeps.push({
        channel: r.channel,
        stage: formatStage(spec.stages[s - 1]),
        inBandDb: r.points.map((p) => p.inBandDb),
        widebandDb: r.points.map((p) => p.widebandDb),
      });
    }
  }
  return { ...result, stageSweeps };
}

function verdictText(r: SweepReport): string {
  const j = r.judgement;
  if (j === null) return 'no mask judged';
  if (j.judged === 0) return `mask "${j.mask.name}": no level of the sweep lies inside it`;
  const worst = `worst margin ${signed(j.worstMarginDb, 2)} dB at ${fixed(j.worstDbm0)} dBm0`;
  return j.pass
    ? `PASS against "${j.mask.name}" (${j.judged} levels judged, ${worst})`
    : `FAIL against "${j.mask.name}": ${j.failed} of ${j.judged} levels below the mask (${worst})`;
}

export function sweepTable(r: SweepReport, tables?: TableLookup): string[] {
  const stim =
    r.stimulus.method === 'sine'
      ? `sine ${r.stimulus.frequencyHz} Hz`
      : `noise ${r.stimulus.bandHz?.[0]}-${r.stimulus.bandHz?.[1]} Hz`;
  const lines = [
    `${shown(r.channel, tables)}  (${stim} at ${r.rateHz} Hz; in-band ${r.analysisBandHz[0]}-${r.analysisBandHz[1]} Hz` +
      `${r.judgement === null ? '' : `; mask held against the ${r.judgement.figure} figure`})`,
  ];
  const tandem = r.stageSweeps.length > 1 ? r.stageSweeps.slice(0, -1) : [];
  const head = [
    '  dBm0',
    'dBov',
    'wideband',
    'in-band',
    'theory',
    ...tandem.map((s, k) => `after ${k + 1}`),
    'limit',
    'margin',
    '',
  ];
  const rows = r.points.map((p, i) => {
    const v = r.judgement?.verdicts[i];
    return [
      `  ${fixed(p.dbm0)}`,
      fixed(p.dbov, 2),
      fixed(p.widebandDb, 2),
      fixed(p.inBandDb, 2),
      fixed(p.theoryDb, 2),
      ...tandem.map((s) => fixed(s.inBandDb[i], 2)),
      fixed(v?.requiredDb ?? null),
      signed(v?.marginDb ?? null, 2),
      v === undefined || v.pass === null ? '' : v.pass ? 'ok' : 'FAIL',
    ];
  });
  lines.push(...table([head, ...rows]));
  if (tandem.length > 0) {
    const names = r.stageSweeps.map((s, k) => `${k + 1} ${shown(s.stage, tables)}`).join(', ');
    lines.push(`  stages: ${names}; "after k" is the in-band SNR after stages 1..k (in-band is after all)`);
  }
  lines.push(`  ${verdictText(r)}`);
  return lines;
}

export function sweepCsv(reports: readonly SweepReport[]): string[] {
  const stages = Math.max(0, ...reports.map((r) => r.stageSweeps.length));
  const head = [
    'channel',
    'dbm0',
    'dbov',
    'widebandDb',
    'inBandDb',
    'theoryDb',
    'overloadShare',
    'requiredDb',
    'marginDb',
    'pass',
  ];
  for (let s = 1; s <= stages; s++) head.push(`stage${s}InBandDb`);
  const rows = [csvLine(head)];
  for (const r of reports) {
    r.points.forEach((p, i) => {
      const v = r.judgement?.verdicts[i];
      const row: (string | number | null)[] = [
        r.channel,
        p.dbm0,
        p.dbov,
        p.widebandDb,
        p.inBandDb,
        p.theoryDb,
        p.overloadShare,
        v?.requiredDb ?? null,
        v?.marginDb ?? null,
        v === undefined || v.pass === null ? null : v.pass ? 'pass' : 'fail',
      ];
      for (let s = 0; s < stages; s++) row.push(r.stageSweeps[s]?.inBandDb[i] ?? null);
      rows.push(csvLine(row));
    });
  }
  return rows;
}

function maskOf(args: ParsedArgs): Mask | null | undefined {
  const text = valueOf(args, 'mask');
  if (text === undefined) return undefined;
  if (text === 'none') return null;
  if (text === 'g712') return G712_SINE_MASK;
  try {
    return parseMask(text, 'custom');
  } catch (err) {
    if (err instanceof MaskError) throw new UsageError(`--mask: ${err.message}`);
    throw err;
  }
}

async function run(args: ParsedArgs, ctx: CliContext): Promise<number> {
  if (args.operands.length > 0) throw new UsageError(`sweep takes no files (got ${args.operands[0]})`);
  const tables = await tablesOf(args);
  const specs = channelsOf(args, [], tables);
  if (specs.length === 0) throw new UsageError('give at least one --channel');
  const form = reportFormOf(args);
  const num = (name: string, fallback: number) => {
    const t = valueOf(args, name);
    return t === undefined ? fallback : numberOption(name, t, { min: -150, max: 50 });
  };
  const method = choiceOption('method', valueOf(args, 'method') ?? 'sine', ['sine', 'noise'] as const);
  const figure = choiceOption('figure', valueOf(args, 'figure') ?? 'in-band', [
    'in-band',
    'wideband',
  ] as const);
  const step = valueOf(args, 'step');
  const options = {
    method,
    fromDbm0: num('from', -60),
    toDbm0: num('to', 3),
    stepDb: step === undefined ? 1 : numberOption('step', step, { min: 0.01, max: 100 }),
    mask: maskOf(args),
    maskFigure: figure,
  };
  const reports: SweepReport[] = [];
  for (const spec of specs) {
    try {
      reports.push(sweepReport(spec, options));
    } catch (err) {
      if (err instanceof RangeError) throw new UsageError(err.message);
      throw err;
    }
  }
  printReports(ctx, form, reports, sweepCsv, (r) => sweepTable(r, tables));
  const failed = reports.filter((r) => r.judgement !== null && r.judgement.judged > 0 && !r.judgement.pass);
  return exitStatus(
    ctx,
    'sweep',
    failed.length > 0 ? `${failed.map((r) => shown(r.channel, tables)).join(', ')} failed the mask` : null,
  );
}

export const sweepCommand: Command = {
  name: 'sweep',
  summary: 'SNR versus level of channels against the G.712 mask',
  synopsis:
    '--channel SPEC... [--table FILE]... [--method sine|noise] [--from DBM0] [--to DBM0] [--step DB] [--mask TEXT]',
  description: [
    'Runs a level sweep at each channel rate: a 1020 Hz sine (ten one-period takes per level) or, with',
    '--method noise, band-limited Gaussian noise after O.131. Each level shows the wideband SNR (the exact',
    'theory predicts it; shown beside it), the in-band figure (300-3400 Hz, tone removed: what G.712',
    'judges) and the mask limit with the margin. The default mask for the sine is the G.712 sine-method',
    'mask (from memory: 24 dB at -45, 29 at -40, 35 from -30 to 0 dBm0); the noise method has none.',
    'A tandem channel adds the in-band SNR after each stage. Exit status 1 when a channel fails its mask.',
  ],
  options: [
    CHANNEL_OPTION,
    TABLE_OPTION,
    { name: 'method', value: 'sine|noise', help: 'stimulus (default sine)' },
    { name: 'from', value: 'DBM0', help: 'lowest level (default -60)' },
    { name: 'to', value: 'DBM0', help: 'highest level (default +3)' },
    { name: 'step', value: 'DB', help: 'level step (default 1)' },
    {
      name: 'mask',
      value: 'TEXT',
      help: 'corners DBM0:DB,DBM0:DB,... joined by straight lines; g712 (the default for the sine) or none',
    },
    {
      name: 'figure',
      value: 'in-band|wideband',
      help: 'which figure the mask is held against (default in-band)',
    },
    { name: 'json', help: 'print one JSON array, one sweep per channel' },
    { name: 'csv', help: 'print CSV, one row per channel and level' },
    HELP_OPTION,
  ],
  run,
};
