// The channel form's fields and the channel text they make. The store's parser judges
// the text (stored tables resolved); a ChannelSpecError names the bad part, which leads
// back to the field.
import type { ChannelSpec } from '../../../core/spec/types';
import { formatChannel } from '../../../core/spec/format';
import type { TableLookup } from '../../../core/spec/tables';

export type LawChoice = 'uniform' | 'mu' | 'a' | 'g711-mu' | 'g711-a' | 'table';

export const LAW_CHOICES: readonly LawChoice[] = ['uniform', 'mu', 'a', 'g711-mu', 'g711-a', 'table'];

export const LAW_LABELS: Record<LawChoice, string> = {
  uniform: 'Uniform',
  mu: 'mu-law',
  a: 'A-law',
  'g711-mu': 'G.711 mu-law',
  'g711-a': 'G.711 A-law',
  table: 'Stored table',
};

export type FieldName = 'param' | 'bits' | 'rate' | 'segments';
export const FIELD_NAMES: readonly FieldName[] = ['param', 'bits', 'rate', 'segments'];

export interface ChannelFields {
  law: LawChoice;
  /** mu or A; for uniform the form (tread or rise); for a stored table its name. */
  param: string;
  bits: string;
  rate: string;
  /** Empty: the law's default. */
  segments: string;
}

/** Which fields a law takes from the user (a table's bits follow from its levels). */
export function fieldsOf(law: LawChoice): Record<FieldName, boolean> {
  const g711 = law === 'g711-mu' || law === 'g711-a';
  return { param: !g711, bits: !g711 && law !== 'table', rate: true, segments: !g711 };
}

export const PARAM_LABELS: Record<LawChoice, string> = {
  uniform: 'Form (tread | rise)',
  mu: 'mu',
  a: 'A',
  'g711-mu': 'Parameter',
  'g711-a': 'Parameter',
  table: 'Table',
};

export type Composed = { ok: true; text: string } | { ok: false; field: FieldName | 'text'; message: string };

/** Characters that are syntax in the channel text, so never part of one field. */
const SEPARATORS = /[:,@>/=]/;

/** The channel text of the fields. */
export function channelText(f: ChannelFields): string {
  const seg = f.segments.trim() === '' ? '' : `,seg=${f.segments.trim()}`;
  const rate = `@${f.rate.trim()}`;
  switch (f.law) {
    case 'uniform': {
      const form = f.param.trim().toLowerCase();
      return `uniform:${f.bits.trim()}${form === '' || form === 'tread' ? '' : `:${f.param.trim()}`}${seg}${rate}`;
    }
    case 'mu':
      return `mu:${f.param.trim()}:${f.bits.trim()}${seg}${rate}`;
    case 'a':
      return `a:${f.param.trim()}:${f.bits.trim()}${seg}${rate}`;
    case 'g711-mu':
    case 'g711-a':
      return `${f.law}${rate}`;
    case 'table':
      return `table:${f.param.trim()}${seg}${rate}`;
  }
}

export type Parse = (text: string) => ChannelSpec;

interface PartError {
  message: string;
  part: string;
}

const isPartError = (e: unknown): e is PartError =>
  e instanceof Error && typeof (e as unknown as { part?: unknown }).part === 'string';

/**
 * Judges the fields: a field that holds syntax, or that the parser names as the bad
 * part, gets the message; anything else is a message about the whole text.
 */
export function composeChannel(f: ChannelFields, parse: Parse): Composed {
  const used = fieldsOf(f.law);
  for (const name of FIELD_NAMES) {
    if (!used[name]) continue;
    const v = f[name].trim();
    if (v === '' && (name === 'bits' || name === 'rate' || (name === 'param' && f.law !== 'uniform')))
      return {
        ok: false,
        field: name,
        message: f.law === 'table' && name === 'param' ? 'no stored table chosen' : 'required',
      };
    if (SEPARATORS.test(v)) return { ok: false, field: name, message: `"${v}": not a plain value` };
  }
  try {
    return { ok: true, text: formatChannel(parse(channelText(f))) };
  } catch (err) {
    if (!isPartError(err)) throw err;
    const part = err.part.trim();
    const field: FieldName | 'text' =
      used.param && part === f.param.trim()
        ? 'param'
        : used.bits && part === f.bits.trim()
          ? 'bits'
          : part === f.rate.trim()
            ? 'rate'
            : part.startsWith('seg=')
              ? 'segments'
              : 'text';
    return { ok: false, field, message: err.message };
  }
}

/**
 * Fields for a channel when one stage of a law here describes it, else null (a tandem, a
 * table not stored under its name, options only the text form has).
 */
export function fieldsFromSpec(spec: ChannelSpec, tables?: TableLookup): ChannelFields | null {
  if (spec.stages.length !== 1) return null;
  const s = spec.stages[0];
  const rate =
    spec.rate === 'native' ? 'native' : spec.rate % 1000 === 0 ? `${spec.rate / 1000}k` : String(spec.rate);
  const seg = 'segments' in s && s.segments !== undefined ? String(s.segments) : '';
  if (s.law === 'table') {
    // A stored table brings its own overload point and load capacity; the form names it.
    const t = s.name === undefined ? undefined : tables?.(s.name);
    const same =
      t !== undefined &&
      t.decisions.length === s.decisions.length &&
      t.decisions.every((v, i) => v === s.decisions[i]) &&
      t.outputs.length === s.outputs.length &&
      t.outputs.every((v, i) => v === s.outputs[i]) &&
      t.overloadPoint === s.overloadPoint &&
      t.loadCapacityDbm0 === s.loadCapacityDbm0;
    const bits = String(Math.ceil(Math.log2(s.outputs.length)));
    return same ? { law: 'table', param: s.name!, bits, rate, segments: seg } : null;
  }
  // The form has no fields for a moved overload point or load capacity: those stay text-only.
  if (
    ('overloadPoint' in s && s.overloadPoint !== undefined) ||
    ('loadCapacityDbm0' in s && s.loadCapacityDbm0 !== undefined)
  )
    return null;
  switch (s.law) {
    case 'uniform':
      return { law: 'uniform', param: s.form, bits: String(s.bits), rate, segments: seg };
    case 'mu':
      return { law: 'mu', param: String(s.mu), bits: String(s.bits), rate, segments: seg };
    case 'a':
      return { law: 'a', param: String(s.a), bits: String(s.bits), rate, segments: seg };
    case 'g711-mu':
    case 'g711-a':
      return { law: s.law, param: '', bits: '8', rate, segments: '' };
  }
}

/** Sensible starting values when the law changes. */
export function defaultsFor(law: LawChoice, prev: ChannelFields, firstTable = ''): ChannelFields {
  const param =
    law === 'mu'
      ? '255'
      : law === 'a'
        ? '87.6'
        : law === 'uniform'
          ? 'tread'
          : law === 'table'
            ? firstTable
            : '';
  const bits = law === 'uniform' ? '12' : '8';
  return { law, param, bits, rate: prev.rate || '8k', segments: '' };
}
