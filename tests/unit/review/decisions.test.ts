import { describe, expect, it } from "vitest";

import { describeRevision } from "@/lib/review/changes";
import { canApplyDecision, listAvailableDecisions } from "@/lib/review/transitions";
import { REVIEW_ACTIONS } from "@/db/schema";
import { REVIEW_ACTION_WORDS } from "@/lib/review/action-labels";
import {
  DECISION_LOG_ACTIONS,
  decisionLogQuerySchema,
  MAX_DECISION_IDS,
  reviewDecisionSchema,
  reviewQueueQuerySchema,
  reviewSettingsSchema,
} from "@/lib/validation/review";

describe("reviewDecisionSchema", () => {
  it("accepts without a note, and needs one to query, reject or reopen", () => {
    expect(reviewDecisionSchema.safeParse({ action: "accept", observationIds: ["a"] }).success).toBe(true);
    for (const action of ["query", "reject", "reopen"]) {
      const result = reviewDecisionSchema.safeParse({ action, observationIds: ["a"], note: "   " });
      expect(result.success).toBe(false);
      expect(result.error?.issues[0]?.path).toEqual(["note"]);
    }
    expect(
      reviewDecisionSchema.parse({ action: "reject", observationIds: ["a"], note: "  Cloud over the disk. " })
        .note,
    ).toBe("Cloud over the disk.");
  });

  it("refuses unknown actions, unknown fields, empty and oversized selections", () => {
    expect(
      reviewDecisionSchema.safeParse({ action: "approve", observationIds: ["a"] }).error?.issues[0]?.message,
    ).toBe("Choose accept, query, reject or reopen.");
    expect(
      reviewDecisionSchema.safeParse({ action: "accept", observationIds: ["a"], status: "accepted" }).success,
    ).toBe(false);
    expect(reviewDecisionSchema.safeParse({ action: "accept", observationIds: [] }).success).toBe(false);
    const many = Array.from({ length: MAX_DECISION_IDS + 1 }, (_, i) => `id-${i}`);
    expect(reviewDecisionSchema.safeParse({ action: "accept", observationIds: many }).success).toBe(false);
  });

  it("decides a doubly ticked row once", () => {
    expect(
      reviewDecisionSchema.parse({ action: "accept", observationIds: ["a", "b", "a"] }).observationIds,
    ).toEqual(["a", "b"]);
  });
});

describe("reviewQueueQuerySchema and reviewSettingsSchema", () => {
  it("reads the queue's query string with defaults and refuses nonsense", () => {
    expect(reviewQueueQuerySchema.parse({})).toMatchObject({
      status: "submitted",
      page: 1,
      pageSize: 25,
      sort: "receivedAt:desc",
    });
    expect(reviewQueueQuerySchema.safeParse({ status: "accepted" }).success).toBe(false);
    expect(reviewQueueQuerySchema.safeParse({ flag: "odd" }).success).toBe(false);
    expect(reviewQueueQuerySchema.safeParse({ from: "2026-11-30", to: "2026-11-01" }).success).toBe(false);
    expect(reviewQueueQuerySchema.parse({ flag: "far-from-network", sort: "observer:asc" }).flag).toBe(
      "far-from-network",
    );
  });

  it("takes the threshold as text from the form, within bounds", () => {
    expect(reviewSettingsSchema.parse({ outlierThreshold: "3.5" }).outlierThreshold).toBe(3.5);
    expect(reviewSettingsSchema.safeParse({ outlierThreshold: "" }).error?.issues[0]?.message).toBe(
      "Enter a threshold.",
    );
    expect(reviewSettingsSchema.safeParse({ outlierThreshold: "1" }).success).toBe(false);
    expect(reviewSettingsSchema.safeParse({ outlierThreshold: "many" }).success).toBe(false);
  });
});

describe("decisionLogQuerySchema", () => {
  it("offers every kind of audit line the database keeps, each with its words", () => {
    expect([...DECISION_LOG_ACTIONS].sort()).toEqual([...REVIEW_ACTIONS].sort());
    for (const action of DECISION_LOG_ACTIONS) expect(REVIEW_ACTION_WORDS[action]).toBeTruthy();
  });

  it("defaults to the newest decisions first and reads numbers from the query string", () => {
    expect(decisionLogQuerySchema.parse({})).toEqual({
      page: 1,
      pageSize: 25,
      sort: "decidedAt:desc",
      format: "json",
    });
    expect(decisionLogQuerySchema.parse({ page: "3", pageSize: "50", action: "reopened" })).toMatchObject({
      page: 3,
      pageSize: 50,
      action: "reopened",
    });
  });

  it("refuses a date range that ends before it starts, and a day that is not a date", () => {
    const backwards = decisionLogQuerySchema.safeParse({ from: "2026-03-15", to: "2026-03-14" });
    expect(backwards.error?.issues[0]).toMatchObject({ path: ["to"] });
    expect(decisionLogQuerySchema.safeParse({ from: "14/03/2026" }).error?.issues[0]?.message).toBe(
      "Use a date like 2026-03-14.",
    );
  });
});

describe("review transitions", () => {
  it("lets waiting counts be decided and decided counts only be reopened", () => {
    expect(listAvailableDecisions({ status: "submitted" })).toEqual(["accept", "query", "reject"]);
    expect(listAvailableDecisions({ status: "queried" })).toEqual(["accept", "reject"]);
    expect(listAvailableDecisions({ status: "accepted" })).toEqual(["reopen"]);
    expect(canApplyDecision({ action: "accept", status: "rejected" })).toBe(false);
  });
});

describe("describeRevision", () => {
  const before = {
    observedAt: new Date("2026-11-29T13:15:00Z"),
    instrumentId: "i1",
    seeing: 4,
    groups: 10,
    spots: 840,
    northGroups: null,
    northSpots: null,
    southGroups: null,
    southSpots: null,
    notes: null,
  };
  it("names each changed value, before and after", () => {
    expect(describeRevision({ before, after: { ...before, spots: 84, notes: "Slipped digit" } })).toBe(
      'Changed: s 840 → 84; notes — → "Slipped digit"',
    );
    expect(describeRevision({ before, after: { ...before, observedAt: new Date(before.observedAt) } })).toBe(
      "Sent back without changes.",
    );
  });
});
