/**
 * Comparison statistics for a class that counts the same projected disk:
 * one session side by side, each student's personal k over a term (with the
 * class median as the reference), and classes compared with each other and
 * with the network. Pure functions, no I/O.
 *
 * The raw count is Wolf's 10g + s (R. Wolf, 1850s; Clette et al. 2014,
 * Space Science Reviews 186, 35–103) and k is fitted with the same
 * estimateK the network uses (A. H. Shapley 1949, PASP 61, 13).
 */
import { estimateK, type KEstimate, type KMethod } from "@/lib/counts/k-coefficient";
import { computeRawCount } from "@/lib/counts/relative-number";
import { computeMad, computeMedian } from "@/lib/counts/robust";

/**
 * Fewest sessions a class k is trusted from. The network asks for 20 common
 * days; a school term has about a dozen weekly sessions, so a class k is a
 * teaching value, shown with its uncertainty and this lower bar.
 */
export const CLASS_MIN_SESSIONS = 5;

/** How close to the final k the running k must stay to count as settled. */
export const SETTLE_TOLERANCE = 0.1;
/** The running k must have stayed close for at least this many sessions. */
export const SETTLE_RUN = 3;

// ---------------------------------------------------------------------------
// One session
// ---------------------------------------------------------------------------

export type StudentCount = { studentId: string; displayName: string; groups: number; spots: number };

export type SessionComparisonRow = StudentCount & {
  /** 10g + s. */
  raw: number;
  /** raw − the class median of 10g + s. */
  differenceFromMedian: number;
  /** (raw − median) / median; null when the median is 0. */
  relativeDifference: number | null;
};

export type Spread = {
  min: number;
  max: number;
  range: number;
  lowerQuartile: number;
  upperQuartile: number;
  interquartileRange: number;
  /** Median absolute deviation scaled to estimate a standard deviation (lib/counts/robust.ts). */
  mad: number;
};

export type SessionComparison = {
  /** In the order given. */
  rows: SessionComparisonRow[];
  n: number;
  /** Medians of g, s and 10g + s taken separately; null when nobody counted. */
  median: { groups: number; spots: number; raw: number } | null;
  /** Spread of 10g + s; null when nobody counted. */
  spread: Spread | null;
  /**
   * The network's daily index for the session's day, when one exists, and
   * network / class median: the k that would put the class median on the
   * network's scale that day (null when the class median is 0).
   */
  network: { value: number; ratioToClassMedian: number | null } | null;
};

export function compareSessionCounts({
  counts,
  networkValue = null,
}: {
  counts: ReadonlyArray<StudentCount>;
  networkValue?: number | null;
}): SessionComparison {
  const raws = counts.map((c) => computeRawCount(c));
  const n = counts.length;
  const median =
    n === 0
      ? null
      : {
          groups: computeMedian(counts.map((c) => c.groups)),
          spots: computeMedian(counts.map((c) => c.spots)),
          raw: computeMedian(raws),
        };
  const rows = counts.map((c, i) => {
    const raw = raws[i] as number;
    const m = median?.raw ?? 0;
    return { ...c, raw, differenceFromMedian: raw - m, relativeDifference: m > 0 ? (raw - m) / m : null };
  });
  const network =
    networkValue === null || !Number.isFinite(networkValue)
      ? null
      : {
          value: networkValue,
          ratioToClassMedian: median && median.raw > 0 ? networkValue / median.raw : null,
        };
  return { rows, n, median, spread: n === 0 ? null : computeSpread(raws), network };
}

export function computeSpread(values: ReadonlyArray<number>): Spread {
  if (values.length === 0) throw new RangeError("computeSpread needs at least one value");
  const sorted = [...values].sort((a, b) => a - b);
  const min = sorted[0] as number;
  const max = sorted[sorted.length - 1] as number;
  const lowerQuartile = computeQuantile(sorted, 0.25);
  const upperQuartile = computeQuantile(sorted, 0.75);
  return {
    min,
    max,
    range: max - min,
    lowerQuartile,
    upperQuartile,
    interquartileRange: upperQuartile - lowerQuartile,
    mad: computeMad(sorted),
  };
}

/**
 * Quantile of sorted values by linear interpolation between order
 * statistics, h = (n − 1)p: definition 7 of R. J. Hyndman and Y. Fan 1996,
 * "Sample quantiles in statistical packages", The American Statistician 50,
 * 361 (from memory), the default of R and of numpy, so a teacher checking
 * the quartiles in a spreadsheet's QUARTILE.INC gets the same numbers.
 */
export function computeQuantile(sorted: ReadonlyArray<number>, p: number): number {
  if (sorted.length === 0) return Number.NaN;
  const h = (sorted.length - 1) * p;
  const lower = Math.floor(h);
  const upper = Math.ceil(h);
  const a = sorted[lower] as number;
  const b = sorted[upper] as number;
  return a + (h - lower) * (b - a);
}

// ---------------------------------------------------------------------------
// A term: each student's k against the class median
// ---------------------------------------------------------------------------

export type TermSessionCounts = {
  sessionId: string;
  /** UT day "YYYY-MM-DD". */
  day: string;
  counts: ReadonlyArray<{ studentId: string; raw: number }>;
};

export type SessionMedian = { sessionId: string; day: string; n: number; median: number | null };

export type KStep = {
  sessionCount: number;
  sessionId: string;
  day: string;
  k: number | null;
  sigma: number | null;
};

export type StudentTermK = {
  studentId: string;
  sessionsCounted: number;
  /** k over the whole term: reference = class median per session, raw = the student's 10g + s. */
  estimate: KEstimate;
  /** The running k after each of the student's sessions, oldest first: how it settles with experience. */
  settling: KStep[];
  /**
   * The number of sessions after which the running k stayed within
   * SETTLE_TOLERANCE of the term's k for good, provided that lasted at least
   * SETTLE_RUN sessions; null while it has not settled.
   */
  settledAfter: number | null;
};

export type TermComparison = { medians: SessionMedian[]; students: StudentTermK[] };

/** Sessions in time order; ties broken by id so the result never depends on input order. */
function sortSessions<T extends { day: string; sessionId: string }>(sessions: ReadonlyArray<T>): T[] {
  return [...sessions].sort((a, b) =>
    a.day === b.day ? a.sessionId.localeCompare(b.sessionId) : a.day.localeCompare(b.day),
  );
}

export function computeSessionMedians(sessions: ReadonlyArray<TermSessionCounts>): SessionMedian[] {
  return sortSessions(sessions).map((s) => ({
    sessionId: s.sessionId,
    day: s.day,
    n: s.counts.length,
    median: s.counts.length === 0 ? null : computeMedian(s.counts.map((c) => c.raw)),
  }));
}

/**
 * Every student's k against the class median, and how it settles.
 * The class median includes the student's own count, as a teacher would
 * work it out by hand; with a handful of students this pulls each k a
 * little towards 1, which the page says.
 */
export function computeTermKs({
  sessions,
  method = "ratio-of-sums",
  minSessions = CLASS_MIN_SESSIONS,
}: {
  sessions: ReadonlyArray<TermSessionCounts>;
  method?: KMethod;
  minSessions?: number;
}): TermComparison {
  const ordered = sortSessions(sessions);
  const medians = computeSessionMedians(ordered);
  const pairsByStudent = new Map<
    string,
    Array<{ sessionId: string; day: string; reference: number; raw: number }>
  >();
  ordered.forEach((session, i) => {
    const median = medians[i]?.median;
    if (median === null || median === undefined) return;
    for (const count of session.counts) {
      const list = pairsByStudent.get(count.studentId) ?? [];
      list.push({ sessionId: session.sessionId, day: session.day, reference: median, raw: count.raw });
      pairsByStudent.set(count.studentId, list);
    }
  });

  const students: StudentTermK[] = [];
  for (const [studentId, pairs] of pairsByStudent) {
    const estimate = estimateK(pairs, method, { minCommonDays: minSessions });
    const settling = pairs.map((pair, i) => {
      const running = estimateK(pairs.slice(0, i + 1), method, { minCommonDays: minSessions });
      return {
        sessionCount: i + 1,
        sessionId: pair.sessionId,
        day: pair.day,
        k: running.k,
        sigma: running.sigma,
      };
    });
    students.push({
      studentId,
      sessionsCounted: pairs.length,
      estimate,
      settling,
      settledAfter: findSettledAfter({ settling, finalK: estimate.k }),
    });
  }
  return { medians, students };
}

export function findSettledAfter({
  settling,
  finalK,
  tolerance = SETTLE_TOLERANCE,
  run = SETTLE_RUN,
}: {
  settling: ReadonlyArray<{ sessionCount: number; k: number | null }>;
  finalK: number | null;
  tolerance?: number;
  run?: number;
}): number | null {
  if (finalK === null || !(finalK > 0)) return null;
  let firstStable: number | null = null;
  for (let i = settling.length - 1; i >= 0; i--) {
    const step = settling[i] as { sessionCount: number; k: number | null };
    if (step.k === null || Math.abs(step.k / finalK - 1) > tolerance) break;
    firstStable = i;
  }
  if (firstStable === null || settling.length - firstStable < run) return null;
  return (settling[firstStable] as { sessionCount: number }).sessionCount;
}

// ---------------------------------------------------------------------------
// Classes against the network and against each other
// ---------------------------------------------------------------------------

/**
 * The class's own k: the network's daily index (reference) against the
 * class median 10g + s (raw) on session days where both exist.
 */
export function computeClassK({
  days,
  method = "ratio-of-sums",
  minSessions = CLASS_MIN_SESSIONS,
}: {
  days: ReadonlyArray<{ classMedian: number | null; networkValue: number | null }>;
  method?: KMethod;
  minSessions?: number;
}): KEstimate {
  const pairs = days.flatMap((d) =>
    d.classMedian === null || d.networkValue === null
      ? []
      : [{ reference: d.networkValue, raw: d.classMedian }],
  );
  return estimateK(pairs, method, { minCommonDays: minSessions });
}

export type ClassMedianSeries = { medians: ReadonlyArray<{ day: string; median: number | null }> };

/**
 * One row per session day across several classes, each class's median in
 * the order the classes were given (null where that class did not meet).
 * When a class met twice on one day, the later session in the list wins.
 */
export function alignClassMedians(
  classes: ReadonlyArray<ClassMedianSeries>,
): Array<{ day: string; values: Array<number | null> }> {
  const days = [...new Set(classes.flatMap((c) => c.medians.map((m) => m.day)))].sort();
  const lookups = classes.map((c) => new Map(c.medians.map((m) => [m.day, m.median])));
  return days.map((day) => ({ day, values: lookups.map((lookup) => lookup.get(day) ?? null) }));
}

// ---------------------------------------------------------------------------
// The term table (shown on screen, printed and exported as CSV)
// ---------------------------------------------------------------------------

export type TermTable = { header: string[]; rows: Array<Array<string | number | null>> };

export function buildTermTable({
  students,
  sessions,
  term,
}: {
  students: ReadonlyArray<{ studentId: string; displayName: string }>;
  sessions: ReadonlyArray<TermSessionCounts>;
  term: TermComparison;
}): TermTable {
  const ordered = sortSessions(sessions);
  const byStudent = new Map(term.students.map((s) => [s.studentId, s]));
  const header = [
    "Student",
    "Sessions counted",
    "k",
    "k uncertainty (±)",
    "Settled after (sessions)",
    ...ordered.map((s) => `${s.day} 10g+s`),
  ];
  const rows: TermTable["rows"] = students.map(({ studentId, displayName }) => {
    const result = byStudent.get(studentId);
    const counts = ordered.map((s) => s.counts.find((c) => c.studentId === studentId)?.raw ?? null);
    return [
      displayName,
      result?.sessionsCounted ?? 0,
      result?.estimate.k === null || result === undefined ? null : round(result.estimate.k, 3),
      result?.estimate.sigma == null ? null : round(result.estimate.sigma, 3),
      result?.settledAfter ?? null,
      ...counts,
    ];
  });
  rows.push(["Class median", null, null, null, null, ...term.medians.map((m) => m.median)]);
  return { header, rows };
}

function round(value: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(value * f) / f;
}

// ---------------------------------------------------------------------------
// How k settles with experience, for the class as a whole
// ---------------------------------------------------------------------------

export type SettlingSummary = {
  sessionCount: number;
  /** Students with at least this many sessions and a term k. */
  students: number;
  /** Median over those students of |running k / term k − 1|. */
  medianDeviation: number;
};

/**
 * After m sessions, how far is a typical student's running k from the k
 * they end the term with? One row per m, while at least two students have
 * that many sessions (one student alone says nothing about the class).
 */
export function summariseSettling(
  students: ReadonlyArray<Pick<StudentTermK, "settling" | "estimate">>,
): SettlingSummary[] {
  const out: SettlingSummary[] = [];
  const longest = Math.max(0, ...students.map((s) => s.settling.length));
  for (let m = 1; m <= longest; m++) {
    const deviations: number[] = [];
    for (const student of students) {
      const finalK = student.estimate.k;
      const step = student.settling[m - 1];
      if (finalK === null || !(finalK > 0) || !step || step.k === null) continue;
      deviations.push(Math.abs(step.k / finalK - 1));
    }
    if (deviations.length < 2) continue;
    out.push({ sessionCount: m, students: deviations.length, medianDeviation: computeMedian(deviations) });
  }
  return out;
}
