import { SESSION_STATE_LABELS, type SessionState } from "@/lib/classrooms/session-state";

const TONES: Record<SessionState, string> = {
  open: "bg-meadow-50 text-meadow-700",
  upcoming: "bg-corona-100 text-corona-800",
  closed: "bg-ink-100 text-ink-700",
};

export function SessionStateBadge({ state }: { state: SessionState }) {
  return (
    <span className={`rounded-full px-2 py-0.5 text-xs font-medium whitespace-nowrap ${TONES[state]}`}>
      {SESSION_STATE_LABELS[state]}
    </span>
  );
}
