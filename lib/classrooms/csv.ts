/**
 * Comma-separated values as spreadsheets read them (RFC 4180: fields with a
 * comma, quote or line break are quoted, quotes doubled, CRLF line ends).
 */

export type CsvCell = string | number | null | undefined;

/**
 * A cell that starts with =, +, - or @ would be run as a formula by a
 * spreadsheet; a leading apostrophe keeps it as text (the usual defence
 * against "CSV injection", common practice). Numbers are written as numbers.
 */
export function formatCsvCell(cell: CsvCell): string {
  if (cell === null || cell === undefined) return "";
  if (typeof cell === "number") return Number.isFinite(cell) ? String(cell) : "";
  let text = cell;
  if (/^[=+\-@\t\r]/.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function formatCsv({
  header,
  rows,
}: {
  header: ReadonlyArray<string>;
  rows: ReadonlyArray<ReadonlyArray<CsvCell>>;
}): string {
  return [header, ...rows].map((row) => row.map(formatCsvCell).join(",")).join("\r\n") + "\r\n";
}
