import { describe, expect, it } from "vitest";

import { detectDateFormats, parseObservationTime, parseTimeText, zonedTimeToUtc } from "@/lib/import/dates";

const at = (
  dateText: string,
  format: Parameters<typeof parseObservationTime>[0]["format"],
  timeZone = "UTC",
  timeText?: string,
) => {
  const r = parseObservationTime({ dateText, timeText, format, timeZone, defaultTime: "12:00" });
  return r.ok ? r.at.toISOString() : r.reason;
};

describe("parseObservationTime", () => {
  it.each([
    ["2024-03-17", "yyyy-mm-dd", "2024-03-17T12:00:00.000Z"],
    ["17/03/2024", "dd/mm/yyyy", "2024-03-17T12:00:00.000Z"],
    ["03/17/2024", "mm/dd/yyyy", "2024-03-17T12:00:00.000Z"],
    ["17.3.2024", "dd.mm.yyyy", "2024-03-17T12:00:00.000Z"],
    ["17-03-2024", "dd-mm-yyyy", "2024-03-17T12:00:00.000Z"],
    ["2024/03/17", "yyyy/mm/dd", "2024-03-17T12:00:00.000Z"],
    ["20240317", "yyyymmdd", "2024-03-17T12:00:00.000Z"],
    ["2024-03-17T09:30:00Z", "iso-datetime", "2024-03-17T09:30:00.000Z"],
    ["2024-03-17T09:30+02:00", "iso-datetime", "2024-03-17T07:30:00.000Z"],
    ["2024-03-17 09:30", "yyyy-mm-dd", "2024-03-17T09:30:00.000Z"],
  ] as const)("reads %s as %s", (text, format, expected) => {
    expect(at(text, format)).toBe(expected);
  });

  it("refuses dates that do not exist or do not fit the format", () => {
    expect(at("2023-02-29", "yyyy-mm-dd")).toContain("not a date");
    expect(at("31/04/2024", "dd/mm/yyyy")).toContain("not a date");
    expect(at("17/03/2024", "mm/dd/yyyy")).toContain("not a date");
    expect(at("", "yyyy-mm-dd")).toBe("The date is missing.");
    expect(at("2024-03-17", "yyyy-mm-dd", "UTC", "25:00")).toContain("The time");
  });

  it("knows which years have a 29 February (Gregorian rule, common practice)", () => {
    expect(at("2024-02-29", "yyyy-mm-dd")).toBe("2024-02-29T12:00:00.000Z");
    expect(at("2000-02-29", "yyyy-mm-dd")).toBe("2000-02-29T12:00:00.000Z");
    expect(at("1900-02-29", "yyyy-mm-dd")).toContain("not a date");
    expect(at("2100-02-29", "yyyy-mm-dd")).toContain("not a date");
    expect(at("1700-02-29", "yyyy-mm-dd")).toContain("not a date");
    expect(at("31.12.1999", "dd.mm.yyyy")).toBe("1999-12-31T12:00:00.000Z");
    expect(at("31.11.1999", "dd.mm.yyyy")).toContain("not a date");
  });

  it("keeps each line's own offset when lines change year and zone", () => {
    // Lines in file order: the offsets of one year must not carry over to the
    // next line's year or zone. Europe/Berlin is UT+1 in winter, UT+2 in
    // summer; Sydney UT+11 in January (common practice: IANA zone rules).
    expect(at("2023-12-31", "yyyy-mm-dd", "Europe/Berlin", "23:30")).toBe("2023-12-31T22:30:00.000Z");
    expect(at("2024-01-01", "yyyy-mm-dd", "Europe/Berlin", "00:30")).toBe("2023-12-31T23:30:00.000Z");
    expect(at("2024-07-01", "yyyy-mm-dd", "Europe/Berlin", "12:00")).toBe("2024-07-01T10:00:00.000Z");
    expect(at("2024-01-01", "yyyy-mm-dd", "Australia/Sydney", "12:00")).toBe("2024-01-01T01:00:00.000Z");
    expect(at("2024-01-02", "yyyy-mm-dd", "Europe/Berlin", "12:00")).toBe("2024-01-02T11:00:00.000Z");
  });

  it("turns local wall-clock times into UT across daylight-saving changes", () => {
    // Europe/London: GMT until 31 March 2024 01:00 UT, then BST (UT+1) (common practice: EU summer time rules).
    expect(at("2024-03-30", "yyyy-mm-dd", "Europe/London", "10:00")).toBe("2024-03-30T10:00:00.000Z");
    expect(at("2024-03-31", "yyyy-mm-dd", "Europe/London", "10:00")).toBe("2024-03-31T09:00:00.000Z");
    expect(at("2024-10-27", "yyyy-mm-dd", "Europe/London", "10:00")).toBe("2024-10-27T10:00:00.000Z");
    // Southern hemisphere: Sydney is UT+11 in January, UT+10 in July.
    expect(at("2024-01-15", "yyyy-mm-dd", "Australia/Sydney", "08:00")).toBe("2024-01-14T21:00:00.000Z");
    expect(at("2024-07-15", "yyyy-mm-dd", "Australia/Sydney", "08:00")).toBe("2024-07-14T22:00:00.000Z");
    // A zone with a half-hour offset and no daylight saving.
    expect(at("2024-07-15", "yyyy-mm-dd", "Asia/Kolkata", "12:00")).toBe("2024-07-15T06:30:00.000Z");
  });

  it("agrees with Intl for every hour of a year with two changes", () => {
    // Round trip: the UT instant, shown on the zone's wall clock, gives back the local time we asked for.
    const format = new Intl.DateTimeFormat("en-CA", {
      timeZone: "America/New_York",
      hourCycle: "h23",
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
    });
    for (let day = 0; day < 365; day += 3) {
      const date = new Date(Date.UTC(2023, 0, 1 + day));
      const parts = { year: date.getUTCFullYear(), month: date.getUTCMonth() + 1, day: date.getUTCDate() };
      const utc = zonedTimeToUtc({
        date: parts,
        time: { hour: 12, minute: 0, second: 0 },
        timeZone: "America/New_York",
      });
      expect(format.format(utc)).toBe(`${date.toISOString().slice(0, 10)}, 12:00`);
    }
  });
});

describe("parseTimeText", () => {
  it("reads the usual ways of writing a time", () => {
    expect(parseTimeText("09:30")).toEqual({ hour: 9, minute: 30, second: 0 });
    expect(parseTimeText("9:30:15")).toEqual({ hour: 9, minute: 30, second: 15 });
    expect(parseTimeText("09h30")).toEqual({ hour: 9, minute: 30, second: 0 });
    expect(parseTimeText("0930")).toEqual({ hour: 9, minute: 30, second: 0 });
    expect(parseTimeText("24:00")).toBeNull();
    expect(parseTimeText("noon")).toBeNull();
  });
});

describe("detectDateFormats", () => {
  it("keeps both day orders when no day is above 12, and one when a day is", () => {
    expect(detectDateFormats(["01/02/2024", "03/04/2024"])).toEqual(
      expect.arrayContaining(["dd/mm/yyyy", "mm/dd/yyyy"]),
    );
    expect(detectDateFormats(["01/02/2024", "25/04/2024"])).toEqual(["dd/mm/yyyy"]);
    expect(detectDateFormats(["2024-03-17T09:30Z"])).toContain("iso-datetime");
    expect(detectDateFormats(["2024-03-17"])).not.toContain("iso-datetime");
    expect(detectDateFormats(["cloudy"])).toEqual([]);
  });
});
