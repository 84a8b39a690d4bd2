// Options and steps several commands share.
import { ChannelSpecError } from '../../../core/spec/errors';
import { formatChannel, shortChannel } from '../../../core/spec/format';
import { parseChannel } from '../../../core/spec/parse';
import type { TableLookup } from '../../../core/spec/tables';
import type { ChannelSpec } from '../../../core/spec/types';
import {
  choiceOption,
  numberOption,
  UsageError,
  valueOf,
  valuesOf,
  type OptionSpec,
  type ParsedArgs,
} from '../args';
import type { AnalyzeTask } from '../analyze-file';
import { EXIT_FAILURE, EXIT_OK, type CliContext } from '../context';
import type { InputOptions } from '../input';
import { Progress, TaskProgress } from '../progress';
import { readTableFiles } from '../table-files';
import { runTasks, type Settled } from '../workers';

export const HELP_OPTION: OptionSpec = { name: 'help', short: 'h', help: 'this text' };

export const CHANNEL_OPTION: OptionSpec = {
  name: 'channel',
  short: 'c',
  value: 'SPEC',
  repeat: true,
  help: 'a channel in the text form (see `quantiscope channel --help`)',
};

export const TABLE_OPTION: OptionSpec = {
  name: 'table',
  value: 'FILE',
  repeat: true,
  help: 'a tables file (as design --table-out writes); its tables may be named as table:NAME',
};

export const TRACK_OPTION: OptionSpec = {
  name: 'track',
  value: 'N',
  help: 'which channel of a multichannel file to read, counted from 1 (default 1)',
};

export const RAW_OPTION: OptionSpec = {
  name: 'raw',
  value: 'mu|a',
  help: 'input files are headerless G.711 (8000 Hz) of this law',
};

export const JOBS_OPTION: OptionSpec = {
  name: 'jobs',
  short: 'j',
  value: 'N',
  help: 'files analysed in parallel (default: the number of cores, at most the number of files)',
};

/** The tables of every --table file, for table:NAME; a bad file is a usage error naming it. */
export function tablesOf(args: ParsedArgs): Promise<TableLookup | undefined> {
  return readTableFiles(valuesOf(args, 'table'));
}

/** Parsed channel texts; a bad one is a usage error naming the bad part. */
export function channelsOf(
  args: ParsedArgs,
  fallback: readonly string[],
  tables?: TableLookup,
): ChannelSpec[] {
  const texts = valuesOf(args, 'channel');
  return (texts.length > 0 ? texts : fallback).map((t) => parseChannelOption(t, tables));
}

export function parseChannelOption(text: string, tables?: TableLookup, option = '--channel'): ChannelSpec {
  try {
    return parseChannel(text, { tables });
  } catch (err) {
    if (!(err instanceof ChannelSpecError)) throw err;
    const hint = /no stored table/.test(err.message) ? '; give its tables file with --table FILE' : '';
    throw new UsageError(`${option} ${text}: ${err.message}${hint}`);
  }
}

/** Full text forms: every table with its levels, so what is written reads back anywhere. */
export function canonical(specs: readonly ChannelSpec[]): string[] {
  return specs.map((s) => formatChannel(s));
}

/**
 * A channel's text for the terminal tables: a named table by its name, and by its name
 * alone where the --table files hold it as it is.
 */
export function shown(text: string, tables?: TableLookup): string {
  try {
    return shortChannel(text, tables);
  } catch {
    return text;
  }
}

export function inputOptionsOf(args: ParsedArgs): InputOptions {
  const track = valueOf(args, 'track');
  const raw = valueOf(args, 'raw');
  return {
    track: track === undefined ? 0 : numberOption('track', track, { integer: true, min: 1 }) - 1,
    raw: raw === undefined ? undefined : choiceOption('raw', raw, ['mu', 'a'] as const),
  };
}

export function jobsOf(args: ParsedArgs, ctx: CliContext): number {
  const j = valueOf(args, 'jobs');
  return j === undefined ? ctx.cores : numberOption('jobs', j, { integer: true, min: 1, max: 256 });
}

/** How a report is printed: --json, --csv (not both) or the terminal tables. */
export type ReportForm = 'json' | 'csv' | 'table';

export function reportFormOf(args: ParsedArgs): ReportForm {
  const json = args.flags.has('json');
  const csv = args.flags.has('csv');
  if (json && csv) throw new UsageError('choose one of --json and --csv');
  return json ? 'json' : csv ? 'csv' : 'table';
}

export function printLines(ctx: CliContext, lines: readonly string[]): void {
  for (const l of lines) ctx.io.out(l);
}

/** One indented JSON array, the CSV of all, or a table each with a blank line between. */
export function printReports<T>(
  ctx: CliContext,
  form: ReportForm,
  reports: readonly T[],
  csv: (all: readonly T[]) => string[],
  tableOf: (r: T) => string[],
): void {
  if (form === 'json') ctx.io.out(JSON.stringify(reports, null, 2));
  else if (form === 'csv') printLines(ctx, csv(reports));
  else
    reports.forEach((r, i) => {
      if (i > 0) ctx.io.out('');
      printLines(ctx, tableOf(r));
    });
}

/** The exit status once the report is out: a failure, if any, goes to stderr under the command's name. */
export function exitStatus(ctx: CliContext, command: string, failure: string | null): number {
  if (failure === null) return EXIT_OK;
  ctx.io.err(`quantiscope ${command}: ${failure}`);
  return EXIT_FAILURE;
}

export function needFiles(args: ParsedArgs, what = 'at least one audio file'): string[] {
  if (args.operands.length === 0) throw new UsageError(`give ${what}`);
  return args.operands;
}

/**
 * Runs the analysis tasks with a progress line, naming each failure on stderr in
 * file order (as a serial run would, whatever order parallel tasks finish in).
 */
export async function analyseAll(
  command: string,
  tasks: AnalyzeTask[],
  jobs: number,
  ctx: CliContext,
): Promise<Settled[]> {
  const progress = new Progress(ctx.io.status, command);
  const tracker = new TaskProgress(progress, tasks.length);
  const done: (Settled | undefined)[] = new Array<Settled | undefined>(tasks.length);
  let reported = 0;
  try {
    return await runTasks(tasks, {
      jobs,
      workerScript: ctx.workerScript,
      onProgress: (i, d, total) => tracker.task(i, d, total),
      onSettled: (i, s) => {
        tracker.settled(i);
        done[i] = s;
        for (let r = done[reported]; r !== undefined; r = done[reported]) {
          reported++;
          if (!r.ok) {
            progress.done();
            ctx.io.err(`quantiscope ${command}: ${r.file}: ${r.reason}`);
          }
        }
      },
    });
  } finally {
    progress.done();
  }
}
