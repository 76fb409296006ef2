/**
 * One accepted count as one integer, for the full recompute's read. The
 * database keeps this value in an index (observations_accepted_packed_idx,
 * an index on an expression), and the recompute reads each instrument's
 * counts as one string of these values, concatenated with no separator.
 *
 * The value has exactly 18 decimal digits, read by position:
 *
 *   DDDDDD RRRR NNNN SSSS
 *
 *   DDDDDD  the UT day as days since 1970-01-01, plus DAY_OFFSET
 *   RRRR    10g + s
 *   NNNN    10gN + sN + 1, or 0 when the count has no north/south split
 *   SSSS    10gS + sS + 1, or 0 likewise
 *
 * Fixed widths make the string cheap to read (no separators, no parsing of
 * variable-length numbers), and one integer per count is the cheapest thing
 * SQLite can turn into text: the earlier "YYYY-MM-DD raw north south" text,
 * built with five concatenations per row, took three times as long to make
 * (measured in tests/bench/series.bench.ts).
 *
 * The widths hold every count the validation allows: 10 × MAX_GROUPS +
 * MAX_SPOTS + 1 is far below 10,000 (a test checks it), and every day from
 * the earliest allowed observation (1610) to the year 3800 fits in six
 * digits. A row that could not be packed (a malformed day) makes the string
 * shorter than 18 digits per count, and the reader refuses it.
 *
 * Imported with a relative path by db/schema.ts, so drizzle-kit can read it.
 */

/** Added to the day number so every allowed day has six digits (1610 → 168,497). */
export const PACKED_DAY_OFFSET = 300_000;
/** Digits per packed count. */
export const PACKED_WIDTH = 18;
/** The largest 10g + s (plus one) a four-digit field holds. */
export const PACKED_FIELD_LIMIT = 9_999;

const SPLIT_MISSING =
  "north_groups IS NULL OR north_spots IS NULL OR south_groups IS NULL OR south_spots IS NULL";

/**
 * The SQL expression of the packed value, over the columns of
 * `observations`. The index is built on exactly this text and the recompute
 * selects exactly this text, which is how SQLite knows to read the value
 * from the index instead of computing it from the table.
 */
export const PACKED_COUNT_SQL =
  `((CAST(julianday(ut_date) - 2440587.5 AS INTEGER) + ${PACKED_DAY_OFFSET}) * 1000000000000` +
  ` + (10 * groups + spots) * 100000000` +
  ` + CASE WHEN ${SPLIT_MISSING} THEN 0` +
  ` ELSE (10 * north_groups + north_spots + 1) * 10000 + 10 * south_groups + south_spots + 1 END)`;
