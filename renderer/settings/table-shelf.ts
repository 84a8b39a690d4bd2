// The app's stored tables: designed quantizers kept under a short name in this
// browser profile, listed, exported and imported as a tables file (core/spec/table-file.ts).
// A channel says `table:NAME`; the shelf fills in the levels before the engine sees it.
import { parseTableFile, tableFileText } from '../../core/spec/table-file';
import { tableLookup, type StoredTable, type TableLookup } from '../../core/spec/tables';

const STORE_KEY = 'quantiscope.tables.v1';

export class TableShelf {
  private tables: StoredTable[] = [];
  private readonly listeners = new Set<() => void>();

  constructor(private readonly storage: Storage | null = globalThis.localStorage ?? null) {
    try {
      const text = storage?.getItem(STORE_KEY);
      if (text) this.tables = parseTableFile(text, 'stored tables');
    } catch {
      // A damaged store loses nothing the user can see but the list; start empty.
      this.tables = [];
    }
  }

  list(): readonly StoredTable[] {
    return this.tables;
  }

  get(name: string): StoredTable | undefined {
    return this.tables.find((t) => t.name === name);
  }

  /** The lookup the channel parser takes. */
  readonly lookup: TableLookup = (name) => this.get(name);

  /** A name not yet on the shelf: `base`, else `base-2`, `base-3`, ... */
  freeName(base: string): string {
    if (!this.get(base)) return base;
    for (let k = 2; ; k++) if (!this.get(`${base}-${k}`)) return `${base}-${k}`;
  }

  /** Adds or replaces a table of the same name. */
  put(table: StoredTable): void {
    this.tables = [...this.tables.filter((t) => t.name !== table.name), table];
    this.save();
  }

  remove(name: string): void {
    this.tables = this.tables.filter((t) => t.name !== name);
    this.save();
  }

  /** The tables of a file, added to the shelf (same names replaced); throws with the file's problem. */
  importText(text: string, source: string): StoredTable[] {
    const incoming = parseTableFile(text, source);
    tableLookup(incoming);
    const names = new Set(incoming.map((t) => t.name));
    this.tables = [...this.tables.filter((t) => !names.has(t.name)), ...incoming];
    this.save();
    return incoming;
  }

  exportText(names?: readonly string[]): string {
    return tableFileText(names ? this.tables.filter((t) => names.includes(t.name)) : this.tables);
  }

  onChange(listener: () => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  private save(): void {
    try {
      this.storage?.setItem(STORE_KEY, tableFileText(this.tables));
    } catch {
      // Storage full or refused: the shelf still holds for this page; export keeps it safe.
    }
    for (const l of this.listeners) l();
  }
}
