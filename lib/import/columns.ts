/**
 * What a logbook column can hold, and the header names people commonly give
 * it. Names are compared with case, spaces and punctuation removed, so
 * "Groups (N)", "groups_n" and "GROUPSN" are the same.
 */

export const IMPORT_FIELDS = [
  "date",
  "time",
  "groups",
  "spots",
  "northGroups",
  "northSpots",
  "southGroups",
  "southSpots",
  "seeing",
  "instrument",
  "notes",
] as const;
export type ImportField = (typeof IMPORT_FIELDS)[number];

export const HEMISPHERE_FIELDS = ["northGroups", "northSpots", "southGroups", "southSpots"] as const;

export const FIELD_LABELS: Record<ImportField, string> = {
  date: "Date (or date and time)",
  time: "Time",
  groups: "Groups g",
  spots: "Spots s",
  northGroups: "Northern groups",
  northSpots: "Northern spots",
  southGroups: "Southern groups",
  southSpots: "Southern spots",
  seeing: "Seeing (1–5)",
  instrument: "Instrument",
  notes: "Notes",
};

/** Header names by field, most specific first. */
const HEADER_NAMES: Record<ImportField, string[]> = {
  date: [
    "observedatut",
    "observedat",
    "datetimeut",
    "datetime",
    "timestamp",
    "utdate",
    "dateut",
    "date",
    "obsdate",
    "observationdate",
    "day",
    "datum",
    "fecha",
    "data",
  ],
  time: ["timeut", "uttime", "time", "ut", "hour", "heure", "zeit", "hora", "ora"],
  groups: ["g", "groups", "group", "grp", "groupcount", "numberofgroups", "gruppen", "groupes", "grupos"],
  spots: [
    "s",
    "spots",
    "spot",
    "f",
    "sunspots",
    "spotcount",
    "numberofspots",
    "flecken",
    "taches",
    "manchas",
  ],
  northGroups: ["gn", "gnorth", "northg", "northgroups", "groupsnorth", "groupsn", "ng"],
  northSpots: ["sn", "snorth", "norths", "northspots", "spotsnorth", "spotsn", "ns"],
  southGroups: ["gs", "gsouth", "southg", "southgroups", "groupssouth", "groupss", "sg"],
  southSpots: ["ss", "ssouth", "souths", "southspots", "spotssouth", "spotss"],
  seeing: ["seeing", "q", "quality", "seeingq", "conditions", "sky"],
  instrument: ["instrument", "instrumentname", "instr", "telescope", "scope", "equipment", "setup"],
  notes: [
    "notes",
    "note",
    "remarks",
    "remark",
    "comments",
    "comment",
    "memo",
    "bemerkung",
    "bemerkungen",
    "remarques",
    "observaciones",
    "note1",
  ],
};

/** Columns that some logbooks carry but Heliotally computes itself. */
const COMPUTED_NAMES = [
  "r",
  "wolf",
  "wolfnumber",
  "relativenumber",
  "rn",
  "k",
  "kcoefficient",
  "10gs",
  "status",
  "source",
];

export function normaliseHeader(text: string): string {
  return text
    .normalize("NFKD")
    .toLowerCase()
    .replace(/[^a-z0-9]/g, "");
}

export type HeaderMatch = { field: ImportField; rank: number } | { field: "computed"; rank: number } | null;

/** The field a header names, with how specific the match was (lower is better). */
export function matchHeader(text: string): HeaderMatch {
  const name = normaliseHeader(text);
  if (!name) return null;
  for (const field of IMPORT_FIELDS) {
    const rank = HEADER_NAMES[field].indexOf(name);
    if (rank >= 0) return { field, rank };
  }
  if (COMPUTED_NAMES.includes(name)) return { field: "computed", rank: 0 };
  return null;
}
