/** Writing CSV that spreadsheets open safely and Heliotally's own import reads back. */

export type CsvValue = string | number | boolean | null | undefined | Date;

// A cell starting with one of these is run as a formula by spreadsheet
// programs; free text from other people (notes, names) must never do that.
const FORMULA_START = /^[=+\-@\t\r]/;

export function formatCsvCell(value: CsvValue, { text = false }: { text?: boolean } = {}): string {
  if (value === null || value === undefined) return "";
  let out = value instanceof Date ? value.toISOString() : String(value);
  if (text && FORMULA_START.test(out)) out = `'${out}`;
  return /[",\r\n]/.test(out) || out !== out.trim() ? `"${out.replace(/"/g, '""')}"` : out;
}

/** One CSV line (with its line break); `textColumns` are the free-text cells. */
export function formatCsvLine(values: CsvValue[], textColumns: ReadonlySet<number> = new Set()): string {
  return `${values.map((v, i) => formatCsvCell(v, { text: textColumns.has(i) })).join(",")}\r\n`;
}
