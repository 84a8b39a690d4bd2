// The channel form's fields and the channel text they make. core's parser judges the
// text; its ChannelSpecError names the bad part, which leads back to the field.
import {
  ChannelSpecError,
  channelFigures,
  formatChannel,
  parseChannel,
  type ChannelFigures,
} from '../../../core/spec/index';
import { MAX_DESIGN_BITS, MIN_DESIGN_BITS } from '../../../core/design/index';

export type LawChoice = 'uniform' | 'mu' | 'a' | 'g711-mu' | 'g711-a' | 'designed';

export const LAW_CHOICES: readonly LawChoice[] = ['uniform', 'mu', 'a', 'g711-mu', 'g711-a', 'designed'];

export const LAW_LABELS: Record<LawChoice, string> = {
  uniform: 'Uniform',
  mu: 'mu-law',
  a: 'A-law',
  'g711-mu': 'G.711 mu-law',
  'g711-a': 'G.711 A-law',
  designed: 'Designed from talker',
};

export type FieldName = 'param' | 'bits' | 'rate' | 'segments';

export interface ChannelFields {
  law: LawChoice;
  /** mu or A; for uniform the form (tread or rise). */
  param: string;
  bits: string;
  rate: string;
  /** Empty: the law's default. */
  segments: string;
}

/** Which fields a law uses. */
export function fieldsOf(law: LawChoice): Record<FieldName, boolean> {
  const g711 = law === 'g711-mu' || law === 'g711-a';
  return {
    param: law === 'uniform' || law === 'mu' || law === 'a',
    bits: !g711,
    rate: true,
    segments: !g711,
  };
}

export const PARAM_LABELS: Record<LawChoice, string> = {
  uniform: 'Form (tread | rise)',
  mu: 'mu',
  a: 'A',
  'g711-mu': 'Parameter',
  'g711-a': 'Parameter',
  designed: 'Parameter',
};

export type Composed =
  | { ok: true; text: string; figures: ChannelFigures }
  | { ok: false; field: FieldName | 'text'; message: string };

/** Characters that are syntax in the channel text, so never part of one field. */
const SEPARATORS = /[:,@>/=]/;

/** The channel text of the fields (a designed table comes in as `table`). */
export function channelText(f: ChannelFields, table?: string): string {
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
    case 'designed':
      return `${table ?? 'table'}${seg}${rate}`;
  }
}

/**
 * Judges the fields: a field that holds syntax, or that core's parser names as the bad
 * part, gets the message; anything else is a message about the whole text.
 */
export function composeChannel(f: ChannelFields, table?: string): Composed {
  const used = fieldsOf(f.law);
  for (const name of ['param', 'bits', 'rate', 'segments'] as const) {
    if (!used[name]) continue;
    const v = f[name].trim();
    if (v === '' && (name === 'bits' || name === 'rate' || (name === 'param' && f.law !== 'uniform')))
      return { ok: false, field: name, message: 'required' };
    if (SEPARATORS.test(v)) return { ok: false, field: name, message: `"${v}": not a plain value` };
  }
  if (f.law === 'designed') {
    const bits = Number(f.bits.trim());
    if (!Number.isInteger(bits) || bits < MIN_DESIGN_BITS || bits > MAX_DESIGN_BITS)
      return {
        ok: false,
        field: 'bits',
        message: `"${f.bits.trim()}": bits must be a whole number from ${MIN_DESIGN_BITS} to ${MAX_DESIGN_BITS} for a design`,
      };
    if (table === undefined)
      return { ok: false, field: 'text', message: 'no design yet: design from the talker first' };
  }
  const text = channelText(f, table);
  try {
    const canonical = formatChannel(parseChannel(text));
    return { ok: true, text: canonical, figures: channelFigures(canonical) };
  } catch (err) {
    if (!(err instanceof ChannelSpecError)) throw err;
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

/** Judges a whole channel text (a preset the fields cannot express, such as a tandem). */
export function composeText(text: string): Composed {
  try {
    const canonical = formatChannel(parseChannel(text));
    return { ok: true, text: canonical, figures: channelFigures(canonical) };
  } catch (err) {
    return { ok: false, field: 'text', message: err instanceof Error ? err.message : String(err) };
  }
}

/** Fields for a channel text when one stage of a law here describes it, else null. */
export function fieldsFromText(text: string): ChannelFields | null {
  const spec = parseChannel(text);
  if (spec.stages.length !== 1) return null;
  const s = spec.stages[0];
  const rate =
    spec.rate === 'native' ? 'native' : spec.rate % 1000 === 0 ? `${spec.rate / 1000}k` : String(spec.rate);
  const seg = 'segments' in s && s.segments !== undefined ? String(s.segments) : '';
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
    case 'table':
      return null;
  }
}

/** Sensible starting values when the law changes. */
export function defaultsFor(law: LawChoice, prev: ChannelFields): ChannelFields {
  const param = law === 'mu' ? '255' : law === 'a' ? '87.6' : law === 'uniform' ? 'tread' : '';
  const bits = law === 'designed' ? '6' : law === 'uniform' ? '12' : '8';
  return { law, param, bits, rate: prev.rate || '8k', segments: '' };
}
