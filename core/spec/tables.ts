// Stored tables: designed quantizers kept under a short name, so a channel can say
// `table:NAME` instead of carrying every level. The levels live in a tables file
// (table-file.ts); whoever reads the channel text passes a lookup over the tables it
// has loaded. The full form `table:NAME:D1/...:Y1/...` needs no lookup.
//
// A designed table takes its outermost output as overload point and a load capacity
// to match (core/design/symmetric-table.ts), given as ov= and lc= on its stage. The
// stored table keeps both, so `table:NAME` stands for the whole designed quantizer;
// ov=, lc= written after the name still win.
import type { TableStage } from './types';

/** A table name: letters, digits, '-' and '_', starting with a letter, at most 32 characters. */
export const TABLE_NAME = /^[a-z][a-z0-9_-]{0,31}$/i;

export interface StoredTable {
  name: string;
  /** L-1 ascending decision values, float scale. */
  decisions: number[];
  /** L ascending output values, float scale. */
  outputs: number[];
  /** Bits on the line: ceil(log2 L), as stageBits counts them. */
  bits: number;
  /** Overload point (float scale) and load capacity (dBm0) of the table; absent: the channel defaults. */
  overloadPoint?: number;
  loadCapacityDbm0?: number;
  /** Free text, for example what the table was designed from. */
  note?: string;
  /** When it was made (ISO 8601 by convention, not checked). */
  created?: string;
}

/** What `table:NAME` stands for. */
export type StoredLevels = Pick<StoredTable, 'decisions' | 'outputs' | 'overloadPoint' | 'loadCapacityDbm0'>;

/** The table stored under a name (names match exactly, case included), or undefined. */
export type TableLookup = (name: string) => StoredLevels | undefined;

export function bitsOfLevels(levels: number): number {
  return Math.ceil(Math.log2(levels));
}

/** A named table stage as a stored table, with its ov and lc; the segment count stays with the channel. */
export function storedTable(stage: TableStage, extra: { note?: string; created?: string } = {}): StoredTable {
  if (stage.name === undefined) throw new RangeError('a stored table needs a name');
  const t: StoredTable = {
    name: stage.name,
    decisions: stage.decisions.slice(),
    outputs: stage.outputs.slice(),
    bits: bitsOfLevels(stage.outputs.length),
  };
  if (stage.overloadPoint !== undefined) t.overloadPoint = stage.overloadPoint;
  if (stage.loadCapacityDbm0 !== undefined) t.loadCapacityDbm0 = stage.loadCapacityDbm0;
  if (extra.note !== undefined) t.note = extra.note;
  if (extra.created !== undefined) t.created = extra.created;
  return t;
}

/** A lookup over loaded tables; a name given twice is refused (the levels would be ambiguous). */
export function tableLookup(tables: readonly StoredTable[]): TableLookup {
  const byName = new Map<string, StoredTable>();
  for (const t of tables) {
    if (byName.has(t.name)) throw new RangeError(`table "${t.name}" is given twice`);
    byName.set(t.name, t);
  }
  return (name) => byName.get(name);
}

function sameList(a: readonly number[], b: readonly number[]): boolean {
  return a.length === b.length && a.every((v, i) => v === b[i]);
}

/** Whether `table:NAME` with these options reads back, through `tables`, as exactly this stage. */
export function storedAs(stage: TableStage, tables: TableLookup): boolean {
  if (stage.name === undefined) return false;
  const t = tables(stage.name);
  if (t === undefined || !sameList(t.decisions, stage.decisions) || !sameList(t.outputs, stage.outputs))
    return false;
  // A stored ov or lc fills in where the text gives none, so a stage without one cannot say so.
  return (
    (t.overloadPoint === undefined || stage.overloadPoint !== undefined) &&
    (t.loadCapacityDbm0 === undefined || stage.loadCapacityDbm0 !== undefined)
  );
}
