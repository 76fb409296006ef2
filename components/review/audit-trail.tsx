import type { ReviewAction } from "@/db/schema";
import { ROLE_LABELS, type Role } from "@/lib/auth/roles";
import { formatUt } from "@/lib/format/time";
import { REVIEW_ACTION_WORDS } from "@/lib/review/action-labels";

export type AuditEntry = {
  id: string;
  action: ReviewAction;
  note: string | null;
  createdAt: Date;
  actorName: string | null;
  actorRole: Role;
};

/**
 * The audit trail of one observation, oldest first, starting from its
 * arrival. Shown to the coordinator and, with `viewer="observer"`, to the
 * observer, who sees their own lines as "You".
 */
export function AuditTrail({
  decisions,
  receivedAt,
  viewer = "coordinator",
}: {
  decisions: AuditEntry[];
  receivedAt: Date;
  viewer?: "coordinator" | "observer";
}) {
  return (
    <section
      aria-labelledby="audit-heading"
      className="self-start rounded-lg border border-ink-100 bg-white p-5"
    >
      <h2 id="audit-heading" className="font-semibold text-ink-900">
        {viewer === "coordinator" ? "Decision history" : "Review history"}
      </h2>
      <ol className="mt-3 flex flex-col gap-3 border-l-2 border-ink-100 pl-4 text-sm">
        <li>
          <p className="text-ink-800">Received</p>
          <p className="text-xs text-ink-500">{formatUt(receivedAt)}</p>
        </li>
        {decisions.map((d) => {
          const byObserver = d.action === "resubmitted";
          const who =
            viewer === "observer"
              ? byObserver
                ? "You"
                : `${ROLE_LABELS[d.actorRole]}`
              : `${d.actorName ?? "Unknown"} (${ROLE_LABELS[d.actorRole]})`;
          return (
            <li key={d.id} data-testid="audit-entry">
              <p className="font-medium text-ink-900">{REVIEW_ACTION_WORDS[d.action]}</p>
              <p className="text-xs text-ink-500">
                {formatUt(d.createdAt)} · {who}
              </p>
              {d.note ? (
                <p className="mt-1 rounded bg-ink-50 px-2 py-1 whitespace-pre-line text-ink-800">{d.note}</p>
              ) : null}
            </li>
          );
        })}
      </ol>
      {decisions.length === 0 ? <p className="mt-3 text-xs text-ink-500">No decision yet.</p> : null}
    </section>
  );
}
