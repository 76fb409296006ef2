import type { ObservationStatus, ReviewAction } from "@/db/schema";
import type { ReviewDecisionAction } from "@/lib/validation/review";

type Transition = { from: readonly ObservationStatus[]; to: ObservationStatus; recordedAs: ReviewAction };

/**
 * Which decision may be taken from which status. A queried count may still be
 * accepted or rejected without waiting (the observer may have answered by
 * other means); a decided count must be reopened before it is decided again,
 * so every change of mind leaves its own line, with a reason, in the audit trail.
 */
export const REVIEW_TRANSITIONS: Record<ReviewDecisionAction, Transition> = {
  accept: { from: ["submitted", "queried"], to: "accepted", recordedAs: "accepted" },
  query: { from: ["submitted"], to: "queried", recordedAs: "queried" },
  reject: { from: ["submitted", "queried"], to: "rejected", recordedAs: "rejected" },
  reopen: { from: ["accepted", "rejected"], to: "submitted", recordedAs: "reopened" },
};

export function canApplyDecision({
  action,
  status,
}: {
  action: ReviewDecisionAction;
  status: ObservationStatus;
}): boolean {
  return REVIEW_TRANSITIONS[action].from.includes(status);
}

/** Decisions a coordinator may take on an observation in this status, in the order the desk shows them. */
export function listAvailableDecisions({ status }: { status: ObservationStatus }): ReviewDecisionAction[] {
  return (Object.keys(REVIEW_TRANSITIONS) as ReviewDecisionAction[]).filter((action) =>
    canApplyDecision({ action, status }),
  );
}

/** Decisions that change what enters the network series. */
export function changesSeries({ action }: { action: ReviewDecisionAction }): boolean {
  return action !== "query";
}
