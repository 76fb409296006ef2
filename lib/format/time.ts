/** Formatting helpers shared by server and client. Times are stored in UT. */

export function formatUt(at: Date | string | number): string {
  const d = new Date(at);
  return `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 16)} UT`;
}

export function formatLocal(at: Date | string | number, timeZone: string): string {
  try {
    return new Intl.DateTimeFormat("en-GB", {
      timeZone,
      dateStyle: "medium",
      timeStyle: "short",
    }).format(new Date(at));
  } catch {
    return "";
  }
}

export function formatRelativeNumber(value: number): string {
  return value.toFixed(1);
}

/** "YYYY-MM-DD" and "HH:MM" in UT for an instant, as date and time inputs want them. */
export function toUtInputs(at: Date): { date: string; time: string } {
  const iso = at.toISOString();
  return { date: iso.slice(0, 10), time: iso.slice(11, 16) };
}

/** Joins date and time inputs (taken as UT) into an ISO instant, or "" when incomplete. */
export function fromUtInputs(date: string, time: string): string {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(date) || !/^\d{2}:\d{2}$/.test(time)) return "";
  return `${date}T${time}:00Z`;
}
