// The tables file: stored tables as JSON, our own format.
//   { "format": "quantiscope-tables", "version": 1,
//     "tables": [ { "name", "bits", "decisions": [...], "outputs": [...],
//                   "overloadPoint"?, "loadCapacityDbm0"?, "note"?, "created"? } ] }
// Fields a version-1 reader does not know are ignored, so later additions that old
// readers may skip need no new version; a higher version is refused.
import { checkTable } from '../quantizers/table';
import { bitsOfLevels, TABLE_NAME, type StoredTable } from './tables';

export const TABLE_FILE_FORMAT = 'quantiscope-tables';
export const TABLE_FILE_VERSION = 1;

/** A tables file that cannot be read; the message starts with the file's name. */
export class TableFileError extends Error {
  constructor(
    readonly source: string,
    problem: string,
  ) {
    super(`${source}: ${problem}`);
    this.name = 'TableFileError';
  }
}

type Json = Record<string, unknown>;

function isObject(v: unknown): v is Json {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** JSON text of a value, cut short so a message stays one readable line. */
function shown(v: unknown): string {
  const t = JSON.stringify(v) ?? String(v);
  return t.length > 40 ? `${t.slice(0, 37)}...` : t;
}

function numbers(v: unknown, what: string): number[] {
  if (!Array.isArray(v)) throw new RangeError(`"${what}" must be a list of numbers`);
  return v.map((x, i) => {
    if (typeof x !== 'number' || !Number.isFinite(x))
      throw new RangeError(`${what} ${i + 1} is not a finite number (${shown(x)})`);
    return x;
  });
}

/** Table i (0-based) checked as the channel text checks a table; throws RangeError naming it and why. */
function checked(entry: unknown, i: number): StoredTable {
  const bad = (why: string, name?: string): never => {
    throw new RangeError(`table ${i + 1}${name === undefined ? '' : ` ("${name}")`}: ${why}`);
  };
  if (!isObject(entry)) return bad('is not an object');
  const name = entry.name;
  if (typeof name !== 'string') return bad('has no "name"');
  if (!TABLE_NAME.test(name))
    bad(`${shown(name)} is not a table name (letters, digits, - and _, starting with a letter, at most 32)`);
  for (const key of ['bits', 'decisions', 'outputs']) if (!(key in entry)) bad(`has no "${key}"`, name);
  let decisions: number[] = [];
  let outputs: number[] = [];
  try {
    decisions = numbers(entry.decisions, 'decision');
    outputs = numbers(entry.outputs, 'output');
    checkTable(decisions, outputs);
  } catch (e) {
    bad((e as Error).message.replace(/^table: /, ''), name);
  }
  const bits = bitsOfLevels(outputs.length);
  if (entry.bits !== bits)
    bad(`"bits" is ${shown(entry.bits)}, but ${outputs.length} levels take ${bits}`, name);
  const table: StoredTable = { name, decisions, outputs, bits };
  const ov = entry.overloadPoint;
  if (ov !== undefined) {
    if (typeof ov !== 'number' || !(ov > 0) || !Number.isFinite(ov))
      bad(`"overloadPoint" must be a finite number above 0 (got ${shown(ov)})`, name);
    else table.overloadPoint = ov;
  }
  const lc = entry.loadCapacityDbm0;
  if (lc !== undefined) {
    if (typeof lc !== 'number' || !Number.isFinite(lc))
      bad(`"loadCapacityDbm0" must be a finite number (got ${shown(lc)})`, name);
    else table.loadCapacityDbm0 = lc;
  }
  for (const key of ['note', 'created'] as const) {
    const v = entry[key];
    if (v === undefined) continue;
    if (typeof v !== 'string') bad(`"${key}" must be text`, name);
    else table[key] = v;
  }
  return table;
}

function checkedAll(list: readonly unknown[]): StoredTable[] {
  const names = new Set<string>();
  return list.map((entry, i) => {
    const t = checked(entry, i);
    if (names.has(t.name)) throw new RangeError(`table ${i + 1}: the name "${t.name}" is used twice`);
    names.add(t.name);
    return t;
  });
}

/** Reads a tables file; `source` (the file's name) begins every refusal. */
export function parseTableFile(text: string, source: string): StoredTable[] {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (e) {
    throw new TableFileError(source, `not a tables file: not JSON (${(e as Error).message.split('\n')[0]})`);
  }
  if (!isObject(doc)) throw new TableFileError(source, 'not a tables file: expected a JSON object');
  if (doc.format !== TABLE_FILE_FORMAT)
    throw new TableFileError(
      source,
      `not a tables file: "format" is ${shown(doc.format)}, expected "${TABLE_FILE_FORMAT}"`,
    );
  const version = doc.version;
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 1)
    throw new TableFileError(source, `"version" must be a whole number from 1 (got ${shown(version)})`);
  if (version > TABLE_FILE_VERSION)
    throw new TableFileError(
      source,
      `written by a newer Quantiscope (tables file version ${version}; this one reads version ${TABLE_FILE_VERSION})`,
    );
  if (!Array.isArray(doc.tables)) throw new TableFileError(source, '"tables" must be a list');
  try {
    return checkedAll(doc.tables);
  } catch (e) {
    throw new TableFileError(source, (e as Error).message);
  }
}

/**
 * The text of a tables file holding these tables: a table per block, its levels on one
 * line each. Refuses (RangeError) what parseTableFile would refuse, so a file written
 * here always reads back.
 */
export function tableFileText(tables: readonly StoredTable[]): string {
  const checkedTables = checkedAll(tables);
  const blocks = checkedTables.map((t) => {
    const lines = [
      `"name": ${JSON.stringify(t.name)}`,
      `"bits": ${t.bits}`,
      `"decisions": ${JSON.stringify(t.decisions)}`,
      `"outputs": ${JSON.stringify(t.outputs)}`,
    ];
    if (t.overloadPoint !== undefined) lines.push(`"overloadPoint": ${JSON.stringify(t.overloadPoint)}`);
    if (t.loadCapacityDbm0 !== undefined)
      lines.push(`"loadCapacityDbm0": ${JSON.stringify(t.loadCapacityDbm0)}`);
    if (t.note !== undefined) lines.push(`"note": ${JSON.stringify(t.note)}`);
    if (t.created !== undefined) lines.push(`"created": ${JSON.stringify(t.created)}`);
    return `    {\n${lines.map((l) => `      ${l}`).join(',\n')}\n    }`;
  });
  const list = blocks.length === 0 ? '[]' : `[\n${blocks.join(',\n')}\n  ]`;
  return (
    `{\n  "format": ${JSON.stringify(TABLE_FILE_FORMAT)},\n  "version": ${TABLE_FILE_VERSION},\n` +
    `  "tables": ${list}\n}\n`
  );
}
