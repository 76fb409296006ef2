/**
 * First look at an uploaded logbook: is it text at all, which character
 * separates the values, is the first line a header, and which column holds
 * what. Runs in the browser on the first few kilobytes and on the server
 * before a file is read in full, so both refuse the same files the same way.
 */
import { HEMISPHERE_FIELDS, IMPORT_FIELDS, matchHeader, type ImportField } from "./columns";
import { detectDateFormats, parseTimeText, type DateFormatId } from "./dates";

export const DELIMITERS = { comma: ",", semicolon: ";", tab: "\t", pipe: "|" } as const;
export type DelimiterName = keyof typeof DELIMITERS;
export const DELIMITER_NAMES = Object.keys(DELIMITERS) as [DelimiterName, ...DelimiterName[]];
export const DELIMITER_LABELS: Record<DelimiterName, string> = {
  comma: "Comma ( , )",
  semicolon: "Semicolon ( ; )",
  tab: "Tab",
  pipe: "Vertical bar ( | )",
};

export type FileProblem = { kind: "empty" | "binary" | "spreadsheet" | "encoding"; message: string };

/**
 * Refuses what is plainly not a CSV text file, from its first bytes. Zip
 * containers (xlsx, ods) and the old binary workbook format get their own
 * message, since "save as CSV" is the fix people need.
 */
export function inspectFileHead(
  head: Uint8Array,
  { totalBytes }: { totalBytes: number },
): FileProblem | null {
  if (totalBytes === 0 || head.length === 0) {
    return { kind: "empty", message: "The file is empty. Choose the CSV file that holds your logbook." };
  }
  const startsWith = (bytes: number[]) => bytes.every((b, i) => head[i] === b);
  if (startsWith([0x50, 0x4b, 0x03, 0x04]) || startsWith([0xd0, 0xcf, 0x11, 0xe0])) {
    return {
      kind: "spreadsheet",
      message:
        "This is a spreadsheet workbook, not a CSV file. Open it in your spreadsheet program and save it as “CSV (UTF-8)”.",
    };
  }
  let control = 0;
  for (const byte of head) {
    if (byte === 0) {
      return { kind: "binary", message: "The file contains binary data, not text. Choose a CSV text file." };
    }
    if (byte < 0x20 && byte !== 0x09 && byte !== 0x0a && byte !== 0x0d) control++;
  }
  if (control > head.length / 100) {
    return { kind: "binary", message: "The file contains binary data, not text. Choose a CSV text file." };
  }
  // A multi-byte character may be cut at the end of the sample; drop the tail.
  const cut = head.length >= 4 && head.length < totalBytes ? head.subarray(0, trimPartialUtf8(head)) : head;
  try {
    new TextDecoder("utf-8", { fatal: true }).decode(cut);
  } catch {
    return {
      kind: "encoding",
      message: "The file is not UTF-8 text. Save it again from your spreadsheet as “CSV (UTF-8)”.",
    };
  }
  if (
    !new TextDecoder()
      .decode(cut)
      .replace(/^\uFEFF/, "")
      .trim()
  ) {
    return {
      kind: "empty",
      message: "The file holds only blank lines. Choose the CSV file that holds your logbook.",
    };
  }
  return null;
}

function trimPartialUtf8(bytes: Uint8Array): number {
  let end = bytes.length;
  // Step back over continuation bytes to the start of the last character.
  let i = end - 1;
  while (i > 0 && end - i < 4 && ((bytes[i] as number) & 0xc0) === 0x80) i--;
  const lead = bytes[i] as number;
  const width = lead >= 0xf0 ? 4 : lead >= 0xe0 ? 3 : lead >= 0xc0 ? 2 : 1;
  if (i + width > end) end = i;
  return end;
}

/** Counts a character outside double quotes on one line. */
function countOutsideQuotes(line: string, ch: string): number {
  let n = 0;
  let quoted = false;
  for (const c of line) {
    if (c === '"') quoted = !quoted;
    else if (c === ch && !quoted) n++;
  }
  return n;
}

/**
 * The separator used on most sample lines the same number of times. A
 * comma that also appears as a decimal mark loses to a semicolon that
 * appears more often, which is the usual European spreadsheet export.
 */
export function detectDelimiter(text: string): DelimiterName {
  const lines = text
    .replace(/^\uFEFF/, "")
    .split(/\r\n|\n|\r/)
    .filter((l) => l.trim() !== "")
    .slice(0, 30);
  let best: { name: DelimiterName; score: number; count: number } = { name: "comma", score: 0, count: 0 };
  for (const name of DELIMITER_NAMES) {
    const counts = lines.map((l) => countOutsideQuotes(l, DELIMITERS[name]));
    const tally = new Map<number, number>();
    for (const c of counts) if (c > 0) tally.set(c, (tally.get(c) ?? 0) + 1);
    let mode = 0;
    let modeLines = 0;
    for (const [c, n] of tally)
      if (n > modeLines || (n === modeLines && c > mode)) [mode, modeLines] = [c, n];
    const score = lines.length === 0 ? 0 : modeLines / lines.length;
    if (score > best.score || (score === best.score && score > 0 && mode > best.count))
      best = { name, score, count: mode };
  }
  return best.name;
}

/** 1-based column numbers by field. */
export type ColumnMapping = Partial<Record<ImportField, number>>;

export type Suggestion = {
  hasHeader: boolean;
  mapping: ColumnMapping;
  /** Where each mapped column came from. */
  recognisedBy: Partial<Record<ImportField, "header" | "values">>;
  dateFormats: DateFormatId[];
  /** Day/month order cannot be told from the sample (no day above 12). */
  dateOrderAmbiguous: boolean;
  /** Header names Heliotally computes itself (R, k...) and will ignore. */
  ignoredColumns: number[];
};

const WHOLE = /^\s*\d+\s*$/;

function looksLikeDate(value: string): boolean {
  return detectDateFormats([value]).length > 0;
}

/**
 * Suggests how to read the file from its first rows: header names first,
 * then the values themselves (dates, times, small whole numbers, instrument
 * names) for whatever the header did not name.
 */
export function suggestMapping({
  rows,
  instrumentNames = [],
}: {
  rows: string[][];
  instrumentNames?: string[];
}): Suggestion {
  const first = rows[0] ?? [];
  const hasHeader =
    first.length > 0 && !first.some(looksLikeDate) && first.some((c) => c.trim() !== "" && !WHOLE.test(c));
  const data = (hasHeader ? rows.slice(1) : rows).slice(0, 50);
  const width = Math.max(0, ...rows.map((r) => r.length));

  const mapping: ColumnMapping = {};
  const recognisedBy: Suggestion["recognisedBy"] = {};
  const ignoredColumns: number[] = [];
  const taken = new Set<number>();

  if (hasHeader) {
    const bestRank = new Map<ImportField, number>();
    first.forEach((header, index) => {
      const match = matchHeader(header);
      if (!match) return;
      if (match.field === "computed") {
        ignoredColumns.push(index + 1);
        return;
      }
      const previous = bestRank.get(match.field);
      if (previous === undefined || match.rank < previous) {
        if (mapping[match.field] !== undefined) taken.delete(mapping[match.field]! - 1);
        bestRank.set(match.field, match.rank);
        mapping[match.field] = index + 1;
        recognisedBy[match.field] = "header";
        taken.add(index);
      }
    });
  }

  const column = (index: number) => data.map((r) => (r[index] ?? "").trim()).filter((v) => v !== "");
  const free = () =>
    Array.from({ length: width }, (_, i) => i).filter(
      (i) => !taken.has(i) && !ignoredColumns.includes(i + 1),
    );
  const assign = (field: ImportField, index: number) => {
    mapping[field] = index + 1;
    recognisedBy[field] = "values";
    taken.add(index);
  };

  if (mapping.date === undefined) {
    const index = free().find((i) => {
      const values = column(i);
      return values.length > 0 && values.filter(looksLikeDate).length >= 0.8 * values.length;
    });
    if (index !== undefined) assign("date", index);
  }
  if (mapping.time === undefined) {
    const index = free().find((i) => {
      const values = column(i);
      return values.length > 0 && values.every((v) => /[:h]/i.test(v) && parseTimeText(v) !== null);
    });
    if (index !== undefined) assign("time", index);
  }
  const wholeColumns = free().filter((i) => {
    const values = column(i);
    return values.length > 0 && values.every((v) => WHOLE.test(v));
  });
  if (mapping.groups === undefined && mapping.spots === undefined && wholeColumns.length >= 2) {
    // Logbooks put g before s; prefer the first adjacent pair where s ≥ g holds.
    const pair =
      wholeColumns.find((i, n) => {
        const next = wholeColumns[n + 1];
        if (next === undefined) return false;
        return data.every((r) => Number(r[next] ?? 0) >= Number(r[i] ?? 0));
      }) ?? wholeColumns[0];
    const next = wholeColumns[wholeColumns.indexOf(pair as number) + 1];
    if (pair !== undefined && next !== undefined) {
      assign("groups", pair);
      assign("spots", next);
    }
  }
  if (mapping.instrument === undefined && instrumentNames.length > 0) {
    const names = new Set(instrumentNames.map((n) => n.trim().toLowerCase()));
    const index = free().find((i) => {
      const values = column(i);
      return (
        values.length > 0 && values.filter((v) => names.has(v.toLowerCase())).length >= 0.5 * values.length
      );
    });
    if (index !== undefined) assign("instrument", index);
  }

  // Hemisphere counts only make sense as a set of four.
  if (HEMISPHERE_FIELDS.some((f) => mapping[f] === undefined))
    for (const f of HEMISPHERE_FIELDS) delete mapping[f];

  const dateSamples = mapping.date === undefined ? [] : column(mapping.date - 1);
  let dateFormats = detectDateFormats(dateSamples);
  if (dateFormats.includes("iso-datetime"))
    dateFormats = ["iso-datetime", ...dateFormats.filter((f) => f !== "iso-datetime")];
  const dateOrderAmbiguous = dateFormats.includes("dd/mm/yyyy") && dateFormats.includes("mm/dd/yyyy");

  return {
    hasHeader,
    mapping: Object.fromEntries(
      IMPORT_FIELDS.filter((f) => mapping[f] !== undefined).map((f) => [f, mapping[f]]),
    ),
    recognisedBy,
    dateFormats,
    dateOrderAmbiguous,
    ignoredColumns,
  };
}
