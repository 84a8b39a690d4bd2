// Stored tables: designed quantizers kept under a short name, so a channel can say
// `table:NAME` instead of carrying every level. The levels live in a tables file
// (table-file.ts); whoever reads the channel text passes a lookup over the tables it
// has loaded. The full form `table:NAME:D1/...:Y1/...` needs no lookup.
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
  /** Free text, for example what the table was designed from. */
  note?: string;
  /** When it was made (ISO 8601 by convention, not checked). */
  created?: string;
}

/** The levels stored under a name (names match exactly, case included), or undefined. */
export type TableLookup = (name: string) => { decisions: number[]; outputs: number[] } | undefined;

export function bitsOfLevels(levels: number): number {
  return Math.ceil(Math.log2(levels));
}

/** A named table stage as a stored table; the stage's options (seg, ov, lc) stay with the channel. */
export function storedTable(stage: TableStage, extra: { note?: string; created?: string } = {}): StoredTable {
  if (stage.name === undefined) throw new RangeError('a stored table needs a name');
  const t: StoredTable = {
    name: stage.name,
    decisions: stage.decisions.slice(),
    outputs: stage.outputs.slice(),
    bits: bitsOfLevels(stage.outputs.length),
  };
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
