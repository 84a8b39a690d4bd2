// Tables files on disk: read for --table (so a channel may say table:NAME), written
// by design --table-out. A file is written whole to a temporary file beside it and
// renamed into place, so a reader never sees half a file and a failed run leaves the
// old one as it was; it is never written onto an input of the run.
import { randomBytes } from 'node:crypto';
import { readFile, rename, stat, unlink, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { parseTableFile, tableFileText } from '../../core/spec/table-file';
import { tableLookup, type StoredTable, type TableLookup } from '../../core/spec/tables';
import { UsageError } from './args';

/** A tables file larger than this is not one (65536 levels of a table take about 3 MB). */
const MAX_TABLE_FILE_BYTES = 64 * 1024 * 1024;

const ERRNO_TEXT: Record<string, string> = {
  ENOENT: 'no such file',
  ENOTDIR: 'no such file (a part of the path is not a folder)',
  EACCES: 'permission denied',
  EPERM: 'permission denied',
  EISDIR: 'is a directory, not a tables file',
  ENOSPC: 'no space left on the disk',
  EROFS: 'the file system is read-only',
};

function problem(err: unknown): string {
  const code = (err as NodeJS.ErrnoException | null)?.code;
  return (code && ERRNO_TEXT[code]) ?? `failed (${code ?? String(err)})`;
}

/** The tables of one file; every refusal is a usage error naming the file. */
async function readTables(file: string): Promise<StoredTable[]> {
  let text: string;
  try {
    const st = await stat(file);
    if (st.isDirectory()) throw Object.assign(new Error('directory'), { code: 'EISDIR' });
    if (st.size > MAX_TABLE_FILE_BYTES)
      throw new UsageError(`--table ${file}: not a tables file (larger than 64 MiB)`);
    text = await readFile(file, 'utf8');
  } catch (err) {
    if (err instanceof UsageError) throw err;
    throw new UsageError(`--table ${file}: ${problem(err)}`);
  }
  try {
    return parseTableFile(text, file);
  } catch (err) {
    throw new UsageError(`--table ${(err as Error).message}`);
  }
}

/** One lookup over the tables of every file given, or undefined for none; a name in two files is refused. */
export async function readTableFiles(files: readonly string[]): Promise<TableLookup | undefined> {
  if (files.length === 0) return undefined;
  const from = new Map<string, string>();
  const all: StoredTable[] = [];
  for (const file of files) {
    for (const t of await readTables(file)) {
      const other = from.get(t.name);
      if (other !== undefined)
        throw new UsageError(`--table: the table "${t.name}" is in both ${other} and ${file}; keep one`);
      from.set(t.name, file);
      all.push(t);
    }
  }
  return tableLookup(all);
}

async function identity(file: string): Promise<{ dev: number; ino: number } | null> {
  try {
    const st = await stat(file);
    return { dev: st.dev, ino: st.ino };
  } catch {
    return null;
  }
}

/**
 * Refuses an output that is one of the inputs, by device and inode, so another path to
 * the same file (`..`, a symbolic or a hard link) is caught too; and an existing output
 * unless `force`.
 */
export async function checkOutput(
  out: string,
  option: string,
  inputs: readonly string[],
  force: boolean,
): Promise<void> {
  const target = await identity(out);
  if (target === null) return;
  for (const input of inputs) {
    const id = await identity(input);
    if (id !== null && id.dev === target.dev && id.ino === target.ino)
      throw new UsageError(`${option} ${out}: is the input file ${input}; it is never written over`);
  }
  if (!force) throw new UsageError(`${option} ${out}: the file exists (give --force to replace it)`);
}

/** Writes the tables to `out` through a temporary file beside it, renamed into place when complete. */
export async function writeTableFile(out: string, tables: readonly StoredTable[]): Promise<void> {
  const text = tableFileText(tables);
  const temp = path.join(
    path.dirname(out),
    `.${path.basename(out)}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`,
  );
  try {
    await writeFile(temp, text, { flag: 'wx' });
    await rename(temp, out);
  } catch (err) {
    await unlink(temp).catch(() => undefined);
    throw new Error(`${out}: cannot write: ${problem(err)}`, { cause: err });
  }
}
