// Printing the channel text form. Defaults are left out, so equal channels print
// equally and parse(format(spec)) gives the spec back. A named table prints in full
// (its levels in the text) unless the short form `table:NAME` is asked for; the
// short form reads back only where its stored table is known.
import { parseChannel } from './parse';
import { storedAs, TABLE_NAME, type TableLookup } from './tables';
import {
  DEFAULT_RATE,
  type ChannelRate,
  type ChannelSpec,
  type StageOptions,
  type StageSpec,
  type TableStage,
} from './types';

function num(n: number): string {
  return String(n);
}

function options(o: StageOptions): string {
  let s = '';
  if (o.segments !== undefined) s += `,seg=${o.segments}`;
  if (o.overloadPoint !== undefined) s += `,ov=${num(o.overloadPoint)}`;
  if (o.loadCapacityDbm0 !== undefined) s += `,lc=${num(o.loadCapacityDbm0)}`;
  return s;
}

export interface FormatOptions {
  /** Print a named table as `table:NAME` and its options (default false: every level in the text). */
  short?: boolean;
  /**
   * With `short`: the stored tables. A table then prints short only where it reads back
   * through them as the same stage, and leaves out the ov and lc stored with it.
   */
  tables?: TableLookup;
}

/** The options of a short table reference: those the stored table does not supply. */
function shortOptions(stage: TableStage, tables: TableLookup | undefined): string {
  const t = stage.name === undefined ? undefined : tables?.(stage.name);
  return options({
    segments: stage.segments,
    overloadPoint: t?.overloadPoint === stage.overloadPoint ? undefined : stage.overloadPoint,
    loadCapacityDbm0: t?.loadCapacityDbm0 === stage.loadCapacityDbm0 ? undefined : stage.loadCapacityDbm0,
  });
}

export function formatStage(stage: StageSpec, form: FormatOptions = {}): string {
  switch (stage.law) {
    case 'g711-mu':
      return stage.zeroSuppression ? 'g711-mu,zs' : 'g711-mu';
    case 'g711-a':
      return 'g711-a';
    case 'uniform':
      return `uniform:${stage.bits}${stage.form === 'rise' ? ':rise' : ''}${options(stage)}`;
    case 'mu':
      return `mu:${num(stage.mu)}:${stage.bits}${options(stage)}`;
    case 'a':
      return `a:${num(stage.a)}:${stage.bits}${options(stage)}`;
    case 'table': {
      const short =
        form.short === true &&
        stage.name !== undefined &&
        TABLE_NAME.test(stage.name) &&
        (form.tables === undefined || storedAs(stage, form.tables));
      if (short) return `table:${stage.name}${shortOptions(stage, form.tables)}`;
      const name = stage.name ? `${stage.name}:` : '';
      return `table:${name}${stage.decisions.map(num).join('/')}:${stage.outputs.map(num).join('/')}${options(stage)}`;
    }
  }
}

export function formatRate(rate: ChannelRate): string {
  if (rate === 'native') return 'native';
  return rate % 1000 === 0 ? `${rate / 1000}k` : String(rate);
}

export function formatChannel(spec: ChannelSpec, form: FormatOptions = {}): string {
  const stages = spec.stages.map((s) => formatStage(s, form)).join('>');
  return spec.rate === DEFAULT_RATE ? stages : `${stages}@${formatRate(spec.rate)}`;
}

/**
 * Channel text with named tables as `table:NAME`: for showing and typing, not for storing.
 * With the stored tables, only those that read back through them are shortened.
 */
export function shortChannel(text: string, tables?: TableLookup): string {
  return formatChannel(parseChannel(text, { tables }), { short: true, tables });
}

/** The canonical text with every table's levels in it: what files and reports carry. */
export function fullChannel(text: string, tables?: TableLookup): string {
  return formatChannel(parseChannel(text, { tables }));
}
