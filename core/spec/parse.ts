// Reading the channel text form, for example `g711-mu`, `mu:255:8`, `uniform:12:rise,seg=10`,
// `a:87.6:8@16k`, `table:talker-lm-4` (a stored table), or a tandem `g711-mu>g711-a>g711-mu`.
// Every refusal names the bad part.
import { checkTable } from '../quantizers/table';
import { ChannelSpecError } from './errors';
import { TABLE_NAME, type TableLookup } from './tables';
import { DEFAULT_RATE, type ChannelRate, type ChannelSpec, type StageOptions, type StageSpec } from './types';

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)(e[+-]?\d+)?$/i;
const MAX_STAGES = 8;

export interface ParseOptions {
  /** Resolves `table:NAME`; without it a short table reference is refused. */
  tables?: TableLookup;
}

export const CHANNEL_SYNTAX =
  'LAW[:PARAM...][,OPTION...][>LAW...][@RATE] with LAW one of g711-mu, g711-a, uniform:BITS[:tread|rise], ' +
  'mu:MU:BITS, a:A:BITS, table:NAME (a stored table), table:[NAME:]D1/D2/...:Y1/Y2/...; OPTION seg=N, ov=X, lc=DBM0 (zs for g711-mu); ' +
  'RATE 8k (default), 16k, 48k, native or Hz';

function fail(part: string, why: string): never {
  throw new ChannelSpecError(part, `"${part}": ${why}`);
}

function parseNumber(text: string, what: string): number {
  if (!NUMBER.test(text)) fail(text, `${what} must be a number`);
  const n = Number(text);
  if (!Number.isFinite(n)) fail(text, `${what} must be finite`);
  return n;
}

function parseBits(text: string, min: number, max: number): number {
  const n = parseNumber(text, 'bits');
  if (!Number.isInteger(n) || n < min || n > max)
    fail(text, `bits must be a whole number from ${min} to ${max}`);
  return n;
}

function parseList(text: string, what: string): number[] {
  if (text === '') fail(text || '(empty)', `the ${what} list is empty`);
  return text.split('/').map((t, i) => parseNumber(t, `${what} ${i + 1}`));
}

function parseOptions(parts: string[], law: string, allowZs: boolean, allowLevels: boolean) {
  const opts: StageOptions & { zeroSuppression?: boolean } = {};
  const seen = new Set<string>();
  for (const part of parts) {
    const eq = part.indexOf('=');
    const key = (eq < 0 ? part : part.slice(0, eq)).toLowerCase();
    const value = eq < 0 ? '' : part.slice(eq + 1);
    if (seen.has(key)) fail(part, `option "${key}" is given twice`);
    seen.add(key);
    if (key === 'zs' && eq < 0 && allowZs) {
      opts.zeroSuppression = true;
    } else if (!allowLevels || eq < 0) {
      fail(part, `is not an option of ${law}${allowZs ? ' (only zs is)' : ''}`);
    } else if (key === 'seg') {
      const n = parseNumber(value, 'segment count');
      if (!Number.isInteger(n) || n < 1 || n > 64)
        fail(part, 'segment count must be a whole number from 1 to 64');
      opts.segments = n;
    } else if (key === 'ov') {
      const n = parseNumber(value, 'overload point');
      if (n <= 0) fail(part, 'overload point must be above 0');
      opts.overloadPoint = n;
    } else if (key === 'lc') {
      opts.loadCapacityDbm0 = parseNumber(value, 'load capacity');
    } else {
      fail(part, `is not an option of ${law} (options: seg=N, ov=X, lc=DBM0)`);
    }
  }
  return opts;
}

/** The levels stored under `name`, checked as any table is; refused when unknown. */
function storedLevels(name: string, tables: TableLookup | undefined) {
  const found = tables?.(name);
  if (found === undefined) {
    fail(
      name,
      'no stored table of that name is known (import the tables file that holds it, ' +
        'or give the levels in full: table:NAME:D1/D2/...:Y1/Y2/...)',
    );
  }
  const decisions = found.decisions.slice();
  const outputs = found.outputs.slice();
  try {
    checkTable(decisions, outputs);
  } catch (e) {
    fail(name, `the stored table is unusable: ${(e as Error).message.replace(/^table: /, '')}`);
  }
  const stored: StageOptions & { decisions: number[]; outputs: number[] } = { decisions, outputs };
  const { overloadPoint: ov, loadCapacityDbm0: lc } = found;
  if (ov !== undefined) {
    if (!(ov > 0 && Number.isFinite(ov))) fail(name, 'the stored table has a bad overload point');
    stored.overloadPoint = ov;
  }
  if (lc !== undefined) {
    if (!Number.isFinite(lc)) fail(name, 'the stored table has a bad load capacity');
    stored.loadCapacityDbm0 = lc;
  }
  return stored;
}

export function parseStage(text: string, options: ParseOptions = {}): StageSpec {
  const [head, ...optionParts] = text.trim().split(',');
  const [lawText, ...params] = head.split(':');
  const law = lawText.toLowerCase();
  const arity = (n: number, usage: string) => {
    if (params.length !== n) fail(head, `expected ${usage}`);
  };
  switch (law) {
    case 'g711-mu': {
      arity(0, 'g711-mu with no parameters');
      const o = parseOptions(optionParts, 'g711-mu', true, false);
      return o.zeroSuppression ? { law: 'g711-mu', zeroSuppression: true } : { law: 'g711-mu' };
    }
    case 'g711-a':
      arity(0, 'g711-a with no parameters');
      parseOptions(optionParts, 'g711-a', false, false);
      return { law: 'g711-a' };
    case 'uniform': {
      if (params.length < 1 || params.length > 2)
        fail(head, 'expected uniform:BITS or uniform:BITS:tread|rise');
      const bits = parseBits(params[0], 2, 16);
      const formText = (params[1] ?? 'tread').toLowerCase();
      if (formText !== 'tread' && formText !== 'rise') fail(params[1], 'form must be tread or rise');
      return { law: 'uniform', bits, form: formText, ...parseOptions(optionParts, 'uniform', false, true) };
    }
    case 'mu': {
      arity(2, 'mu:MU:BITS, for example mu:255:8');
      const mu = parseNumber(params[0], 'mu');
      if (mu < 0) fail(params[0], 'mu must be 0 or more');
      const bits = parseBits(params[1], 2, 16);
      return { law: 'mu', mu, bits, ...parseOptions(optionParts, 'mu', false, true) };
    }
    case 'a': {
      arity(2, 'a:A:BITS, for example a:87.6:8');
      const a = parseNumber(params[0], 'A');
      if (a < 1) fail(params[0], 'A must be 1 or more');
      const bits = parseBits(params[1], 2, 16);
      return { law: 'a', a, bits, ...parseOptions(optionParts, 'a', false, true) };
    }
    case 'table': {
      // The short form names a stored table; the full form carries its levels and needs no lookup.
      if (params.length === 1 && TABLE_NAME.test(params[0])) {
        const name = params[0];
        const levels = storedLevels(name, options.tables);
        // Options in the text win over the stored overload point and load capacity.
        return { law: 'table', ...levels, ...parseOptions(optionParts, 'table', false, true), name };
      }
      if (params.length < 2 || params.length > 3)
        fail(head, 'expected table:NAME or table:[NAME:]D1/D2/...:Y1/Y2/...');
      const name = params.length === 3 ? params[0] : undefined;
      if (name !== undefined && !TABLE_NAME.test(name))
        fail(name, 'a table name is letters, digits, - and _');
      const decisions = parseList(params[params.length - 2], 'decision');
      const outputs = parseList(params[params.length - 1], 'output');
      try {
        checkTable(decisions, outputs);
      } catch (e) {
        fail(params.slice(-2).join(':'), (e as Error).message.replace(/^table: /, ''));
      }
      const stage: StageSpec = {
        law: 'table',
        decisions,
        outputs,
        ...parseOptions(optionParts, 'table', false, true),
      };
      return name === undefined ? stage : { ...stage, name };
    }
    default:
      return fail(lawText || '(empty)', 'unknown law (use g711-mu, g711-a, uniform, mu, a or table)');
  }
}

export function parseRate(text: string): ChannelRate {
  const t = text.trim().toLowerCase();
  if (t === 'native') return 'native';
  const k = t.endsWith('k');
  const n = parseNumber(k ? t.slice(0, -1) : t, 'rate');
  const hz = Math.round(k ? n * 1000 : n);
  if (!Number.isInteger(k ? n * 1000 : n) || hz < 1000 || hz > 384000) {
    fail(text, 'rate must be a whole number of Hz from 1000 to 384000, or 8k, 16k, 48k, native');
  }
  return hz;
}

export function parseChannel(text: string, options: ParseOptions = {}): ChannelSpec {
  const t = text.trim();
  if (t === '') throw new ChannelSpecError('', `empty channel specification (expected ${CHANNEL_SYNTAX})`);
  const at = t.split('@');
  if (at.length > 2) fail(t, 'only one @RATE may be given');
  const rate = at.length === 2 ? parseRate(at[1]) : DEFAULT_RATE;
  const stageTexts = at[0].split('>');
  if (stageTexts.length > MAX_STAGES) fail(at[0], `at most ${MAX_STAGES} stages in tandem`);
  const stages = stageTexts.map((s) => {
    if (s.trim() === '') fail(at[0], 'a stage is empty (check the > signs)');
    return parseStage(s, options);
  });
  return { stages, rate };
}
