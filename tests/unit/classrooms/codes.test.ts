import { describe, expect, it } from "vitest";

import { formatCsv, formatCsvCell } from "@/lib/classrooms/csv";
import {
  isObviousPin,
  makeJoinCode,
  makePin,
  normaliseDisplayName,
  normaliseJoinCode,
  secureRandomInt,
} from "@/lib/classrooms/codes";

/** A random source that plays back the given values. */
function playback(values: number[]) {
  let i = 0;
  return (max: number) => {
    const v = values[i++ % values.length] as number;
    return v % max;
  };
}

describe("classroom codes", () => {
  it("makes codes of the prefix and four unambiguous characters", () => {
    expect(makeJoinCode({ random: playback([0, 1, 2, 22]) })).toBe("SUN-346Y");
    for (let i = 0; i < 200; i++) expect(makeJoinCode()).toMatch(/^SUN-[34679ACDEFGHJKMNPQRTWXY]{4}$/);
  });

  it("tidies a typed code into the stored form", () => {
    expect(normaliseJoinCode("sun-hls8")).toBe("SUN-HLS8");
    expect(normaliseJoinCode("  SUN HLS8 ")).toBe("SUN-HLS8");
    expect(normaliseJoinCode("SUNHLS8")).toBe("SUN-HLS8");
    expect(normaliseJoinCode("SUN–HLS8")).toBe("SUN-HLS8");
    expect(normaliseJoinCode("T-12")).toBe("T-12");
  });
});

describe("PINs", () => {
  it("makes four-digit PINs and draws again for obvious ones", () => {
    // 1,1,1,1 is refused, then 4,8,2,1 is taken.
    expect(makePin({ random: playback([1, 1, 1, 1, 4, 8, 2, 1]) })).toBe("4821");
    for (let i = 0; i < 200; i++) {
      const pin = makePin();
      expect(pin).toMatch(/^\d{4}$/);
      expect(isObviousPin(pin)).toBe(false);
    }
  });

  it("knows the PINs anyone would try first", () => {
    expect(["0000", "7777", "1234", "6789", "9876", "3210"].every(isObviousPin)).toBe(true);
    expect(["4821", "1937", "1235", "0101"].some(isObviousPin)).toBe(false);
  });

  it("draws whole numbers below the limit", () => {
    const seen = new Set<number>();
    for (let i = 0; i < 500; i++) seen.add(secureRandomInt(10));
    expect([...seen].sort()).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]);
  });
});

describe("display names", () => {
  it("compares names without case, full stops or extra spaces", () => {
    expect(normaliseDisplayName("Ava P.")).toBe("ava p");
    expect(normaliseDisplayName("  ava   p ")).toBe("ava p");
    expect(normaliseDisplayName("Zoë O’Neill")).toBe(normaliseDisplayName("zoë oneill"));
  });
});

describe("CSV", () => {
  it("quotes what needs quoting and keeps formulas as text", () => {
    expect(formatCsvCell("Ava P.")).toBe("Ava P.");
    expect(formatCsvCell("a,b")).toBe('"a,b"');
    expect(formatCsvCell('say "hi"')).toBe('"say ""hi"""');
    expect(formatCsvCell("=HYPERLINK(1)")).toBe("'=HYPERLINK(1)");
    expect(formatCsvCell("+1,2")).toBe(`"'+1,2"`);
    expect(formatCsvCell(null)).toBe("");
    expect(formatCsvCell(1.875)).toBe("1.875");
    expect(formatCsvCell(-3)).toBe("-3");
    expect(formatCsvCell(Number.NaN)).toBe("");
  });

  it("writes a header and rows with CRLF line ends", () => {
    expect(
      formatCsv({
        header: ["Student", "k"],
        rows: [
          ["Ava P.", 0.9],
          ["Class median", null],
        ],
      }),
    ).toBe("Student,k\r\nAva P.,0.9\r\nClass median,\r\n");
  });
});
