/**
 * Reads a reference series from CSV text: a header row naming the columns
 * `date` and `value`, then one row per UT day. A file with any bad row is
 * refused whole, so the report lists every problem at once (row number as a
 * spreadsheet shows it: the header is row 1) instead of stopping at the
 * first.
 */

import { toDayNumber } from "@/lib/counts/series";

export type ReferenceCsvProblem = { row: number; reason: string };
export type ReferenceCsvResult =
  | { ok: true; values: Array<{ day: string; value: number }>; firstDay: string; lastDay: string }
  | { ok: false; problems: ReferenceCsvProblem[]; moreProblems: number };

/** A century of daily values is about 36,500 rows; allow a few centuries. */
export const MAX_REFERENCE_ROWS = 200_000;
/** Listing more problems than this helps no one: the file needs fixing as a whole. */
export const MAX_REPORTED_PROBLEMS = 100;

const DATE_PATTERN = /^\d{4}-\d{2}-\d{2}$/;
// Plain decimal numbers only ("12", "12.5", ".5", "-3", "1e2"); no thousands
// separators, no "NaN" or "Infinity", which Number() would accept.
const NUMBER_PATTERN = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** Splits one CSV line on commas, honouring double-quoted cells ("" is a quote inside one). */
export function splitCsvLine(line: string): string[] | null {
  const cells: string[] = [];
  let cell = "";
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (ch === '"') {
        quoted = false;
      } else {
        cell += ch;
      }
    } else if (ch === '"' && cell.trim() === "") {
      quoted = true;
      cell = "";
    } else if (ch === ",") {
      cells.push(cell.trim());
      cell = "";
    } else {
      cell += ch;
    }
  }
  if (quoted) return null;
  cells.push(cell.trim());
  return cells;
}

export function parseReferenceCsv(text: string): ReferenceCsvResult {
  const problems: ReferenceCsvProblem[] = [];
  let moreProblems = 0;
  const report = (row: number, reason: string) => {
    if (problems.length < MAX_REPORTED_PROBLEMS) problems.push({ row, reason });
    else moreProblems++;
  };

  const lines = text.replace(/^\uFEFF/, "").split(/\r\n|\n|\r/);
  while (lines.length > 0 && lines[lines.length - 1]!.trim() === "") lines.pop();
  if (lines.length === 0)
    return { ok: false, problems: [{ row: 1, reason: "The file is empty." }], moreProblems: 0 };

  const header = splitCsvLine(lines[0]!)?.map((cell) => cell.toLowerCase());
  const dateColumn = header?.indexOf("date") ?? -1;
  const valueColumn = header?.indexOf("value") ?? -1;
  if (!header || header.length !== 2 || dateColumn < 0 || valueColumn < 0) {
    const found = header ? header.map((c) => `"${c}"`).join(", ") : "an unreadable line";
    return {
      ok: false,
      problems: [
        {
          row: 1,
          reason: `Wrong columns: the header must name exactly two columns, date and value; found ${found}.`,
        },
      ],
      moreProblems: 0,
    };
  }
  if (lines.length - 1 > MAX_REFERENCE_ROWS) {
    return {
      ok: false,
      problems: [
        {
          row: MAX_REFERENCE_ROWS + 2,
          reason: `Too many rows: at most ${MAX_REFERENCE_ROWS.toLocaleString("en")} days per file.`,
        },
      ],
      moreProblems: 0,
    };
  }

  const values: Array<{ day: string; value: number }> = [];
  const firstRowOfDay = new Map<string, number>();
  for (let index = 1; index < lines.length; index++) {
    const row = index + 1;
    const line = lines[index]!;
    if (line.trim() === "") {
      report(row, "Empty row: remove it or give it a date and a value.");
      continue;
    }
    const cells = splitCsvLine(line);
    if (!cells) {
      report(row, "A quoted cell is never closed.");
      continue;
    }
    if (cells.length !== 2) {
      report(row, `Wrong columns: expected 2 cells (date, value), found ${cells.length}.`);
      continue;
    }
    const day = cells[dateColumn]!;
    const text = cells[valueColumn]!;
    let rowIsGood = true;
    if (!DATE_PATTERN.test(day) || !isCalendarDay(day)) {
      report(
        row,
        day === ""
          ? "Bad date: the date is missing."
          : `Bad date: "${day}" is not a calendar day written YYYY-MM-DD.`,
      );
      rowIsGood = false;
    } else {
      const first = firstRowOfDay.get(day);
      if (first !== undefined) {
        report(row, `Duplicate day: ${day} is already on row ${first}.`);
        rowIsGood = false;
      } else {
        firstRowOfDay.set(day, row);
      }
    }
    const value = NUMBER_PATTERN.test(text) ? Number(text) : Number.NaN;
    if (!Number.isFinite(value)) {
      report(row, text === "" ? "Not a number: the value is missing." : `Not a number: "${text}".`);
      rowIsGood = false;
    } else if (value < 0) {
      report(row, `Negative value: ${text}; a relative number is never below 0.`);
      rowIsGood = false;
    }
    if (rowIsGood) values.push({ day, value });
  }
  if (problems.length > 0) return { ok: false, problems, moreProblems };
  if (values.length === 0)
    return { ok: false, problems: [{ row: 2, reason: "No data rows below the header." }], moreProblems: 0 };
  values.sort((a, b) => (a.day < b.day ? -1 : a.day > b.day ? 1 : 0));
  return { ok: true, values, firstDay: values[0]!.day, lastDay: values[values.length - 1]!.day };
}

function isCalendarDay(day: string): boolean {
  try {
    toDayNumber(day);
    return true;
  } catch {
    return false;
  }
}
