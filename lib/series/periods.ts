/**
 * Calendar periods of the network series and of k: UT days, months
 * ("YYYY-MM"), quarters and years. Days travel as "YYYY-MM-DD" text or as
 * day numbers (days since 1970-01-01, see lib/counts/series.ts).
 */

import {
  formatDayNumber,
  splitDayNumber,
  splitMonthIndex,
  toDayNumber,
  toMonthIndex,
} from "@/lib/counts/series";

export const K_PERIOD_KINDS = ["quarter", "year"] as const;
/** How long a span one k is fitted over; the coordinator chooses. */
export type KPeriodKind = (typeof K_PERIOD_KINDS)[number];

export type KPeriod = { index: number; kind: KPeriodKind; start: string; end: string; label: string };

/** Periods counted from year 0 (year·4 + quarter − 1, or the year), so consecutive periods differ by 1. */
export function findPeriodIndex({ day, kind }: { day: string | number; kind: KPeriodKind }): number {
  const { year, month } = splitDayNumber(toDayNumber(day));
  return kind === "year" ? year : year * 4 + Math.floor((month - 1) / 3);
}

export function describePeriod({ index, kind }: { index: number; kind: KPeriodKind }): KPeriod {
  if (kind === "year") {
    const year = String(index).padStart(4, "0");
    return { index, kind, start: `${year}-01-01`, end: `${year}-12-31`, label: year };
  }
  const year = Math.floor(index / 4);
  const quarter = index - year * 4;
  const firstMonth = quarter * 3 + 1;
  const start = `${String(year).padStart(4, "0")}-${String(firstMonth).padStart(2, "0")}-01`;
  // The day before the next quarter starts: no month-length table needed.
  const nextQuarterStart = toDayNumber(
    quarter === 3
      ? `${String(year + 1).padStart(4, "0")}-01-01`
      : `${String(year).padStart(4, "0")}-${String(firstMonth + 3).padStart(2, "0")}-01`,
  );
  return { index, kind, start, end: formatDayNumber(nextQuarterStart - 1), label: `${year} Q${quarter + 1}` };
}

/** Which period a stored k covers, from its start day. */
export function describePeriodOfDay({ day, kind }: { day: string; kind: KPeriodKind }): KPeriod {
  return describePeriod({ index: findPeriodIndex({ day, kind }), kind });
}

const MONTH_PATTERN = /^(\d{4})-(0[1-9]|1[0-2])$/;

/** "YYYY-MM" → month index (year·12 + month − 1); null when the text is not a month. */
export function parseMonth(month: string): number | null {
  const match = MONTH_PATTERN.exec(month);
  if (!match) return null;
  return toMonthIndex({ year: Number(match[1]), month: Number(match[2]) });
}

export function formatMonth(monthIndex: number): string {
  const { year, month } = splitMonthIndex(monthIndex);
  return `${String(year).padStart(4, "0")}-${String(month).padStart(2, "0")}`;
}

/** The month ("YYYY-MM") a UT day belongs to. */
export function monthOfDay(day: string): string {
  return day.slice(0, 7);
}

/** First and last UT day of a month, as "YYYY-MM-DD". */
export function describeMonthDays(monthIndex: number): { first: string; last: string } {
  const first = `${formatMonth(monthIndex)}-01`;
  const last = formatDayNumber(toDayNumber(`${formatMonth(monthIndex + 1)}-01`) - 1);
  return { first, last };
}

/** Every UT day of a month. */
export function listMonthDays(monthIndex: number): string[] {
  const { first, last } = describeMonthDays(monthIndex);
  const days: string[] = [];
  for (let d = toDayNumber(first); d <= toDayNumber(last); d++) days.push(formatDayNumber(d));
  return days;
}
