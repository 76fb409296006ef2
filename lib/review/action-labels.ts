import type { ReviewAction } from "@/db/schema";

/** How each line of the audit trail reads, on the observation's page and in the Decision log. */
export const REVIEW_ACTION_WORDS: Record<ReviewAction, string> = {
  accepted: "Accepted into the series",
  queried: "Queried",
  rejected: "Rejected",
  resubmitted: "Corrected and sent back",
  reopened: "Reopened",
};
