/**
 * The first part of a chosen file, read in the browser before anything is
 * uploaded: enough lines to recognise the layout and show a preview. Uses
 * the same CSV parser (its browser build) and options as the server import.
 */
import { parse } from "csv-parse/browser/esm/sync";

import { DELIMITERS, type DelimiterName } from "./sniff";

/** Enough for a few thousand lines; the preview needs a dozen. */
export const SAMPLE_BYTES = 256 * 1024;
/** Lines parsed for recognition and preview. */
export const SAMPLE_LINES = 200;

export function describeFileSize(bytes: number): string {
  return bytes >= 1024 * 1024 ? `${(bytes / (1024 * 1024)).toFixed(1)} MB` : `${Math.ceil(bytes / 1024)} KB`;
}

/** The same refusal in the browser (before uploading) and on the server. */
export function describeTooLarge({ bytes, maxBytes }: { bytes?: number; maxBytes: number }): string {
  const size = bytes === undefined ? "larger than" : `${describeFileSize(bytes)}; that is more than`;
  return `The file is ${size} the ${describeFileSize(maxBytes)} we accept for one import. Split the logbook into several files (by year, say) and import them one after another.`;
}

export type ParsedSample = { records: Array<{ line: number; cells: string[] }>; error: string | null };

/** Drops a line cut in half at the end of a partial sample. */
export function trimToWholeLines({ text, complete }: { text: string; complete: boolean }): string {
  if (complete) return text;
  const end = Math.max(text.lastIndexOf("\n"), text.lastIndexOf("\r"));
  return end < 0 ? text : text.slice(0, end + 1);
}

export function parseSample({ text, delimiter }: { text: string; delimiter: DelimiterName }): ParsedSample {
  try {
    const rows = parse(text, {
      delimiter: DELIMITERS[delimiter],
      bom: true,
      info: true,
      relax_column_count: true,
      skip_empty_lines: true,
      skip_records_with_empty_values: true,
      to_line: SAMPLE_LINES,
    }) as unknown as Array<{ info: { lines: number }; record: string[] }>;
    return {
      records: rows.map(({ info, record }) => ({
        line: info.lines - record.reduce((n, f) => n + (f.includes("\n") ? f.split("\n").length - 1 : 0), 0),
        cells: record,
      })),
      error: null,
    };
  } catch (error) {
    const e = error as { code?: string; lines?: number; message?: string };
    const at = e.lines ? `Line ${e.lines}: ` : "";
    const message =
      e.code === "CSV_QUOTE_NOT_CLOSED"
        ? `${at}a quoted value is never closed (unbalanced double quotes).`
        : e.code === "CSV_INVALID_CLOSING_QUOTE" || e.code === "INVALID_OPENING_QUOTE"
          ? `${at}a double quote is in the wrong place (unbalanced quotes). Quote whole values, and write a quote inside a quoted value as "".`
          : `${at}the file could not be read as CSV.`;
    return { records: [], error: message };
  }
}
