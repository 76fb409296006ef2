import "server-only";

import { hash, randomUUID } from "node:crypto";
import { Transform, Writable, type Readable } from "node:stream";
import { pipeline } from "node:stream/promises";

import { CsvError } from "csv-parse";

import {
  listImportInstruments,
  openImportSession,
  type LineClash,
  type StagedRow,
} from "@/db/queries/imports";
import { AppError } from "@/lib/http/errors";
import { MAX_REPORTED_PROBLEMS, type ImportOptions } from "@/lib/validation/import";
import type { ObservationInput } from "@/lib/validation/observation";

import { FIELD_LABELS, IMPORT_FIELDS } from "./columns";
import { INLINE_FLAG_LIMIT, flagImportBatch, startImportFlagJob } from "./flag-import";
import { makeRowConverter, type RowProblem } from "./convert-row";
import { makeOrderedIdMaker } from "@/lib/ids/ordered-ids";
import { NumberedCsvParser, type NumberedRecords } from "./numbered-csv";
import { DELIMITERS, DELIMITER_NAMES, inspectFileHead } from "./sniff";

export type ImportProgress = {
  phase: "reading" | "checking" | "storing" | "flagging";
  bytesRead: number;
  totalBytes: number;
  rowsRead: number;
};

export type ImportSuccess = {
  ok: true;
  batchId: string;
  rowsRead: number;
  imported: number;
  skipped: number;
  firstDay: string | null;
  lastDay: string | null;
  /** Review-desk flags: added before answering, or (for large imports) by a background job. */
  flags: { status: "done" } | { status: "running"; jobId: string };
};
export type ImportFailure = {
  ok: false;
  rowsRead: number;
  badRows: number;
  problemCount: number;
  /** The first MAX_REPORTED_PROBLEMS problems, in line order. */
  problems: RowProblem[];
  message: string;
};
export type ImportReport = ImportSuccess | ImportFailure;

const STAGE_BATCH_ROWS = 2000;
const PROGRESS_EVERY_ROWS = 5000;
const MAX_RECORD_BYTES = 64 * 1024;

/**
 * Reads a CSV logbook as a stream and stores it in one transaction: every
 * line, or (when any line is wrong) none, with a report of each bad line.
 * Whole-file problems (not text, wrong separator, unbalanced quotes, no
 * rows) throw an AppError; line problems come back in the report.
 */
export async function importLogbook({
  observerId,
  byUserId,
  input,
  totalBytes,
  fileHash,
  options,
  onProgress,
  signal,
  now = new Date(),
}: {
  observerId: string;
  byUserId: string;
  input: Readable;
  totalBytes: number;
  fileHash: string;
  options: ImportOptions;
  onProgress?: (progress: ImportProgress) => void;
  signal?: AbortSignal;
  now?: Date;
}): Promise<ImportReport> {
  const instruments = await listImportInstruments({ observerId });
  if (options.instrumentId && !instruments.some((i) => i.id === options.instrumentId)) {
    throw new AppError("invalid_input", "Some options need attention.", {
      issues: [{ path: "instrumentId", message: "That instrument is not one of this observer's." }],
    });
  }
  const convert = makeRowConverter({ options, instruments, now });
  const makeImportId = makeOrderedIdMaker({ startMs: Date.now() });
  const widest = Math.max(...IMPORT_FIELDS.map((f) => options[f] ?? 0));

  const problems: RowProblem[] = [];
  let problemCount = 0;
  let badRows = 0;
  const note = (list: RowProblem[]) => {
    problemCount += list.length;
    for (const p of list) if (problems.length < MAX_REPORTED_PROBLEMS) problems.push(p);
  };

  let bytesRead = 0;
  let rowsRead = 0;
  let sawHead = false;
  const counter = new Transform({
    transform(chunk: Buffer, _encoding, done) {
      if (!sawHead) {
        sawHead = true;
        const problem = inspectFileHead(chunk.subarray(0, 64 * 1024), {
          totalBytes: Math.max(totalBytes, chunk.length),
        });
        if (problem) return done(new AppError("invalid_input", problem.message));
      } else if (chunk.includes(0)) {
        return done(
          new AppError("invalid_input", "The file contains binary data, not text. Choose a CSV text file."),
        );
      }
      bytesRead += chunk.length;
      done(null, chunk);
    },
    flush(done) {
      if (!sawHead)
        return done(
          new AppError("invalid_input", "The file is empty. Choose the CSV file that holds your logbook."),
        );
      done();
    },
  });
  const parser = new NumberedCsvParser({
    delimiter: DELIMITERS[options.delimiter],
    bom: true,
    relax_column_count: true,
    skip_empty_lines: true,
    skip_records_with_empty_values: true,
    max_record_size: MAX_RECORD_BYTES,
  });

  const session = await openImportSession({ observerId });
  let settled = false;
  try {
    let staged: StagedRow[] = [];
    let headerPending = options.header;
    let sawData = false;
    // A plain Writable as the last stage: the records of each chunk are
    // handled synchronously, and only a full batch waits for the database.
    const sink = new Writable({
      objectMode: true,
      highWaterMark: 1,
      write({ records, lines }: NumberedRecords, _encoding, done) {
        try {
          if (signal?.aborted)
            throw new AppError("bad_request", "The import was cancelled; nothing was stored.");
          for (let i = 0; i < records.length; i++) handleRecord(records[i]!, lines[i]!);
          if (staged.length >= STAGE_BATCH_ROWS) {
            const batch = staged;
            staged = [];
            session.stage(batch).then(() => done(), done);
            return;
          }
          done();
        } catch (error) {
          done(error as Error);
        }
      },
    });

    const handleRecord = (record: string[], line: number) => {
      if (headerPending) {
        headerPending = false;
        checkWidth({ record, widest, line, options, what: "header" });
        return;
      }
      if (!sawData) {
        sawData = true;
        checkWidth({ record, widest, line, options, what: "first row" });
      }
      rowsRead++;
      const result = convert(record, line);
      if (result.ok) staged.push(toStagedRow({ input: result.input, line, id: makeImportId(line) }));
      else {
        badRows++;
        note(result.problems);
      }
      if (rowsRead % PROGRESS_EVERY_ROWS === 0)
        onProgress?.({ phase: "reading", bytesRead, totalBytes, rowsRead });
    };

    await pipeline(input, counter, parser, sink).catch((error: unknown) => {
      throw describeParseError(error);
    });
    if (staged.length > 0) await session.stage(staged);
    staged = [];

    if (rowsRead === 0) {
      throw new AppError(
        "invalid_input",
        options.header
          ? "The file has a header line but no rows of counts below it."
          : "The file has no rows of counts.",
      );
    }
    onProgress?.({ phase: "checking", bytesRead, totalBytes, rowsRead });

    const skipped = await session.markAlreadyImported();
    const names = new Map(instruments.map((i) => [i.id, i.name]));
    const repeated = await session.findRepeatedDays({ limit: MAX_REPORTED_PROBLEMS });
    const inLogbook = await session.findLogbookClashes({ limit: MAX_REPORTED_PROBLEMS });
    const clashProblems = [
      ...repeated.clashes.map((c) => clashProblem(c, names, "file")),
      ...inLogbook.clashes.map((c) => clashProblem(c, names, "logbook")),
    ];
    badRows += repeated.total + inLogbook.total;
    problemCount += repeated.total + inLogbook.total;
    const merged = [...problems, ...clashProblems]
      .sort((a, b) => a.line - b.line)
      .slice(0, MAX_REPORTED_PROBLEMS);

    if (problemCount > 0) {
      await session.rollback();
      settled = true;
      return {
        ok: false,
        rowsRead,
        badRows,
        problemCount,
        problems: merged,
        message: `${plural(problemCount, "problem")} in ${plural(Math.min(badRows, rowsRead), "row")} of ${plural(rowsRead, "row")}; nothing was imported. Correct the file and import it again.`,
      };
    }

    onProgress?.({ phase: "storing", bytesRead, totalBytes, rowsRead });
    const batchId = randomUUID();
    const stored = await session.commit({ batchId, byUserId, fileName: options.fileName, fileHash, skipped });
    settled = true;
    let flags: ImportSuccess["flags"] = { status: "done" };
    if (stored.imported > 0 && stored.imported <= INLINE_FLAG_LIMIT) {
      onProgress?.({ phase: "flagging", bytesRead, totalBytes, rowsRead });
      try {
        await flagImportBatch({ batchId });
      } catch (error) {
        // Flags are derived data: the import stands, and they can be recomputed.
        console.error(
          `Flagging import ${batchId} failed; its counts are stored without automatic flags.`,
          error,
        );
      }
    } else if (stored.imported > INLINE_FLAG_LIMIT) {
      flags = {
        status: "running",
        jobId: await startImportFlagJob({ batchId, byUserId, total: stored.imported }),
      };
    }
    return {
      ok: true,
      batchId,
      rowsRead,
      imported: stored.imported,
      skipped,
      firstDay: stored.firstDay,
      lastDay: stored.lastDay,
      flags,
    };
  } finally {
    if (!settled) await session.rollback();
  }
}

function checkWidth({
  record,
  widest,
  line,
  options,
  what,
}: {
  record: string[];
  widest: number;
  line: number;
  options: ImportOptions;
  what: "header" | "first row";
}) {
  if (record.length >= widest) return;
  if (record.length === 1) {
    const text = record[0] ?? "";
    const other = DELIMITER_NAMES.find(
      (name) => name !== options.delimiter && text.includes(DELIMITERS[name]),
    );
    throw new AppError(
      "invalid_input",
      other
        ? `Line ${line} reads as a single column: the file seems to separate values with ${describeDelimiter(other)}, not ${describeDelimiter(options.delimiter)}. Choose the right separator and try again.`
        : `Line ${line} reads as a single column, but column ${widest} was chosen. Check the separator.`,
    );
  }
  throw new AppError(
    "invalid_input",
    `The ${what} (line ${line}) has ${record.length} columns, but column ${widest} was chosen. Check the column choices and the separator.`,
  );
}

function describeDelimiter(name: keyof typeof DELIMITERS): string {
  return { comma: "commas", semicolon: "semicolons", tab: "tabs", pipe: "vertical bars" }[name];
}

function describeParseError(error: unknown): unknown {
  if (!(error instanceof CsvError)) return error;
  const line = (error as CsvError & { lines?: number }).lines;
  const at = line ? `Line ${line}: ` : "";
  switch (error.code) {
    case "CSV_QUOTE_NOT_CLOSED":
      return new AppError(
        "invalid_input",
        `${at}a quoted value is never closed (unbalanced double quotes). Nothing was imported.`,
      );
    case "CSV_INVALID_CLOSING_QUOTE":
    case "INVALID_OPENING_QUOTE":
    case "CSV_NON_TRIMABLE_CHAR_AFTER_CLOSING_QUOTE":
      return new AppError(
        "invalid_input",
        `${at}a double quote is in the wrong place (unbalanced quotes). Quote whole values, and write a quote inside a quoted value as "". Nothing was imported.`,
      );
    case "CSV_MAX_RECORD_SIZE":
      return new AppError(
        "invalid_input",
        `${at}a single row is longer than 64 KB; this does not look like a logbook. Nothing was imported.`,
      );
    default:
      return new AppError(
        "invalid_input",
        `${at}the file could not be read as CSV (${error.message}). Nothing was imported.`,
      );
  }
}

function toStagedRow({ input, line, id }: { input: ObservationInput; line: number; id: string }): StagedRow {
  const observedAtMs = input.observedAt.getTime();
  const northGroups = input.northGroups ?? null;
  const northSpots = input.northSpots ?? null;
  const southGroups = input.southGroups ?? null;
  const southSpots = input.southSpots ?? null;
  const notes = input.notes ?? null;
  // The key is the line's content, not its position: the same file (or the
  // same lines in another file) imported again finds every key taken.
  const importKey = hash(
    "sha256",
    `${observedAtMs}|${input.instrumentId}|${input.seeing}|${input.groups}|${input.spots}|${northGroups}|${northSpots}|${southGroups}|${southSpots}|${notes ?? ""}`,
    "base64url",
  ).slice(0, 32);
  return {
    line,
    id,
    instrumentId: input.instrumentId,
    observedAtMs,
    utDate: input.observedAt.toISOString().slice(0, 10),
    seeing: input.seeing,
    groups: input.groups,
    spots: input.spots,
    northGroups,
    northSpots,
    southGroups,
    southSpots,
    notes,
    importKey,
  };
}

function clashProblem(clash: LineClash, names: Map<string, string>, kind: "file" | "logbook"): RowProblem {
  const instrument = names.get(clash.instrumentId) ?? "this instrument";
  return {
    line: clash.line,
    field: "date",
    value: clash.utDate,
    reason:
      kind === "file"
        ? `Duplicate day and instrument: line ${clash.otherLine} already has ${clash.utDate} (UT) with ${instrument}.`
        : `Duplicate day and instrument: your Logbook already has a count for ${clash.utDate} (UT) with ${instrument}.`,
  };
}

function plural(n: number, word: string): string {
  return `${n.toLocaleString("en-GB")} ${word}${n === 1 ? "" : "s"}`;
}

export function describeProblem(problem: RowProblem): string {
  const column = problem.field ? ` (${FIELD_LABELS[problem.field]})` : "";
  return `Line ${problem.line}${column}: ${problem.reason}`;
}
