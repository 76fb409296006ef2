/**
 * UTC → TT for the solar ephemeris. A JavaScript Date is a UTC timestamp
 * (POSIX: leap seconds are not counted), while the Sun's rotation and the
 * planetary theory run on Terrestrial Time.
 *
 * - From 1972 on, TT − UTC = 32.184 s + TAI − UTC, from the leap-second table
 *   (exact, not an estimate).
 * - After the last entry the table is held constant: no leap second has been
 *   inserted since 2017 and the CGPM (2022, resolution 4) decided to stop
 *   inserting them by 2035, so a frozen offset is a better forecast for future
 *   UTC instants than an extrapolated ΔT (which grows to ~200 s by 2100 and
 *   would move L0 by ~0.02°).
 * - Before 1972 civil time followed the Earth's rotation, so TT − UTC is taken
 *   as ΔT = TT − UT1 from astronomy-engine (Espenak & Meeus polynomials).
 *   At the 1972 seam both give ~42.2 s, so there is no visible jump.
 */
import { AstroTime, DeltaT_EspenakMeeus } from "astronomy-engine";

const MS_PER_DAY = 86_400_000;
const SECONDS_PER_DAY = 86_400;
const TT_MINUS_TAI_SECONDS = 32.184;
/** Unix time (ms) of J2000.0 = 2000-01-01T12:00:00 on the UTC clock. */
const J2000_UNIX_MS = Date.UTC(2000, 0, 1, 12);
/** Julian date of J2000.0 (its TT reading). */
export const J2000_JULIAN_DATE = 2_451_545.0;

/** [start of validity (Unix ms), TAI − UTC in seconds], oldest first. */
const LEAP_SECONDS: ReadonlyArray<readonly [number, number]> = [
  [Date.UTC(1972, 0, 1), 10],
  [Date.UTC(1972, 6, 1), 11],
  [Date.UTC(1973, 0, 1), 12],
  [Date.UTC(1974, 0, 1), 13],
  [Date.UTC(1975, 0, 1), 14],
  [Date.UTC(1976, 0, 1), 15],
  [Date.UTC(1977, 0, 1), 16],
  [Date.UTC(1978, 0, 1), 17],
  [Date.UTC(1979, 0, 1), 18],
  [Date.UTC(1980, 0, 1), 19],
  [Date.UTC(1981, 6, 1), 20],
  [Date.UTC(1982, 6, 1), 21],
  [Date.UTC(1983, 6, 1), 22],
  [Date.UTC(1985, 6, 1), 23],
  [Date.UTC(1988, 0, 1), 24],
  [Date.UTC(1990, 0, 1), 25],
  [Date.UTC(1991, 0, 1), 26],
  [Date.UTC(1992, 6, 1), 27],
  [Date.UTC(1993, 6, 1), 28],
  [Date.UTC(1994, 6, 1), 29],
  [Date.UTC(1996, 0, 1), 30],
  [Date.UTC(1997, 6, 1), 31],
  [Date.UTC(1999, 0, 1), 32],
  [Date.UTC(2006, 0, 1), 33],
  [Date.UTC(2009, 0, 1), 34],
  [Date.UTC(2012, 6, 1), 35],
  [Date.UTC(2015, 6, 1), 36],
  [Date.UTC(2017, 0, 1), 37],
];

function assertValidDate(at: Date): void {
  if (!(at instanceof Date) || Number.isNaN(at.getTime())) {
    throw new RangeError("expected a valid Date");
  }
}

/** TT − UTC in seconds for a UTC instant (see the file comment for the three eras). */
export function getTtMinusUtcSeconds(at: Date): number {
  assertValidDate(at);
  const unixMs = at.getTime();
  const first = LEAP_SECONDS[0];
  if (first === undefined || unixMs < first[0]) {
    return DeltaT_EspenakMeeus((unixMs - J2000_UNIX_MS) / MS_PER_DAY);
  }
  let taiMinusUtc = first[1];
  for (const [startMs, seconds] of LEAP_SECONDS) {
    if (unixMs < startMs) break;
    taiMinusUtc = seconds;
  }
  return TT_MINUS_TAI_SECONDS + taiMinusUtc;
}

/** Days of TT since J2000.0 (JD 2451545.0 TT) for a UTC instant. */
export function toTerrestrialTimeDays(at: Date): number {
  return (at.getTime() - J2000_UNIX_MS) / MS_PER_DAY + getTtMinusUtcSeconds(at) / SECONDS_PER_DAY;
}

/** An astronomy-engine time whose `tt` is ours (its own UT → TT model is bypassed). */
export function toAstroTime(at: Date): AstroTime {
  return AstroTime.FromTerrestrialTime(toTerrestrialTimeDays(at));
}

/**
 * The UTC instant for a TT reading given as days since J2000.0, e.g. the
 * "0h TD" epochs of published examples. Two fixed-point steps settle it: the
 * offset is constant between leap seconds and changes by < 1 ms per day before 1972.
 */
export function fromTerrestrialTimeDays(ttDays: number): Date {
  let unixMs = J2000_UNIX_MS + ttDays * MS_PER_DAY;
  for (let step = 0; step < 3; step += 1) {
    const offsetSeconds = getTtMinusUtcSeconds(new Date(unixMs));
    unixMs = J2000_UNIX_MS + (ttDays - offsetSeconds / SECONDS_PER_DAY) * MS_PER_DAY;
  }
  return new Date(unixMs);
}

/** Convenience for fixed-epoch examples: a Julian date on the TT scale → UTC instant. */
export function fromTerrestrialJulianDate(julianDateTt: number): Date {
  return fromTerrestrialTimeDays(julianDateTt - J2000_JULIAN_DATE);
}
