// Printing the channel text form. Defaults are left out, so equal channels print
// equally and parse(format(spec)) gives the spec back. A named table prints in full
// (its levels in the text) unless the short form `table:NAME` is asked for; the
// short form reads back only where its stored table is known.
import { parseChannel } from './parse';
import { TABLE_NAME, type TableLookup } from './tables';
import { DEFAULT_RATE, type ChannelRate, type ChannelSpec, type StageOptions, type StageSpec } from './types';

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
  /** Print a named table as `table:NAME` (default false: every level in the text). */
  short?: boolean;
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
      if (form.short === true && stage.name !== undefined && TABLE_NAME.test(stage.name))
        return `table:${stage.name}${options(stage)}`;
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

/** Channel text with every named table as `table:NAME`: for showing and typing, not for storing. */
export function shortChannel(text: string, tables?: TableLookup): string {
  return formatChannel(parseChannel(text, { tables }), { short: true });
}

/** The canonical text with every table's levels in it: what files and reports carry. */
export function fullChannel(text: string, tables?: TableLookup): string {
  return formatChannel(parseChannel(text, { tables }));
}
