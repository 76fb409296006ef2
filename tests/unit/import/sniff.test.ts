import { describe, expect, it } from "vitest";

import { makeRowConverter } from "@/lib/import/convert-row";
import { parseSample, trimToWholeLines } from "@/lib/import/sample";
import { detectDelimiter, inspectFileHead, suggestMapping } from "@/lib/import/sniff";
import { formatCsvCell, formatCsvLine } from "@/lib/export/csv";
import { importOptionsSchema } from "@/lib/validation/import";

const bytes = (text: string) => new TextEncoder().encode(text);

describe("inspectFileHead", () => {
  it("passes plain UTF-8 text, with or without a byte-order mark", () => {
    expect(inspectFileHead(bytes("date,g,s\n2024-01-01,1,2\n"), { totalBytes: 24 })).toBeNull();
    expect(inspectFileHead(bytes("\uFEFFdate;g;s\n"), { totalBytes: 12 })).toBeNull();
  });
  it("names what is wrong with files that are not CSV text", () => {
    expect(inspectFileHead(new Uint8Array(0), { totalBytes: 0 })?.kind).toBe("empty");
    expect(inspectFileHead(bytes("\n \r\n"), { totalBytes: 4 })?.kind).toBe("empty");
    expect(inspectFileHead(new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0]), { totalBytes: 5 })?.kind).toBe(
      "spreadsheet",
    );
    expect(inspectFileHead(new Uint8Array([0x61, 0, 0x62]), { totalBytes: 3 })?.kind).toBe("binary");
    expect(inspectFileHead(new Uint8Array([0x61, 0xe9, 0x62, 0x0a]), { totalBytes: 4 })?.kind).toBe(
      "encoding",
    );
  });
  it("does not blame a multi-byte character cut at the end of the sample", () => {
    const text = bytes("notes\nété");
    expect(inspectFileHead(text.subarray(0, text.length - 1), { totalBytes: 1000 })).toBeNull();
  });
});

describe("detectDelimiter", () => {
  it.each([
    ["date,g,s\n2024-01-01,1,2\n2024-01-02,3,9", "comma"],
    ["Datum;g;s;k\n01.01.2024;1;2;0,85\n02.01.2024;3;9;0,85", "semicolon"],
    ["date\tg\ts\n2024-01-01\t1\t2", "tab"],
    ["date|g|s\n2024-01-01|1|2", "pipe"],
    ['date,g,s,notes\n2024-01-01,1,2,"a; b; c"\n2024-01-02,1,2,x', "comma"],
  ])("finds the separator of %j", (text, expected) => {
    expect(detectDelimiter(text)).toBe(expected);
  });
});

describe("suggestMapping", () => {
  it("recognises header names in several languages and ignores computed columns", () => {
    const s = suggestMapping({
      rows: [
        ["Datum", "Zeit", "Gruppen", "Flecken", "R", "Bemerkung"],
        ["01.02.2024", "10:00", "2", "9", "29", ""],
      ],
    });
    expect(s.hasHeader).toBe(true);
    expect(s.mapping).toEqual({ date: 1, time: 2, groups: 3, spots: 4, notes: 6 });
    expect(s.ignoredColumns).toEqual([5]);
    expect(s.dateFormats[0]).toBe("dd.mm.yyyy");
  });

  it("guesses from values when there is no header", () => {
    const rows = [
      ["2024-02-01", "09:30", "2", "9", "Pinhole box"],
      ["2024-02-02", "10:15", "0", "0", "Pinhole box"],
      ["2024-02-04", "11:00", "4", "31", "Pinhole box"],
    ];
    const s = suggestMapping({ rows, instrumentNames: ["Pinhole box"] });
    expect(s.hasHeader).toBe(false);
    expect(s.mapping).toEqual({ date: 1, time: 2, groups: 3, spots: 4, instrument: 5 });
    expect(s.recognisedBy.groups).toBe("values");
  });

  it("keeps hemisphere columns only as a complete set", () => {
    const s = suggestMapping({
      rows: [
        ["date", "g", "s", "gN", "sN"],
        ["2024-01-01", "2", "5", "1", "3"],
      ],
    });
    expect(s.mapping.northGroups).toBeUndefined();
    expect(s.mapping.northSpots).toBeUndefined();
  });

  it("says when day and month order cannot be told apart", () => {
    const s = suggestMapping({
      rows: [
        ["date", "g", "s"],
        ["01/02/2024", "1", "2"],
        ["03/04/2024", "1", "2"],
      ],
    });
    expect(s.dateOrderAmbiguous).toBe(true);
  });
});

describe("parseSample", () => {
  it("gives line numbers, counting lines inside quoted notes", () => {
    const text = 'date,g,s,notes\n2024-01-01,1,2,"two\nlines"\n2024-01-02,1,2,x\n';
    const sample = parseSample({ text, delimiter: "comma" });
    expect(sample.records.map((r) => r.line)).toEqual([1, 2, 4]);
  });
  it("reports unbalanced quotes with the line", () => {
    expect(parseSample({ text: 'date,g,s\n2024-01-01,1,"2\n', delimiter: "comma" }).error).toMatch(
      /^Line \d+: a quoted value is never closed/,
    );
  });
  it("drops a line cut in half at the end of a partial sample", () => {
    expect(trimToWholeLines({ text: "a,b\n1,2\n3,", complete: false })).toBe("a,b\n1,2\n");
    expect(trimToWholeLines({ text: "a,b\n1,2\n3,", complete: true })).toBe("a,b\n1,2\n3,");
  });
});

describe("makeRowConverter", () => {
  const options = importOptionsSchema.parse({
    date: "1",
    groups: "2",
    spots: "3",
    instrument: "4",
    dateFormat: "yyyy-mm-dd",
    defaultSeeing: "3",
  });
  const convert = makeRowConverter({
    options,
    instruments: [{ id: "i-1", name: "Pinhole box" }],
    now: new Date("2026-01-01T00:00:00Z"),
  });

  it("turns a good line into the observation the form would send", () => {
    const result = convert(["2024-05-01", "2", "9", "pinhole BOX"], 7);
    expect(result).toEqual({
      ok: true,
      input: expect.objectContaining({
        instrumentId: "i-1",
        groups: 2,
        spots: 9,
        seeing: 3,
        observedAt: new Date("2024-05-01T12:00:00Z"),
      }),
    });
  });

  it("lists every problem of a bad line, each with its column", () => {
    const result = convert(["2024-02-30", "-2", "x", "Big dob"], 9);
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.problems.map((p) => [p.line, p.field])).toEqual(
      expect.arrayContaining([
        [9, "date"],
        [9, "instrument"],
        [9, "groups"],
        [9, "spots"],
      ]),
    );
  });
});

describe("CSV cells", () => {
  it("quotes what needs quoting and defuses spreadsheet formulas in text", () => {
    expect(formatCsvCell('a "b", c')).toBe('"a ""b"", c"');
    expect(formatCsvCell("=1+1", { text: true })).toBe("'=1+1");
    expect(formatCsvCell(-3)).toBe("-3");
    expect(formatCsvCell(null)).toBe("");
    expect(formatCsvLine(["x", 1, new Date("2024-01-01T00:00:00Z")])).toBe(
      "x,1,2024-01-01T00:00:00.000Z\r\n",
    );
  });
});
