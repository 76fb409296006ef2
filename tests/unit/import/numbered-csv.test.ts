import { Readable } from "node:stream";

import { CsvError, parse } from "csv-parse";
import { describe, expect, it } from "vitest";

import { NumberedCsvParser, startLine, type NumberedRecords } from "@/lib/import/numbered-csv";

const OPTIONS = {
  delimiter: ",",
  bom: true,
  relax_column_count: true,
  skip_empty_lines: true,
  skip_records_with_empty_values: true,
  max_record_size: 64 * 1024,
} as const;

/** The text as a stream of `chunkBytes`-byte pieces, so records straddle chunk boundaries. */
function pieces(text: string, chunkBytes: number): Readable {
  const bytes = Buffer.from(text);
  const parts: Buffer[] = [];
  for (let i = 0; i < bytes.length; i += chunkBytes) parts.push(bytes.subarray(i, i + chunkBytes));
  return Readable.from(parts, { objectMode: false });
}

async function readNumbered(text: string, chunkBytes: number) {
  const batches: NumberedRecords[] = [];
  for await (const batch of pieces(text, chunkBytes).pipe(new NumberedCsvParser(OPTIONS)))
    batches.push(batch as NumberedRecords);
  return {
    batches: batches.length,
    rows: batches.flatMap((b) => b.records.map((record, i) => ({ line: b.lines[i]!, record }))),
  };
}

/** What csv-parse's own `info: true` option reports, for comparison. */
async function readWithInfo(text: string) {
  const rows: Array<{ line: number; record: string[] }> = [];
  for await (const entry of pieces(text, 1 << 20).pipe(parse({ ...OPTIONS, info: true }))) {
    const { info, record } = entry as { info: { lines: number }; record: string[] };
    rows.push({ line: startLine(info.lines, record), record });
  }
  return rows;
}

const TRICKY = [
  "\uFEFFdate,g,s,notes",
  "2020-01-01,1,2,plain",
  "",
  '2020-01-02,1,2,"a note\nover two lines"',
  '2020-01-03,1,2,"three\nline\nnote"',
  ",,,",
  '2020-01-04,1,2,"quoted, with comma"',
  "",
  "",
  "2020-01-05,0,0,last",
].join("\r\n");

describe("NumberedCsvParser", () => {
  it.each([1, 7, 64, 1 << 20])(
    "numbers every record by the line it starts on, in %i-byte chunks, as csv-parse's info does",
    async (chunkBytes) => {
      const { rows } = await readNumbered(TRICKY, chunkBytes);
      expect(rows).toEqual(await readWithInfo(TRICKY));
      expect(rows.map((r) => r.line)).toEqual([1, 2, 4, 6, 10, 13]);
      expect(rows[2]!.record[3]).toBe("a note\nover two lines");
    },
  );

  it("hands on the records of a chunk together, not one stream write per record", async () => {
    const lines = ["date,g,s"];
    for (let i = 0; i < 5000; i++) lines.push(`2020-01-01,${i % 9},${i % 9}`);
    const { batches, rows } = await readNumbered(lines.join("\n"), 64 * 1024);
    expect(rows).toHaveLength(5001);
    expect(rows.at(-1)!.line).toBe(5001);
    expect(batches).toBeLessThan(10);
  });

  it("fails with csv-parse's error for an unbalanced quote", async () => {
    const error = await readNumbered('date,g,s\n2020-01-01,1,"2\n', 4).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(CsvError);
    expect((error as CsvError).code).toBe("CSV_QUOTE_NOT_CLOSED");
  });
});
