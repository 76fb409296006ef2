/** Where a class session stands at a given moment. */
export type SessionState = "upcoming" | "open" | "closed";

export function describeSessionState({
  opensAt,
  closesAt,
  now,
}: {
  opensAt: Date;
  closesAt: Date;
  now: Date;
}): SessionState {
  if (now.getTime() < opensAt.getTime()) return "upcoming";
  if (now.getTime() > closesAt.getTime()) return "closed";
  return "open";
}

export const SESSION_STATE_LABELS: Record<SessionState, string> = {
  upcoming: "Not open yet",
  open: "Open for counts",
  closed: "Closed",
};

/** "2026-10-14, 10:00–11:00 UT" */
export function formatSessionWindow({
  day,
  opensAt,
  closesAt,
}: {
  day: string;
  opensAt: Date;
  closesAt: Date;
}): string {
  return `${day}, ${opensAt.toISOString().slice(11, 16)}–${closesAt.toISOString().slice(11, 16)} UT`;
}
