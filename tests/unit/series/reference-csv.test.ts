import { describe, expect, it } from "vitest";

import { MAX_REPORTED_PROBLEMS, parseReferenceCsv, splitCsvLine } from "@/lib/series/reference-csv";
import { referenceImportSchema } from "@/lib/validation/reference-import";

describe("splitCsvLine", () => {
  it("splits on commas and honours quotes", () => {
    expect(splitCsvLine('2024-01-01, "1,5" ,x')).toEqual(["2024-01-01", "1,5", "x"]);
    expect(splitCsvLine('"say ""hi""",2')).toEqual(['say "hi"', "2"]);
    expect(splitCsvLine('"open,2')).toBeNull();
  });
});

describe("parseReferenceCsv", () => {
  it("accepts a BOM, CRLF, trailing blank lines, and sorts by day", () => {
    const result = parseReferenceCsv("\uFEFFdate,value\r\n2024-01-03,5\r\n2024-01-01,1e1\r\n\r\n");
    expect(result).toEqual({
      ok: true,
      values: [
        { day: "2024-01-01", value: 10 },
        { day: "2024-01-03", value: 5 },
      ],
      firstDay: "2024-01-01",
      lastDay: "2024-01-03",
    });
  });

  it("reports each bad row with its reason, counting the header as row 1", () => {
    const result = parseReferenceCsv("date,value\n2024-01-01,1\n\n2023-02-29,x\n2024-01-01,-2\n");
    expect(result).toEqual({
      ok: false,
      moreProblems: 0,
      problems: [
        { row: 3, reason: "Empty row: remove it or give it a date and a value." },
        { row: 4, reason: 'Bad date: "2023-02-29" is not a calendar day written YYYY-MM-DD.' },
        { row: 4, reason: 'Not a number: "x".' },
        { row: 5, reason: "Duplicate day: 2024-01-01 is already on row 2." },
        { row: 5, reason: "Negative value: -2; a relative number is never below 0." },
      ],
    });
  });

  it("caps the report and counts the rest", () => {
    const lines = ["date,value", ...Array.from({ length: MAX_REPORTED_PROBLEMS + 7 }, () => "bad,1")];
    const result = parseReferenceCsv(lines.join("\n"));
    expect(result.ok).toBe(false);
    if (!result.ok) {
      expect(result.problems).toHaveLength(MAX_REPORTED_PROBLEMS);
      expect(result.moreProblems).toBe(7);
    }
  });
});

describe("referenceImportSchema", () => {
  it("turns the parsed file into values, or row issues at csv.<row>", () => {
    const ok = referenceImportSchema.safeParse({
      name: " Test ",
      licence: "CC0",
      csv: "date,value\n2024-01-01,3\n",
    });
    expect(ok.success && ok.data).toEqual({
      name: "Test",
      licence: "CC0",
      source: null,
      values: [{ day: "2024-01-01", value: 3 }],
      firstDay: "2024-01-01",
      lastDay: "2024-01-01",
    });
    const bad = referenceImportSchema.safeParse({
      name: "Test",
      licence: "CC0",
      csv: "date,value\n2024-01-01,-3\n",
    });
    expect(bad.success).toBe(false);
    if (!bad.success)
      expect(bad.error.issues.map((i) => [i.path.join("."), i.message])).toEqual([
        ["csv.2", "Row 2: Negative value: -3; a relative number is never below 0."],
      ]);
    const unknown = referenceImportSchema.safeParse({
      name: "Test",
      licence: "CC0",
      csv: "date,value\n2024-01-01,3\n",
      extra: 1,
    });
    expect(unknown.success).toBe(false);
  });
});
