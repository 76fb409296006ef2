/**
 * Dates as logbooks write them. A logbook line gives a calendar date (and
 * sometimes a time) in the observer's own clock; we turn it into a UT instant
 * with the IANA time zone chosen once for the whole file.
 */

export const DATE_FORMATS = [
  { id: "yyyy-mm-dd", label: "2024-03-17 (year-month-day)", example: "2024-03-17" },
  { id: "dd/mm/yyyy", label: "17/03/2024 (day/month/year)", example: "17/03/2024" },
  { id: "mm/dd/yyyy", label: "03/17/2024 (month/day/year)", example: "03/17/2024" },
  { id: "dd.mm.yyyy", label: "17.03.2024 (day.month.year)", example: "17.03.2024" },
  { id: "dd-mm-yyyy", label: "17-03-2024 (day-month-year)", example: "17-03-2024" },
  { id: "yyyy/mm/dd", label: "2024/03/17 (year/month/day)", example: "2024/03/17" },
  { id: "yyyymmdd", label: "20240317 (digits only)", example: "20240317" },
  {
    id: "iso-datetime",
    label: "2024-03-17T09:30Z (date and time; an offset or Z wins over the time zone)",
    example: "2024-03-17T09:30:00Z",
  },
] as const;

export type DateFormatId = (typeof DATE_FORMATS)[number]["id"];
export const DATE_FORMAT_IDS = DATE_FORMATS.map((f) => f.id) as [DateFormatId, ...DateFormatId[]];

type DateParts = { year: number; month: number; day: number };
type TimeParts = { hour: number; minute: number; second: number };

const DATE_PATTERNS: Record<
  Exclude<DateFormatId, "iso-datetime">,
  { re: RegExp; order: "ymd" | "dmy" | "mdy" }
> = {
  "yyyy-mm-dd": { re: /^(\d{4})-(\d{1,2})-(\d{1,2})$/, order: "ymd" },
  "dd/mm/yyyy": { re: /^(\d{1,2})\/(\d{1,2})\/(\d{4})$/, order: "dmy" },
  "mm/dd/yyyy": { re: /^(\d{1,2})\/(\d{1,2})\/(\d{4})$/, order: "mdy" },
  "dd.mm.yyyy": { re: /^(\d{1,2})\.(\d{1,2})\.(\d{4})$/, order: "dmy" },
  "dd-mm-yyyy": { re: /^(\d{1,2})-(\d{1,2})-(\d{4})$/, order: "dmy" },
  "yyyy/mm/dd": { re: /^(\d{4})\/(\d{1,2})\/(\d{1,2})$/, order: "ymd" },
  yyyymmdd: { re: /^(\d{4})(\d{2})(\d{2})$/, order: "ymd" },
};

const ISO_DATETIME =
  /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{1,2}):(\d{2})(?::(\d{2})(?:\.\d+)?)?)?\s*(Z|[+-]\d{2}:?\d{2})?$/i;

const TIME_PATTERN = /^(\d{1,2})[:h.](\d{2})(?:[:.](\d{2}))?$/i;
const COMPACT_TIME = /^(\d{2})(\d{2})$/;

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** The Gregorian calendar as Date.UTC counts it (which reads years 0–99 as 1900–1999). */
function isCalendarDate({ year, month, day }: DateParts): boolean {
  if (month < 1 || month > 12 || day < 1) return false;
  const y = year >= 0 && year < 100 ? 1900 + year : year;
  const leap = month === 2 && y % 4 === 0 && (y % 100 !== 0 || y % 400 === 0);
  return day <= DAYS_IN_MONTH[month - 1]! + (leap ? 1 : 0);
}

function parseDatePart(text: string, format: Exclude<DateFormatId, "iso-datetime">): DateParts | null {
  const pattern = DATE_PATTERNS[format];
  const m = pattern.re.exec(text);
  if (!m) return null;
  const [a, b, c] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const parts =
    pattern.order === "ymd"
      ? { year: a, month: b, day: c }
      : pattern.order === "dmy"
        ? { year: c, month: b, day: a }
        : { year: c, month: a, day: b };
  return isCalendarDate(parts) ? parts : null;
}

/** "09:30", "9:30:15", "09h30", "0930" → parts, or null. */
export function parseTimeText(text: string): TimeParts | null {
  const trimmed = text.trim();
  const m = TIME_PATTERN.exec(trimmed) ?? COMPACT_TIME.exec(trimmed);
  if (!m) return null;
  const hour = Number(m[1]);
  const minute = Number(m[2]);
  const second = m[3] === undefined ? 0 : Number(m[3]);
  if (hour > 23 || minute > 59 || second > 59) return null;
  return { hour, minute, second };
}

const offsetFormatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = offsetFormatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", {
      timeZone,
      hourCycle: "h23",
      year: "numeric",
      month: "numeric",
      day: "numeric",
      hour: "numeric",
      minute: "numeric",
      second: "numeric",
    });
    offsetFormatters.set(timeZone, f);
  }
  return f;
}

/** How far the zone's wall clock is ahead of UT at an instant, in milliseconds (asks Intl). */
function measureZoneOffsetMs(timeZone: string, utcMs: number): number {
  let year = 0;
  let month = 0;
  let day = 0;
  let hour = 0;
  let minute = 0;
  let second = 0;
  for (const part of formatterFor(timeZone).formatToParts(utcMs)) {
    switch (part.type) {
      case "year":
        year = Number(part.value);
        break;
      case "month":
        month = Number(part.value);
        break;
      case "day":
        day = Number(part.value);
        break;
      case "hour":
        hour = Number(part.value);
        break;
      case "minute":
        minute = Number(part.value);
        break;
      case "second":
        second = Number(part.value);
        break;
    }
  }
  const wall = Date.UTC(year, month - 1, day, hour, minute, second);
  return wall - (utcMs - (((utcMs % 1000) + 1000) % 1000));
}

type OffsetSpan = { startMs: number; offsetMs: number };
const YEAR_SPANS = new Map<string, OffsetSpan[]>();
const MAX_CACHED_YEARS = 2000;
const MINUTE_MS = 60_000;

/**
 * A zone's offsets through one UT year, as spans that start at each change.
 * Asking Intl once per logbook line is the slow part of an import; offsets
 * change only a few times a year, so each year is worked out once: the
 * offset at the start of every month, and where two months differ, a binary
 * search (to the minute) for the instant of the change.
 */
function spansForYear(timeZone: string, year: number): OffsetSpan[] {
  const key = `${timeZone}|${year}`;
  const cached = YEAR_SPANS.get(key);
  if (cached) return cached;
  const spans: OffsetSpan[] = [];
  let previous = { at: Date.UTC(year, 0, 1), offset: measureZoneOffsetMs(timeZone, Date.UTC(year, 0, 1)) };
  spans.push({ startMs: previous.at, offsetMs: previous.offset });
  for (let month = 1; month <= 12; month++) {
    const at = Date.UTC(year, month, 1);
    const offset = measureZoneOffsetMs(timeZone, at);
    if (offset !== previous.offset) {
      // The change lies in (previous.at, at]: narrow it down to a minute.
      let low = previous.at;
      let high = at;
      while (high - low > MINUTE_MS) {
        const middle = low + Math.floor((high - low) / 2 / MINUTE_MS) * MINUTE_MS;
        if (measureZoneOffsetMs(timeZone, middle) === previous.offset) low = middle;
        else high = middle;
      }
      spans.push({ startMs: high, offsetMs: measureZoneOffsetMs(timeZone, high) });
      if (spans.at(-1)!.offsetMs !== offset) spans.push({ startMs: at, offsetMs: offset });
    }
    previous = { at, offset };
  }
  if (YEAR_SPANS.size >= MAX_CACHED_YEARS) YEAR_SPANS.clear();
  YEAR_SPANS.set(key, spans);
  return spans;
}

// The year last looked up: a logbook's lines come in runs from one year.
let recentYear: { timeZone: string; startMs: number; endMs: number; spans: OffsetSpan[] } | null = null;

function zoneOffsetMs(timeZone: string, utcMs: number): number {
  let spans: OffsetSpan[];
  if (
    recentYear &&
    recentYear.timeZone === timeZone &&
    utcMs >= recentYear.startMs &&
    utcMs < recentYear.endMs
  ) {
    spans = recentYear.spans;
  } else {
    const year = new Date(utcMs).getUTCFullYear();
    spans = spansForYear(timeZone, year);
    recentYear = { timeZone, startMs: Date.UTC(year, 0, 1), endMs: Date.UTC(year + 1, 0, 1), spans };
  }
  let offset = spans[0]!.offsetMs;
  for (const span of spans) {
    if (span.startMs <= utcMs) offset = span.offsetMs;
    else break;
  }
  return offset;
}

export function isValidTimeZone(timeZone: string): boolean {
  if (timeZone === "UTC") return true;
  try {
    formatterFor(timeZone);
    return true;
  } catch {
    return false;
  }
}

/**
 * The UT instant of a wall-clock time in a zone. Two passes settle the offset
 * on either side of a daylight-saving change; a time that falls in the
 * spring-forward gap moves forward by the gap, as clocks do.
 */
export function zonedTimeToUtc({
  date,
  time,
  timeZone,
}: {
  date: DateParts;
  time: TimeParts;
  timeZone: string;
}): Date {
  const wallAsUtc = Date.UTC(date.year, date.month - 1, date.day, time.hour, time.minute, time.second);
  if (timeZone === "UTC" || timeZone === "Etc/UTC") return new Date(wallAsUtc);
  const first = zoneOffsetMs(timeZone, wallAsUtc);
  let instant = wallAsUtc - first;
  const second = zoneOffsetMs(timeZone, instant);
  if (second !== first) instant = wallAsUtc - second;
  return new Date(instant);
}

export type ParsedWhen = { ok: true; at: Date } | { ok: false; reason: string };

/**
 * Reads a date cell (and an optional time cell) in the chosen format. A time
 * written in the date cell ("2024-03-17 09:30") is honoured; otherwise the
 * time cell, otherwise `defaultTime`.
 */
export function parseObservationTime({
  dateText,
  timeText,
  format,
  timeZone,
  defaultTime,
}: {
  dateText: string;
  timeText?: string;
  format: DateFormatId;
  timeZone: string;
  defaultTime: string;
}): ParsedWhen {
  const raw = dateText.trim();
  if (!raw) return { ok: false, reason: "The date is missing." };

  if (format === "iso-datetime") {
    const m = ISO_DATETIME.exec(raw);
    const date = m ? { year: Number(m[1]), month: Number(m[2]), day: Number(m[3]) } : null;
    if (!m || !date || !isCalendarDate(date)) {
      return { ok: false, reason: `"${raw}" is not a date-time like 2024-03-17T09:30:00Z.` };
    }
    let time: TimeParts | null =
      m[4] === undefined ? null : { hour: Number(m[4]), minute: Number(m[5]), second: Number(m[6] ?? 0) };
    if (time && (time.hour > 23 || time.minute > 59 || time.second > 59)) {
      return { ok: false, reason: `"${raw}" has an impossible time of day.` };
    }
    time ??= pickTime({ timeText, defaultTime });
    if (!time) return { ok: false, reason: `The time "${timeText ?? ""}" is not a time like 09:30.` };
    const zone = m[7];
    if (zone) {
      const offsetMinutes = zone.toUpperCase() === "Z" ? 0 : parseOffsetMinutes(zone);
      const wall = Date.UTC(date.year, date.month - 1, date.day, time.hour, time.minute, time.second);
      return { ok: true, at: new Date(wall - offsetMinutes * 60_000) };
    }
    return { ok: true, at: zonedTimeToUtc({ date, time, timeZone }) };
  }

  // "17/03/2024 09:30": split a trailing time off the date.
  const [datePart = "", inlineTime] = raw.split(/\s+|T/, 2);
  const date = parseDatePart(datePart, format);
  if (!date) {
    const example = DATE_FORMATS.find((f) => f.id === format)?.example ?? "";
    return { ok: false, reason: `"${raw}" is not a date in the chosen format (like ${example}).` };
  }
  const time = inlineTime ? parseTimeText(inlineTime) : pickTime({ timeText, defaultTime });
  if (!time)
    return { ok: false, reason: `The time "${inlineTime ?? timeText ?? ""}" is not a time like 09:30.` };
  return { ok: true, at: zonedTimeToUtc({ date, time, timeZone }) };
}

function pickTime({ timeText, defaultTime }: { timeText?: string; defaultTime: string }): TimeParts | null {
  if (timeText !== undefined && timeText.trim() !== "") return parseTimeText(timeText);
  return parseTimeText(defaultTime);
}

function parseOffsetMinutes(zone: string): number {
  const m = /^([+-])(\d{2}):?(\d{2})$/.exec(zone);
  if (!m) return 0;
  const minutes = Number(m[2]) * 60 + Number(m[3]);
  return m[1] === "-" ? -minutes : minutes;
}

/** The date formats under which every sample reads as a real calendar date. */
export function detectDateFormats(samples: string[]): DateFormatId[] {
  const values = samples.map((s) => s.trim()).filter(Boolean);
  if (values.length === 0) return [];
  return DATE_FORMAT_IDS.filter((format) =>
    values.every(
      (value) =>
        parseObservationTime({ dateText: value, format, timeZone: "UTC", defaultTime: "12:00" }).ok &&
        // A bare date also matches the ISO reader; only offer that when times are written.
        (format !== "iso-datetime" || /[T ]\d{1,2}:\d{2}/.test(value)),
    ),
  );
}
