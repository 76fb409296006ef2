import "server-only";

import {
  and,
  asc,
  count,
  desc,
  eq,
  exists,
  gt,
  gte,
  inArray,
  lt,
  lte,
  ne,
  notExists,
  or,
  sql,
  type SQL,
} from "drizzle-orm";

import { computeRawCount } from "@/lib/counts/relative-number";
import { describeRevision } from "@/lib/review/changes";
import { computeDayNetworkValue } from "@/lib/review/flags";
import { canApplyDecision, REVIEW_TRANSITIONS } from "@/lib/review/transitions";
import type { ObservationInput } from "@/lib/validation/observation";
import type {
  DecisionLogQueryInput,
  ReviewDecisionAction,
  ReviewQueueQueryInput,
} from "@/lib/validation/review";

import { getDb } from "../client";
import {
  instruments,
  notifications,
  observationFlags,
  observations,
  observers,
  photos,
  reviewDecisions,
  users,
  type FlagReason,
  type ObservationStatus,
} from "../schema";
import { observationCountColumns, observationValues } from "./observations";
import {
  isNetworkCount,
  listCountsOnDays,
  loadCurrentKs,
  refreshAutomaticFlags,
  type Executor,
} from "./review-flags";

export type StoredFlag = { reason: FlagReason; detail: string };
export type DayNetworkValue = { median: number; n: number } | null;

export type ReviewQueueRow = {
  id: string;
  observerId: string;
  observerName: string;
  observerCode: string;
  instrumentName: string;
  observedAt: Date;
  utDate: string;
  receivedAt: Date;
  status: ObservationStatus;
  groups: number;
  spots: number;
  k: number;
  scaledValue: number;
  network: DayNetworkValue;
  flags: StoredFlag[];
  /** The latest question sent to the observer about this count, if any. */
  lastQuery: { note: string | null; askedAt: Date } | null;
};

/** The latest "queried" line of each observation's audit trail. */
async function listLastQueries({ observationIds }: { observationIds: string[] }) {
  const byObservation = new Map<string, { note: string | null; askedAt: Date }>();
  if (observationIds.length === 0) return byObservation;
  const rows = await getDb()
    .select({
      observationId: reviewDecisions.observationId,
      note: reviewDecisions.note,
      askedAt: reviewDecisions.createdAt,
    })
    .from(reviewDecisions)
    .where(and(inArray(reviewDecisions.observationId, observationIds), eq(reviewDecisions.action, "queried")))
    .orderBy(asc(reviewDecisions.createdAt), asc(reviewDecisions.id));
  // In time order, so each observation keeps its newest.
  for (const { observationId, ...query } of rows) byObservation.set(observationId, query);
  return byObservation;
}

async function listFlagsOf({ observationIds, db = getDb() }: { observationIds: string[]; db?: Executor }) {
  const byObservation = new Map<string, StoredFlag[]>();
  if (observationIds.length === 0) return byObservation;
  const rows = await db
    .select({
      observationId: observationFlags.observationId,
      reason: observationFlags.reason,
      detail: observationFlags.detail,
    })
    .from(observationFlags)
    .where(inArray(observationFlags.observationId, observationIds))
    .orderBy(asc(observationFlags.reason));
  for (const row of rows) {
    byObservation.set(row.observationId, [
      ...(byObservation.get(row.observationId) ?? []),
      { reason: row.reason, detail: row.detail },
    ]);
  }
  return byObservation;
}

/**
 * The day's robust network value for each (observer, day): the median of the
 * other observers' accepted or waiting scaled counts that UT day.
 */
async function computeNetworkValues({ rows }: { rows: Array<{ observerId: string; utDate: string }> }) {
  const dayRows = (await listCountsOnDays({ days: rows.map((r) => r.utDate) })).filter(isNetworkCount);
  const kOf = await loadCurrentKs({ observerIds: dayRows.map((r) => r.observerId) });
  return ({ observerId, utDate }: { observerId: string; utDate: string }): DayNetworkValue => {
    const values = dayRows
      .filter((r) => r.utDate === utDate && r.observerId !== observerId)
      .map((r) => kOf(r) * computeRawCount(r));
    const value = computeDayNetworkValue({ values });
    return value ? { median: value.median, n: value.n } : null;
  };
}

function queueOrder(sort: ReviewQueueQueryInput["sort"]): SQL[] {
  const [field, direction] = sort.split(":") as [string, "asc" | "desc"];
  const dir = direction === "asc" ? asc : desc;
  switch (field) {
    case "observer":
      return [dir(observers.displayName), desc(observations.observedAt), asc(observations.id)];
    case "receivedAt":
      return [dir(observations.createdAt), dir(observations.id)];
    default:
      return [dir(observations.observedAt), dir(observations.id)];
  }
}

/** The coordinator's queue: observations in one waiting status, a page at a time. */
export async function listReviewQueue(query: ReviewQueueQueryInput) {
  const db = getDb();
  const filters: SQL[] = [eq(observations.status, query.status)];
  if (query.from) filters.push(gte(observations.utDate, query.from));
  if (query.to) filters.push(lte(observations.utDate, query.to));
  if (query.observerId) filters.push(eq(observations.observerId, query.observerId));
  if (query.flag) {
    const flagsOfRow = (reason?: FlagReason) =>
      db
        .select({ one: sql`1` })
        .from(observationFlags)
        .where(
          reason
            ? and(eq(observationFlags.observationId, observations.id), eq(observationFlags.reason, reason))
            : eq(observationFlags.observationId, observations.id),
        );
    if (query.flag === "any") filters.push(exists(flagsOfRow()));
    else if (query.flag === "none") filters.push(notExists(flagsOfRow()));
    else filters.push(exists(flagsOfRow(query.flag)));
  }
  const where = and(...filters);

  const [rows, totals] = await Promise.all([
    db
      .select({
        id: observations.id,
        observerId: observations.observerId,
        instrumentId: observations.instrumentId,
        observerName: observers.displayName,
        observerCode: observers.code,
        instrumentName: instruments.name,
        observedAt: observations.observedAt,
        utDate: observations.utDate,
        receivedAt: observations.createdAt,
        status: observations.status,
        groups: observations.groups,
        spots: observations.spots,
      })
      .from(observations)
      .innerJoin(observers, eq(observers.id, observations.observerId))
      .innerJoin(instruments, eq(instruments.id, observations.instrumentId))
      .where(where)
      .orderBy(...queueOrder(query.sort))
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db
      .select({ total: count() })
      .from(observations)
      .innerJoin(observers, eq(observers.id, observations.observerId))
      .where(where),
  ]);

  const [flags, kOf, networkOf, lastQueries] = await Promise.all([
    listFlagsOf({ observationIds: rows.map((r) => r.id) }),
    loadCurrentKs({ observerIds: rows.map((r) => r.observerId) }),
    computeNetworkValues({ rows }),
    listLastQueries({ observationIds: rows.map((r) => r.id) }),
  ]);
  const data: ReviewQueueRow[] = rows.map(({ instrumentId, ...row }) => {
    const k = kOf({ observerId: row.observerId, instrumentId });
    return {
      ...row,
      k,
      scaledValue: k * computeRawCount(row),
      network: networkOf(row),
      flags: flags.get(row.id) ?? [],
      lastQuery: lastQueries.get(row.id) ?? null,
    };
  });
  return { rows: data, total: totals[0]?.total ?? 0 };
}

const DAY_MS = 86_400_000;

type DecisionLogFilter = Omit<DecisionLogQueryInput, "page" | "pageSize" | "format">;

function decisionLogFilters(query: DecisionLogFilter): SQL[] {
  const filters: SQL[] = [];
  if (query.action) filters.push(eq(reviewDecisions.action, query.action));
  if (query.from)
    filters.push(gte(reviewDecisions.createdAt, new Date(Date.parse(`${query.from}T00:00:00Z`))));
  if (query.to)
    filters.push(lt(reviewDecisions.createdAt, new Date(Date.parse(`${query.to}T00:00:00Z`) + DAY_MS)));
  if (query.observerId) filters.push(eq(observations.observerId, query.observerId));
  if (query.actorUserId) filters.push(eq(reviewDecisions.actorUserId, query.actorUserId));
  return filters;
}

/** The lines of the log in the asked order, with who decided, on which count and why. */
function selectDecisionLines({ where, sort }: { where: SQL | undefined; sort: DecisionLogFilter["sort"] }) {
  const direction = sort === "decidedAt:asc" ? asc : desc;
  return getDb()
    .select({
      id: reviewDecisions.id,
      decidedAt: reviewDecisions.createdAt,
      action: reviewDecisions.action,
      fromStatus: reviewDecisions.fromStatus,
      toStatus: reviewDecisions.toStatus,
      note: reviewDecisions.note,
      actorName: users.name,
      actorRole: users.role,
      observationId: observations.id,
      utDate: observations.utDate,
      currentStatus: observations.status,
      observerName: observers.displayName,
      observerCode: observers.code,
    })
    .from(reviewDecisions)
    .innerJoin(observations, eq(observations.id, reviewDecisions.observationId))
    .innerJoin(observers, eq(observers.id, observations.observerId))
    .innerJoin(users, eq(users.id, reviewDecisions.actorUserId))
    .where(where)
    .orderBy(direction(reviewDecisions.createdAt), direction(reviewDecisions.id));
}

/**
 * The Decision log: every line of the audit trail across the network, newest
 * first by default, a page at a time, with who decided, on which count and
 * why. `from` and `to` are UT days of the decisions themselves.
 */
export async function listDecisionLog(query: DecisionLogQueryInput) {
  const filters = decisionLogFilters(query);
  const where = filters.length > 0 ? and(...filters) : undefined;
  const db = getDb();
  // The page's ids first, from review_decisions alone (and observations,
  // to filter by observer), then their lines with everything joined: the
  // lines skipped to reach a deep page are then index entries, not rows
  // joined to three tables. Every decision has its count, observer and
  // decider (foreign keys), so the joins drop no line and the pages are
  // the same.
  const direction = query.sort === "decidedAt:asc" ? asc : desc;
  const pageIds = (
    query.observerId
      ? db
          .select({ id: reviewDecisions.id })
          .from(reviewDecisions)
          .innerJoin(observations, eq(observations.id, reviewDecisions.observationId))
      : db.select({ id: reviewDecisions.id }).from(reviewDecisions)
  )
    .where(where)
    .orderBy(direction(reviewDecisions.createdAt), direction(reviewDecisions.id))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  const [rows, totals] = await Promise.all([
    selectDecisionLines({ where: inArray(reviewDecisions.id, pageIds), sort: query.sort }),
    // The join is needed only to filter by observer; without it the count reads the index alone.
    query.observerId
      ? db
          .select({ total: count() })
          .from(reviewDecisions)
          .innerJoin(observations, eq(observations.id, reviewDecisions.observationId))
          .where(where)
      : db.select({ total: count() }).from(reviewDecisions).where(where),
  ]);
  return { rows, total: totals[0]?.total ?? 0 };
}

/**
 * Every line the filter matches, in batches, for the CSV download: each
 * batch starts after the last line of the one before (time, then id), so
 * the cost per line stays the same however long the log is.
 */
export async function* iterateDecisionLog(query: DecisionLogFilter, batchSize = 2_000) {
  const filters = decisionLogFilters(query);
  const newestFirst = query.sort !== "decidedAt:asc";
  let after: { decidedAt: Date; id: string } | null = null;
  for (;;) {
    const cursor: SQL[] = after
      ? [
          newestFirst
            ? or(
                lt(reviewDecisions.createdAt, after.decidedAt),
                and(eq(reviewDecisions.createdAt, after.decidedAt), lt(reviewDecisions.id, after.id)),
              )!
            : or(
                gt(reviewDecisions.createdAt, after.decidedAt),
                and(eq(reviewDecisions.createdAt, after.decidedAt), gt(reviewDecisions.id, after.id)),
              )!,
        ]
      : [];
    const all = [...filters, ...cursor];
    const batch = await selectDecisionLines({
      where: all.length > 0 ? and(...all) : undefined,
      sort: query.sort,
    }).limit(batchSize);
    if (batch.length === 0) return;
    yield batch;
    const last = batch[batch.length - 1]!;
    after = { decidedAt: last.decidedAt, id: last.id };
    if (batch.length < batchSize) return;
  }
}

export type DecisionLogRow = Awaited<ReturnType<typeof listDecisionLog>>["rows"][number];

/** Who has decided anything on the Review desk, for the Decision log's filter. */
export async function listDeciders(): Promise<Array<{ id: string; name: string }>> {
  const rows = await getDb()
    .selectDistinct({ id: users.id, name: users.name, email: users.email })
    .from(reviewDecisions)
    .innerJoin(users, eq(users.id, reviewDecisions.actorUserId))
    .where(inArray(users.role, ["coordinator", "admin"]));
  return rows
    .map((r) => ({ id: r.id, name: r.name ?? r.email ?? r.id }))
    .sort((a, b) => a.name.localeCompare(b.name));
}

/**
 * The count to review after this one, in the desk's default order (newest
 * arrival first): the next older one waiting, or else the newest; null when
 * nothing else waits.
 */
export async function findNextAwaitingReview({
  observationId,
  receivedAt,
}: {
  observationId: string;
  receivedAt: Date;
}): Promise<string | null> {
  const db = getDb();
  const waiting = and(eq(observations.status, "submitted"), ne(observations.id, observationId));
  const [older] = await db
    .select({ id: observations.id })
    .from(observations)
    .where(
      and(
        waiting,
        or(
          lt(observations.createdAt, receivedAt),
          and(eq(observations.createdAt, receivedAt), lt(observations.id, observationId)),
        ),
      ),
    )
    .orderBy(desc(observations.createdAt), desc(observations.id))
    .limit(1);
  if (older) return older.id;
  const [newest] = await db
    .select({ id: observations.id })
    .from(observations)
    .where(waiting)
    .orderBy(desc(observations.createdAt), desc(observations.id))
    .limit(1);
  return newest?.id ?? null;
}

/** How many observations wait in each tab of the Review desk. */
export async function countAwaitingReview(): Promise<{ submitted: number; queried: number }> {
  const rows = await getDb()
    .select({ status: observations.status, n: count() })
    .from(observations)
    .where(inArray(observations.status, ["submitted", "queried"]))
    .groupBy(observations.status);
  const of = (status: ObservationStatus) => rows.find((r) => r.status === status)?.n ?? 0;
  return { submitted: of("submitted"), queried: of("queried") };
}

/** Observers and students who have logged anything, for the queue's observer filter. */
export async function listObserversForReview() {
  return getDb()
    .select({ id: observers.id, displayName: observers.displayName, code: observers.code })
    .from(observers)
    .where(
      exists(
        getDb()
          .select({ one: sql`1` })
          .from(observations)
          .where(eq(observations.observerId, observers.id)),
      ),
    )
    .orderBy(asc(observers.displayName));
}

/** One observation with everything the detail page shows about its observer and instrument. */
export async function getObservationForReview({ observationId }: { observationId: string }) {
  const [row] = await getDb()
    .select({
      observation: observations,
      observerName: observers.displayName,
      observerCode: observers.code,
      observerTimeZone: observers.timeZone,
      observerUserId: observers.userId,
      observerEmail: users.email,
      instrumentName: instruments.name,
      instrumentKind: instruments.kind,
    })
    .from(observations)
    .innerJoin(observers, eq(observers.id, observations.observerId))
    .innerJoin(users, eq(users.id, observers.userId))
    .innerJoin(instruments, eq(instruments.id, observations.instrumentId))
    .where(eq(observations.id, observationId))
    .limit(1);
  if (!row) return null;
  const obs = row.observation;
  const [flags, kOf, networkOf] = await Promise.all([
    listFlagsOf({ observationIds: [obs.id] }),
    loadCurrentKs({ observerIds: [obs.observerId] }),
    computeNetworkValues({ rows: [obs] }),
  ]);
  const k = kOf(obs);
  return {
    ...row,
    k,
    scaledValue: k * computeRawCount(obs),
    network: networkOf(obs),
    flags: flags.get(obs.id) ?? [],
  };
}

/** The observer's latest counts around this one, newest first, with their scaled values. */
export async function listObserverRecentCounts({ observerId, limit }: { observerId: string; limit: number }) {
  const rows = await getDb()
    .select({
      id: observations.id,
      observerId: observations.observerId,
      instrumentId: observations.instrumentId,
      instrumentName: instruments.name,
      observedAt: observations.observedAt,
      utDate: observations.utDate,
      groups: observations.groups,
      spots: observations.spots,
      status: observations.status,
    })
    .from(observations)
    .innerJoin(instruments, eq(instruments.id, observations.instrumentId))
    .where(eq(observations.observerId, observerId))
    .orderBy(desc(observations.observedAt))
    .limit(limit);
  const kOf = await loadCurrentKs({ observerIds: [observerId] });
  return rows.map((r) => ({ ...r, scaledValue: kOf(r) * computeRawCount(r) }));
}

/** The audit trail of one observation, oldest first. */
export async function listDecisionsOfObservation({ observationId }: { observationId: string }) {
  return getDb()
    .select({
      id: reviewDecisions.id,
      action: reviewDecisions.action,
      fromStatus: reviewDecisions.fromStatus,
      toStatus: reviewDecisions.toStatus,
      note: reviewDecisions.note,
      createdAt: reviewDecisions.createdAt,
      actorName: users.name,
      actorRole: users.role,
    })
    .from(reviewDecisions)
    .innerJoin(users, eq(users.id, reviewDecisions.actorUserId))
    .where(eq(reviewDecisions.observationId, observationId))
    .orderBy(asc(reviewDecisions.createdAt), asc(reviewDecisions.id));
}

/** The photos of the disk the observer kept with an observation. */
export async function listObservationPhotos({ observationId }: { observationId: string }) {
  return getDb()
    .select({
      id: photos.id,
      url: photos.url,
      name: photos.name,
      widthPx: photos.widthPx,
      heightPx: photos.heightPx,
    })
    .from(photos)
    .where(eq(photos.observationId, observationId))
    .orderBy(asc(photos.createdAt));
}

export type DecidedObservation = {
  id: string;
  utDate: string;
  fromStatus: ObservationStatus;
  observerUserId: string;
  observerName: string;
  observerEmail: string | null;
};

export type DecisionOutcome =
  | { ok: true; decided: DecidedObservation[] }
  | { ok: false; missing: string[] }
  | { ok: false; blocked: Array<{ id: string; status: ObservationStatus }> };

/**
 * Applies one decision to every listed observation, or to none: unknown ids
 * or a status the decision cannot apply to leave the database untouched.
 * Each observation gets its status, an audit row, and (when `notify` says
 * so) a notification for its observer, in one transaction. IMMEDIATE takes
 * the write lock before the statuses are read, so two coordinators deciding
 * the same count at once cannot both succeed.
 */
export async function applyReviewDecision({
  actorUserId,
  action,
  observationIds,
  note,
  notify,
}: {
  actorUserId: string;
  action: ReviewDecisionAction;
  observationIds: string[];
  note: string | null;
  notify: (row: DecidedObservation) => { kind: string; message: string; link: string } | null;
}): Promise<DecisionOutcome> {
  const transition = REVIEW_TRANSITIONS[action];
  return getDb().transaction(
    async (tx) => {
      const found = await tx
        .select({
          id: observations.id,
          utDate: observations.utDate,
          fromStatus: observations.status,
          observerUserId: observers.userId,
          observerName: observers.displayName,
          observerEmail: users.email,
        })
        .from(observations)
        .innerJoin(observers, eq(observers.id, observations.observerId))
        .innerJoin(users, eq(users.id, observers.userId))
        .where(inArray(observations.id, observationIds));
      const foundIds = new Set(found.map((r) => r.id));
      const missing = observationIds.filter((id) => !foundIds.has(id));
      if (missing.length > 0) return { ok: false, missing };
      const blocked = found.filter((r) => !canApplyDecision({ action, status: r.fromStatus }));
      if (blocked.length > 0)
        return { ok: false, blocked: blocked.map((r) => ({ id: r.id, status: r.fromStatus })) };

      const now = new Date();
      await tx
        .update(observations)
        .set({ status: transition.to, updatedAt: now })
        .where(inArray(observations.id, observationIds));
      await tx.insert(reviewDecisions).values(
        found.map((r) => ({
          observationId: r.id,
          actorUserId,
          action: transition.recordedAs,
          fromStatus: r.fromStatus,
          toStatus: transition.to,
          note,
          createdAt: now,
        })),
      );
      const messages = found.flatMap((r) => {
        const message = notify(r);
        return message ? [{ userId: r.observerUserId, ...message, createdAt: now }] : [];
      });
      if (messages.length > 0) await tx.insert(notifications).values(messages);
      return { ok: true, decided: found };
    },
    { behavior: "immediate" },
  );
}

/**
 * An observer's correction: new values, back to "submitted", a
 * "resubmitted" line in the audit trail when the status changes, and fresh
 * automatic flags, all at once. Returns null when the observation is not the
 * observer's (the caller answers 404).
 */
export async function resubmitObservation({
  observerId,
  observationId,
  input,
}: {
  observerId: string;
  observationId: string;
  input: ObservationInput;
}): Promise<{ before: { status: ObservationStatus; utDate: string }; utDate: string } | null> {
  return getDb().transaction(
    async (tx) => {
      const [before] = await tx
        .select({
          status: observations.status,
          utDate: observations.utDate,
          observerUserId: observers.userId,
          observedAt: observations.observedAt,
          instrumentId: observations.instrumentId,
          ...observationCountColumns,
        })
        .from(observations)
        .innerJoin(observers, eq(observers.id, observations.observerId))
        .where(and(eq(observations.id, observationId), eq(observations.observerId, observerId)));
      if (!before) return null;
      const values = observationValues(input);
      const now = new Date();
      await tx
        .update(observations)
        .set({ ...values, status: "submitted", updatedAt: now })
        .where(eq(observations.id, observationId));
      if (before.status !== "submitted") {
        await tx.insert(reviewDecisions).values({
          observationId,
          actorUserId: before.observerUserId,
          action: "resubmitted",
          fromStatus: before.status,
          toStatus: "submitted",
          note: describeRevision({ before, after: values }),
          createdAt: now,
        });
      }
      await refreshAutomaticFlags({ observationIds: [observationId], db: tx, withWaitingSiblings: true });
      return { before: { status: before.status, utDate: before.utDate }, utDate: values.utDate };
    },
    { behavior: "immediate" },
  );
}

/** Flags for a newly logged observation, in their own short transaction. */
export async function flagNewObservation({ observationId }: { observationId: string }) {
  await getDb().transaction(async (tx) => {
    await refreshAutomaticFlags({ observationIds: [observationId], db: tx, withWaitingSiblings: true });
  });
}
