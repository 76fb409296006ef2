import "server-only";

import { applyReviewDecision, type DecidedObservation } from "@/db/queries/review";
import { refreshSeriesForDays } from "@/db/queries/series";
import { getEnv } from "@/lib/env";
import { AppError } from "@/lib/http/errors";
import { reviewDecisionMessage, reviewNoticeText, type ReviewMessageKind } from "@/lib/mail/review-messages";
import { sendMail } from "@/lib/mail/send";
import { changesSeries, REVIEW_TRANSITIONS } from "@/lib/review/transitions";
import type { ReviewDecisionInput } from "@/lib/validation/review";

export type DecisionResult = {
  action: ReviewDecisionInput["action"];
  status: string;
  decided: number;
  /** False when the stored series could not be brought up to date (a full recompute will). */
  seriesRefreshed: boolean;
  mail: { sent: number; failed: number };
};

const STATUS_WORDS = {
  submitted: "awaiting review",
  queried: "queried",
  accepted: "accepted",
  rejected: "rejected",
} as const;

function appUrl(path: string): string {
  const base = process.env.NEXTAUTH_URL ?? `http://localhost:${getEnv().PORT}`;
  return new URL(path, base).toString();
}

function messageKind(action: ReviewDecisionInput["action"]): ReviewMessageKind | null {
  return action === "query" ? "query" : action === "reject" ? "reject" : null;
}

/**
 * Takes one Review desk decision on one or many observations: all of them or
 * none (see applyReviewDecision), then refreshes the series for the days
 * whose accepted counts may have changed, then tells the observers.
 * Mail goes out after the commit: a slow or failing relay must neither hold
 * the write lock nor undo a decision the observer can already read in their
 * Logbook.
 */
export async function decideObservations({
  actorUserId,
  input,
}: {
  actorUserId: string;
  input: ReviewDecisionInput;
}): Promise<DecisionResult> {
  const kind = messageKind(input.action);
  const note = input.note ?? null;
  const outcome = await applyReviewDecision({
    actorUserId,
    action: input.action,
    observationIds: input.observationIds,
    note,
    notify: (row) =>
      kind && note
        ? {
            kind: `observation-${kind === "query" ? "queried" : "rejected"}`,
            message: reviewNoticeText({ kind, utDate: row.utDate, note }),
            link: `/logbook/${row.id}`,
          }
        : null,
  });

  if (!outcome.ok) {
    if ("missing" in outcome) {
      throw new AppError("not_found", "Some of these observations do not exist; nothing was changed.", {
        issues: outcome.missing.map((id) => ({
          path: "observationIds",
          message: `No observation with id ${id}.`,
        })),
      });
    }
    const allowed = REVIEW_TRANSITIONS[input.action].from.map((s) => STATUS_WORDS[s]).join(" or ");
    throw new AppError(
      "conflict",
      `Only observations that are ${allowed} can be given this decision; nothing was changed.`,
      {
        issues: outcome.blocked.map(({ id, status }) => ({
          path: "observationIds",
          message: `${id} is ${STATUS_WORDS[status]}.`,
        })),
      },
    );
  }

  const seriesRefreshed = changesSeries({ action: input.action })
    ? await refreshSeriesAfterDecision({ days: outcome.decided.map((r) => r.utDate) })
    : true;

  const mail = { sent: 0, failed: 0 };
  if (kind && note) {
    for (const row of outcome.decided) {
      if (await mailObserver({ row, kind, note })) mail.sent += 1;
      else if (row.observerEmail) mail.failed += 1;
    }
  }
  return {
    action: input.action,
    status: REVIEW_TRANSITIONS[input.action].to,
    decided: outcome.decided.length,
    seriesRefreshed,
    mail,
  };
}

/**
 * Brings the stored series up to date for the days a decision touched. The
 * decision is already committed when this runs, so a failure here must not
 * answer 500 (a client would retry and be refused as a conflict); it is
 * logged and reported, and the next full recompute repairs the series.
 */
export async function refreshSeriesAfterDecision({ days }: { days: string[] }): Promise<boolean> {
  try {
    await refreshSeriesForDays({ days: [...new Set(days)].sort() });
    return true;
  } catch (error) {
    console.error(`Review desk: the series for ${days.join(", ")} could not be refreshed`, error);
    return false;
  }
}

/** Students have no address: their Logbook notice is all they get. */
async function mailObserver({
  row,
  kind,
  note,
}: {
  row: DecidedObservation;
  kind: ReviewMessageKind;
  note: string;
}) {
  if (!row.observerEmail) return false;
  try {
    await sendMail({
      to: row.observerEmail,
      ...reviewDecisionMessage({
        kind,
        observerName: row.observerName,
        utDate: row.utDate,
        note,
        url: appUrl(`/logbook/${row.id}`),
      }),
    });
    return true;
  } catch (error) {
    console.error(`Review desk: could not e-mail the observer about ${row.id}`, error);
    return false;
  }
}
