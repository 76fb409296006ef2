/**
 * One logbook line → one observation, checked by the same schema as the
 * Logbook form and the API, so an imported count obeys exactly the same
 * rules (whole numbers, s ≥ g, no spots without groups, hemispheres adding
 * up, no future dates). Used for the browser preview and the server import.
 */
import {
  EARLIEST_OBSERVATION,
  FUTURE_TOLERANCE_MS,
  MAX_GROUPS,
  MAX_SPOTS,
  makeObservationInputSchema,
  type ObservationInput,
} from "@/lib/validation/observation";
import type { ImportOptions } from "@/lib/validation/import";

import { IMPORT_FIELDS, type ImportField } from "./columns";
import { parseObservationTime } from "./dates";

export type RowProblem = { line: number; field?: ImportField; value?: string; reason: string };
export type InstrumentRef = { id: string; name: string };
export type ConvertResult = { ok: true; input: ObservationInput } | { ok: false; problems: RowProblem[] };

const FIELD_BY_PATH: Record<string, ImportField> = {
  observedAt: "date",
  seeing: "seeing",
  instrumentId: "instrument",
  groups: "groups",
  spots: "spots",
  northGroups: "northGroups",
  northSpots: "northSpots",
  southGroups: "southGroups",
  southSpots: "southSpots",
  notes: "notes",
};

// Stand-ins that let the rest of a line be checked when its date or
// instrument is already known to be wrong, so the report lists every problem.
const PLACEHOLDER_TIME = "2000-01-01T12:00:00Z";
const PLACEHOLDER_INSTRUMENT = "unknown-instrument";

export function makeRowConverter({
  options,
  instruments,
  now = new Date(),
}: {
  options: ImportOptions;
  instruments: InstrumentRef[];
  now?: Date;
}) {
  const schema = makeObservationInputSchema({ now: () => now });
  const byKey = new Map<string, string>();
  for (const instrument of instruments) {
    byKey.set(instrument.name.trim().toLowerCase(), instrument.id);
    byKey.set(instrument.id.toLowerCase(), instrument.id);
  }
  const indexOf = Object.fromEntries(
    IMPORT_FIELDS.map((f) => [f, options[f] === undefined ? -1 : (options[f] as number) - 1]),
  ) as Record<ImportField, number>;
  const knownNames = instruments
    .map((i) => i.name)
    .slice(0, 4)
    .join(", ");

  // Defined once rather than as a closure over each record: the converter
  // runs for every line of a 100,000-line import.
  const cell = (record: string[], field: ImportField): string => {
    const i = indexOf[field];
    return i < 0 ? "" : (record[i] ?? "").trim();
  };

  return function convertRecord(record: string[], line: number): ConvertResult {
    const problems: RowProblem[] = [];

    const dateText = cell(record, "date");
    const when = parseObservationTime({
      dateText,
      timeText: indexOf.time < 0 ? undefined : cell(record, "time"),
      format: options.dateFormat,
      timeZone: options.timeZone,
      defaultTime: options.defaultTime,
    });
    if (!when.ok) {
      const timeAtFault = when.reason.startsWith("The time") && indexOf.time >= 0;
      problems.push({
        line,
        field: timeAtFault ? "time" : "date",
        value: timeAtFault ? cell(record, "time") : dateText,
        reason: when.reason,
      });
    }

    let instrumentId = options.instrumentId;
    if (indexOf.instrument >= 0) {
      const named = cell(record, "instrument");
      if (named) {
        const found = byKey.get(named.toLowerCase());
        if (found) instrumentId = found;
        else {
          problems.push({
            line,
            field: "instrument",
            value: named,
            reason: `Unknown instrument “${named}”: it is not one of your instruments${knownNames ? ` (${knownNames})` : ""}.`,
          });
          instrumentId = PLACEHOLDER_INSTRUMENT;
        }
      }
    }
    if (!instrumentId) {
      problems.push({ line, field: "instrument", value: "", reason: "No instrument is given on this line." });
      instrumentId = PLACEHOLDER_INSTRUMENT;
    }

    const seeingText = cell(record, "seeing");
    const seeing =
      seeingText === "" && options.defaultSeeing !== undefined ? options.defaultSeeing : seeingText;
    if (problems.length === 0 && when.ok) {
      const quick = acceptWellFormedRow({
        at: when.at,
        seeing,
        instrumentId,
        groups: cell(record, "groups"),
        spots: cell(record, "spots"),
        northGroups: cell(record, "northGroups"),
        northSpots: cell(record, "northSpots"),
        southGroups: cell(record, "southGroups"),
        southSpots: cell(record, "southSpots"),
        notes: cell(record, "notes"),
        nowMs: now.getTime(),
      });
      if (quick) return { ok: true, input: quick };
    }
    const draft = {
      observedAt: when.ok ? when.at.toISOString() : PLACEHOLDER_TIME,
      seeing,
      instrumentId,
      groups: cell(record, "groups"),
      spots: cell(record, "spots"),
      northGroups: cell(record, "northGroups"),
      northSpots: cell(record, "northSpots"),
      southGroups: cell(record, "southGroups"),
      southSpots: cell(record, "southSpots"),
      notes: cell(record, "notes"),
    };
    const parsed = schema.safeParse(draft);
    if (!parsed.success) {
      const seen = new Set<string>();
      for (const issue of parsed.error.issues) {
        const field = FIELD_BY_PATH[String(issue.path[0] ?? "")];
        const key = `${field}:${issue.message}`;
        if (seen.has(key)) continue;
        seen.add(key);
        problems.push({ line, field, value: field ? cell(record, field) : undefined, reason: issue.message });
      }
    }
    if (problems.length > 0 || !parsed.success) return { ok: false, problems };
    return { ok: true, input: parsed.data };
  };
}

/**
 * The observation schema's rules, hand-written for the common case of a good
 * line: zod costs a tenth of a large import's time. It only ever accepts:
 * anything doubtful returns null and the schema itself decides and words the
 * message, so a line accepted here is one the schema accepts with the same
 * values (tests/unit/import/convert-row.test.ts checks that on many lines).
 * Cells arrive trimmed.
 */
export function acceptWellFormedRow({
  at,
  seeing,
  instrumentId,
  groups,
  spots,
  northGroups,
  northSpots,
  southGroups,
  southSpots,
  notes,
  nowMs,
}: {
  at: Date;
  seeing: string | number;
  instrumentId: string;
  groups: string;
  spots: string;
  northGroups: string;
  northSpots: string;
  southGroups: string;
  southSpots: string;
  notes: string;
  nowMs: number;
}): ObservationInput | null {
  const atMs = at.getTime();
  // Between 1610 and now, so also a four-digit-year ISO instant.
  if (!(atMs <= nowMs + FUTURE_TOLERANCE_MS && atMs >= EARLIEST_OBSERVATION.getTime())) return null;
  const id = instrumentId.trim();
  if (id.length < 1 || id.length > 64) return null;
  if (notes.length > 2000) return null;
  const seeingValue = typeof seeing === "number" ? seeing : seeing === "" ? Number.NaN : Number(seeing);
  if (!isWholeWithin(seeingValue, 1, 5)) return null;
  const g = Number(groups);
  const s = Number(spots);
  if (groups === "" || spots === "" || !isWholeWithin(g, 0, MAX_GROUPS) || !isWholeWithin(s, 0, MAX_SPOTS))
    return null;
  if (!isCountPair(g, s)) return null;
  const input: ObservationInput = {
    observedAt: new Date(atMs),
    seeing: seeingValue,
    instrumentId: id,
    groups: g,
    spots: s,
  };
  const given = +(northGroups !== "") + +(northSpots !== "") + +(southGroups !== "") + +(southSpots !== "");
  if (given === 4) {
    const nG = Number(northGroups);
    const nS = Number(northSpots);
    const sG = Number(southGroups);
    const sS = Number(southSpots);
    if (
      !isWholeWithin(nG, 0, MAX_GROUPS) ||
      !isWholeWithin(nS, 0, MAX_SPOTS) ||
      !isWholeWithin(sG, 0, MAX_GROUPS) ||
      !isWholeWithin(sS, 0, MAX_SPOTS) ||
      !isCountPair(nG, nS) ||
      !isCountPair(sG, sS) ||
      nG + sG !== g ||
      nS + sS !== s
    )
      return null;
    input.northGroups = nG;
    input.northSpots = nS;
    input.southGroups = sG;
    input.southSpots = sS;
  } else if (given !== 0) return null;
  if (notes !== "") input.notes = notes;
  return input;
}

function isWholeWithin(value: number, min: number, max: number): boolean {
  return Number.isInteger(value) && value >= min && value <= max;
}

/** No spots without a group, and at least one spot per group. */
function isCountPair(groups: number, spots: number): boolean {
  return !(groups === 0 && spots > 0) && spots >= groups;
}
