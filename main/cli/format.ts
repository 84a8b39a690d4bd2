// Output forms shared by the commands: aligned tables for the terminal, CSV for
// spreadsheets, JSON for scripts. A figure that does not exist is null in JSON,
// an empty cell in CSV and '-' in a table.

export type Align = 'left' | 'right';

/** Rows of cells laid out in columns; `align` per column (default: left for the first, right for the rest). */
export function table(rows: readonly (readonly string[])[], align?: readonly Align[]): string[] {
  if (rows.length === 0) return [];
  const columns = Math.max(...rows.map((r) => r.length));
  const widths: number[] = [];
  for (let c = 0; c < columns; c++) widths.push(Math.max(...rows.map((r) => (r[c] ?? '').length)));
  return rows.map((r) =>
    widths
      .map((w, c) => {
        const cell = r[c] ?? '';
        const a = align?.[c] ?? (c === 0 ? 'left' : 'right');
        return a === 'left' ? cell.padEnd(w) : cell.padStart(w);
      })
      .join('  ')
      .trimEnd(),
  );
}

/** A number with fixed decimals, '-' for null or a value that is not finite. */
export function fixed(value: number | null | undefined, digits = 1): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '-' : value.toFixed(digits);
}

/** A signed number (+1.0, -3.2), '-' for null. */
export function signed(value: number | null | undefined, digits = 1): string {
  const s = fixed(value, digits);
  return s !== '-' && value !== null && value !== undefined && value >= 0 ? `+${s}` : s;
}

/** A share 0..1 as a percentage. */
export function percent(share: number | null | undefined, digits = 1): string {
  return share === null || share === undefined ? '-' : (100 * share).toFixed(digits);
}

/** One CSV field: quoted when it holds a comma, quote or line break (RFC 4180). */
export function csvField(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

export function csvLine(values: readonly (string | number | null | undefined)[]): string {
  return values.map(csvField).join(',');
}

/** A finite number or null, for JSON (NaN and the infinities have no JSON form). */
export function finiteOrNull(value: number | null | undefined): number | null {
  return value === null || value === undefined || !Number.isFinite(value) ? null : value;
}
