/**
 * One logbook line → one observation, checked by the same schema as the
 * Logbook form and the API, so an imported count obeys exactly the same
 * rules (whole numbers, s ≥ g, no spots without groups, hemispheres adding
 * up, no future dates). Used for the browser preview and the server import.
 */
import { makeObservationInputSchema, type ObservationInput } from "@/lib/validation/observation";
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

  return function convertRecord(record: string[], line: number): ConvertResult {
    const cell = (field: ImportField): string => {
      const i = indexOf[field];
      return i < 0 ? "" : (record[i] ?? "").trim();
    };
    const problems: RowProblem[] = [];

    const dateText = cell("date");
    const when = parseObservationTime({
      dateText,
      timeText: indexOf.time < 0 ? undefined : cell("time"),
      format: options.dateFormat,
      timeZone: options.timeZone,
      defaultTime: options.defaultTime,
    });
    if (!when.ok) {
      const timeAtFault = when.reason.startsWith("The time") && indexOf.time >= 0;
      problems.push({
        line,
        field: timeAtFault ? "time" : "date",
        value: timeAtFault ? cell("time") : dateText,
        reason: when.reason,
      });
    }

    let instrumentId = options.instrumentId;
    if (indexOf.instrument >= 0) {
      const named = cell("instrument");
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

    const seeingText = cell("seeing");
    const draft = {
      observedAt: when.ok ? when.at.toISOString() : PLACEHOLDER_TIME,
      seeing: seeingText === "" && options.defaultSeeing !== undefined ? options.defaultSeeing : seeingText,
      instrumentId,
      groups: cell("groups"),
      spots: cell("spots"),
      northGroups: cell("northGroups"),
      northSpots: cell("northSpots"),
      southGroups: cell("southGroups"),
      southSpots: cell("southSpots"),
      notes: cell("notes"),
    };
    const parsed = schema.safeParse(draft);
    if (!parsed.success) {
      const seen = new Set<string>();
      for (const issue of parsed.error.issues) {
        const field = FIELD_BY_PATH[String(issue.path[0] ?? "")];
        const key = `${field}:${issue.message}`;
        if (seen.has(key)) continue;
        seen.add(key);
        problems.push({ line, field, value: field ? cell(field) : undefined, reason: issue.message });
      }
    }
    if (problems.length > 0 || !parsed.success) return { ok: false, problems };
    return { ok: true, input: parsed.data };
  };
}
