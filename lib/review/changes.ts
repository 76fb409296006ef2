/**
 * A one-line summary of what an observer changed when sending a count back,
 * kept as the note of the "resubmitted" line in the audit trail so the
 * coordinator sees the answer to their question without comparing by eye.
 */
export type RevisableValues = {
  observedAt: Date;
  instrumentId: string;
  seeing: number;
  groups: number;
  spots: number;
  northGroups: number | null;
  northSpots: number | null;
  southGroups: number | null;
  southSpots: number | null;
  notes: string | null;
};

const LABELS: Array<[keyof RevisableValues, string]> = [
  ["observedAt", "time"],
  ["instrumentId", "instrument"],
  ["seeing", "seeing"],
  ["groups", "g"],
  ["spots", "s"],
  ["northGroups", "north g"],
  ["northSpots", "north s"],
  ["southGroups", "south g"],
  ["southSpots", "south s"],
  ["notes", "notes"],
];

function show(key: keyof RevisableValues, value: RevisableValues[keyof RevisableValues]): string {
  if (value === null) return "—";
  if (value instanceof Date) return `${value.toISOString().slice(0, 16).replace("T", " ")} UT`;
  if (key === "notes") return `"${String(value)}"`;
  return String(value);
}

export function describeRevision({
  before,
  after,
}: {
  before: RevisableValues;
  after: RevisableValues;
}): string {
  const changes: string[] = [];
  for (const [key, label] of LABELS) {
    const a = before[key];
    const b = after[key];
    const same = a instanceof Date && b instanceof Date ? a.getTime() === b.getTime() : a === b;
    if (same) continue;
    // The instrument's id means nothing to a reader; say only that it changed.
    changes.push(
      key === "instrumentId" ? "instrument changed" : `${label} ${show(key, a)} → ${show(key, b)}`,
    );
  }
  return changes.length === 0 ? "Sent back without changes." : `Changed: ${changes.join("; ")}`;
}
