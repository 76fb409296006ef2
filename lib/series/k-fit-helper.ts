/**
 * Fitting every period's k on two threads: the server's own and one helper
 * thread (lib/series/k-fit-worker.ts) kept for the life of the process. The
 * same helper then writes the recompute's result as it is made
 * (startHelperWrite, below).
 *
 * Periods are independent of each other except through a stand-in pilot's
 * anchor (fitPeriodK): a period whose pilot is present gives the same fit
 * whatever the other periods gave. So both threads fit at once, each taking
 * the next period not yet taken, and then, in period order, each period whose
 * pilot was missing is fitted again with the anchors a fit in order would
 * have had. The results are those of fitting every period in order on one
 * thread, to the bit (the same code on the same numbers).
 *
 * The counts go to the helper in shared memory (countsFromPacks allocates
 * them so), without a copy. The helper runs this project's TypeScript
 * source through tsx, a dependency the server already runs under; it is
 * started the first time it is wanted and used once it has said it is
 * ready, so no fit ever waits for it to start. If it cannot start or fails,
 * everything is fitted on the server's thread, as before.
 */
import path from "node:path";
import { pathToFileURL } from "node:url";
import { Worker } from "node:worker_threads";

import type { WriteStep } from "@/db/sync-write";
import type { KMethod } from "@/lib/counts/k-coefficient";

import type { AcceptedCounts } from "./accepted-counts";
import { fitPeriodK, type KReference, type KUnit, type PeriodKResult } from "./k-fit";

/** A reference the helper can be sent: the series as its values, not as a function. */
export type KFitReference =
  Extract<KReference, { kind: "network" }> | { kind: "series"; values: Map<number, number> };

export type KFitPeriod = { key: number; from: number; to: number };

export type KFitJob = {
  id: number;
  counts: AcceptedCounts;
  units: KUnit[];
  periods: ReadonlyArray<KFitPeriod>;
  /** Positions of `periods` in the order to take them. */
  order: Int32Array;
  /** Shared: how many entries of `order` have been taken (by either thread). */
  next: Int32Array;
  method: KMethod;
  minCommonDays: number;
  reference: KFitReference;
};

type Fitted = Array<{ position: number; result: PeriodKResult }>;

/**
 * Part of a write the helper makes on its own connection to an embedded
 * database (startHelperWrite): its first part begins the transaction, each
 * part's steps run as it arrives, and the last part commits it (or rolls it
 * back: "abort").
 */
export type HelperWritePart = {
  id: number;
  write: { file: string; steps: WriteStep[]; end: "more" | "commit" | "abort" };
};

/** Answered once the helper has done everything sent before it (whenHelperIdle). */
export type HelperIdleQuestion = { id: number; idle: true };

/** The helper's last checkpoint: pages in the log, and how many of them reached the database file. */
export type HelperCheckpoint = { busy: boolean; logPages: number; checkpointedPages: number };

export type KFitReply =
  | { ready: true }
  | { id: number; results: Fitted }
  | { id: number; written: true }
  | { id: number; idle: true; lastCheckpoint: HelperCheckpoint | null }
  | { id: number; error: string };
type Pending = { resolve: (value: unknown) => void; reject: (error: Error) => void };
type Helper = {
  worker: Worker | null;
  ready: boolean;
  failed: boolean;
  nextId: number;
  pending: Map<number, Pending>;
  waiters: Array<(ready: boolean) => void>;
};

// On globalThis: Next's dev server reloads modules, and one helper per process is enough.
const slot = globalThis as unknown as { __heliotallyKFitHelper?: Helper };

function getHelper(): Helper {
  return (slot.__heliotallyKFitHelper ??= {
    worker: null,
    ready: false,
    failed: false,
    nextId: 1,
    pending: new Map(),
    waiters: [],
  });
}

function startHelper(helper: Helper): void {
  if (helper.worker || helper.failed) return;
  try {
    const entry = pathToFileURL(
      path.join(/*turbopackIgnore: true*/ process.cwd(), "lib", "series", "k-fit-worker.ts"),
    ).href;
    // The code is a value, not a literal, so bundlers leave this worker alone.
    const bootstrap = [
      `import("tsx/esm/api")`,
      `.then(({ register }) => { register(); return import(${JSON.stringify(entry)}); })`,
    ].join("");
    const worker = new Worker(bootstrap, { eval: true, execArgv: [] });
    helper.worker = worker;
    worker.on("message", (reply: KFitReply) => {
      // Held open only while a job is out (receiving a message refs it again).
      if (helper.pending.size <= ("ready" in reply ? 0 : 1)) worker.unref();
      if ("ready" in reply) {
        helper.ready = true;
        for (const waiter of helper.waiters.splice(0)) waiter(true);
        return;
      }
      const pending = helper.pending.get(reply.id);
      helper.pending.delete(reply.id);
      if ("error" in reply) pending?.reject(new Error(reply.error));
      else
        pending?.resolve(
          "results" in reply ? reply.results : "idle" in reply ? reply.lastCheckpoint : undefined,
        );
    });
    worker.on("error", (error) => stopHelper(helper, error));
    worker.on("exit", (code) =>
      stopHelper(helper, new Error(`The k-fit helper stopped (exit code ${code})`)),
    );
  } catch (error) {
    stopHelper(helper, error instanceof Error ? error : new Error(String(error)));
  }
}

function stopHelper(helper: Helper, error: Error): void {
  if (helper.failed) return;
  helper.failed = true;
  helper.ready = false;
  if (helper.worker) void helper.worker.terminate();
  helper.worker = null;
  for (const pending of helper.pending.values()) pending.reject(error);
  helper.pending.clear();
  for (const waiter of helper.waiters.splice(0)) waiter(false);
  console.warn(`k coefficients are fitted on one thread: ${error.message}`);
}

/** True while the helper thread is up and taking work. */
export function isKFitHelperRunning(): boolean {
  const helper = getHelper();
  return helper.ready && helper.worker !== null;
}

/**
 * Stops the helper thread for good, as if it had died: work it holds fails,
 * and everything is done on the server's thread from then on. Tests use it
 * to see what the recompute does when the helper goes.
 */
export function stopKFitHelper(reason: string): void {
  stopHelper(getHelper(), new Error(reason));
}

/** Starts the helper if it is not running and resolves once it can take work (false if it cannot). */
export function whenKFitHelperReady(): Promise<boolean> {
  const helper = getHelper();
  startHelper(helper);
  if (helper.ready || helper.failed) return Promise.resolve(helper.ready);
  return new Promise((resolve) => helper.waiters.push(resolve));
}

function sendToHelper(helper: Helper, job: Omit<KFitJob, "id">): Promise<Fitted> {
  const id = helper.nextId++;
  return new Promise((resolve, reject) => {
    helper.pending.set(id, { resolve: (value) => resolve(value as Fitted), reject });
    // A process waiting for the helper's answer must not end meanwhile.
    helper.worker!.ref();
    helper.worker!.postMessage({ ...job, id } satisfies KFitJob);
  });
}

export type HelperWrite = {
  /** Sends steps to run in the write's transaction (the first call begins it). */
  send: (steps: WriteStep[]) => void;
  /** Sends the last steps and commits ("abort": rolls back); settles once the helper has. */
  finish: (end: "commit" | "abort", steps?: WriteStep[]) => Promise<void>;
};

/**
 * One all-or-nothing write made on the helper thread, on its own connection
 * to the embedded database in `file`, with steps sent as they are made: the
 * helper writes the first ones while this thread makes the next, and this
 * thread never waits for the writing itself. Null when the helper is not
 * ready (the caller then writes on this thread).
 *
 * The helper holds the database's write lock from its first part to its
 * last. Until the last part is sent, this thread must not wait on that lock
 * itself: a synchronous wait for the lock here would stop the very thread
 * the helper waits for. So the caller holds this process's writes
 * (holdWrites, db/client.ts) from before the first part until the write
 * has settled, and writes nothing itself meanwhile; other requests may
 * then take their turns, their writes waiting without blocking.
 */
export function startHelperWrite({ file }: { file: string }): HelperWrite | null {
  const helper = getHelper();
  const worker = helper.worker;
  if (!helper.ready || !worker) return null;
  const id = helper.nextId++;
  const post = (steps: WriteStep[], end: HelperWritePart["write"]["end"]) =>
    worker.postMessage({ id, write: { file, steps, end } } satisfies HelperWritePart);
  return {
    send: (steps) => post(steps, "more"),
    finish: (end, steps = []) =>
      new Promise<void>((resolve, reject) => {
        if (helper.worker !== worker) {
          reject(new Error("The helper thread stopped during the write"));
          return;
        }
        helper.pending.set(id, { resolve: () => resolve(), reject });
        worker.ref();
        post(steps, end);
      }),
  };
}

/**
 * Resolves once the helper has done everything sent to it so far, the
 * checkpoint after its last write included (lib/series/k-fit-worker.ts),
 * with what that checkpoint did; at once (and null) when it is not
 * running. For measurements that must not overlap that work.
 */
export function whenHelperIdle(): Promise<{ lastCheckpoint: HelperCheckpoint | null }> {
  const helper = getHelper();
  const worker = helper.worker;
  if (!helper.ready || !worker) return Promise.resolve({ lastCheckpoint: null });
  const id = helper.nextId++;
  return new Promise((resolve) => {
    helper.pending.set(id, {
      resolve: (lastCheckpoint) => resolve({ lastCheckpoint: lastCheckpoint as HelperCheckpoint | null }),
      reject: () => resolve({ lastCheckpoint: null }),
    });
    worker.ref();
    worker.postMessage({ id, idle: true } satisfies HelperIdleQuestion);
  });
}

/** fitPeriodK for one period of `counts`, with everything but the period and the anchors fixed; both threads use it. */
export function makePeriodFitter({
  counts,
  units,
  method,
  minCommonDays,
  reference,
}: {
  counts: AcceptedCounts;
  units: KUnit[];
  method: KMethod;
  minCommonDays: number;
  reference: KFitReference;
}): (period: KFitPeriod, anchorK: Float64Array) => PeriodKResult {
  let kReference: KReference;
  if (reference.kind === "network") kReference = reference;
  else {
    const { values } = reference;
    kReference = { kind: "series", valueOfDay: (day) => values.get(day) };
  }
  return (period, anchorK) =>
    fitPeriodK({
      counts,
      from: period.from,
      to: period.to,
      units,
      periodIndex: period.key,
      method,
      minCommonDays,
      reference: kReference,
      anchorK,
    });
}

/**
 * Every period's fit, as fitting them in order with each period's anchors
 * taken from the ones before would give; then the periods whose stand-in
 * had no earlier k are fitted again against later ones
 * (anchorToLaterPeriods). `betweenPeriods` runs after each period the
 * server's thread fits (to report progress and let other requests in).
 * `threads: 1` keeps everything on this thread.
 */
export async function fitAllPeriods({
  counts,
  units,
  periods,
  method,
  minCommonDays,
  reference,
  betweenPeriods = () => undefined,
  threads = 2,
}: {
  counts: AcceptedCounts;
  units: KUnit[];
  periods: ReadonlyArray<KFitPeriod>;
  method: KMethod;
  minCommonDays: number;
  reference: KFitReference;
  /** `taken`: how many periods the two threads have taken so far, for progress. */
  betweenPeriods?: (position: number, taken: number) => Promise<void> | void;
  threads?: 1 | 2;
}): Promise<{
  results: PeriodKResult[];
  /** 2 when the helper fitted at least one period. */
  threads: 1 | 2;
}> {
  const fit = makePeriodFitter({ counts, units, method, minCommonDays, reference });
  const results: PeriodKResult[] = [];
  const anchorK = new Float64Array(units.length).fill(Number.NaN);
  const keepAnchors = (result: PeriodKResult) => {
    for (const fitted of result.fits) anchorK[fitted.unit] = fitted.k;
  };

  const helper = getHelper();
  if (threads === 2) startHelper(helper);
  const shared = counts.dayNumber.buffer instanceof SharedArrayBuffer;
  if (threads === 1 || !helper.ready || !shared || periods.length < 2) {
    for (const [position, period] of periods.entries()) {
      results.push(fit(period, anchorK));
      keepAnchors(results[position]!);
      await betweenPeriods(position, position + 1);
    }
    await anchorToLaterPeriods({ results, periods, fit, unitCount: units.length, betweenPeriods });
    return { results, threads: 1 };
  }

  // Both threads take the next period not yet taken, the largest first, so
  // neither waits long for the other at the end.
  const order = Int32Array.from(periods.keys()).sort(
    (a, b) => periods[b]!.to - periods[b]!.from - (periods[a]!.to - periods[a]!.from) || a - b,
  );
  const next = new Int32Array(new SharedArrayBuffer(4));
  const fromHelper = sendToHelper(helper, {
    counts,
    units,
    periods,
    order,
    next,
    method,
    minCommonDays,
    reference,
  }).catch(() => null);
  const noAnchors = new Float64Array(units.length).fill(Number.NaN);
  for (;;) {
    const taken = Atomics.add(next, 0, 1);
    if (taken >= periods.length) break;
    const position = order[taken]!;
    results[position] = fit(periods[position]!, noAnchors);
    await betweenPeriods(position, Math.min(taken + 1, periods.length));
  }
  const helped = await fromHelper;
  for (const { position, result } of helped ?? []) results[position] = result;
  // Periods the helper took but did not return (it failed) are fitted here.
  for (const [position, period] of periods.entries()) results[position] ??= fit(period, noAnchors);
  // In order: a period whose pilot was missing was fitted without anchors;
  // fit it again with those of the periods before it.
  for (const [position, period] of periods.entries()) {
    if (results[position]!.standIn) results[position] = fit(period, anchorK);
    keepAnchors(results[position]!);
  }
  await anchorToLaterPeriods({ results, periods, fit, unitCount: units.length, betweenPeriods });
  return { results, threads: helped?.length ? 2 : 1 };
}

/**
 * A stand-in with no earlier k (the pilot joined later than others) was
 * held at the pilot's k, an arbitrary scale. Fit those periods again,
 * latest first, with the stand-in held at its k of the nearest later
 * period, so the whole series shares the pilot's scale.
 */
async function anchorToLaterPeriods({
  results,
  periods,
  fit,
  unitCount,
  betweenPeriods,
}: {
  results: PeriodKResult[];
  periods: ReadonlyArray<KFitPeriod>;
  fit: (period: KFitPeriod, anchorK: Float64Array) => PeriodKResult;
  unitCount: number;
  betweenPeriods: (position: number, taken: number) => Promise<void> | void;
}): Promise<void> {
  const laterK = new Float64Array(unitCount).fill(Number.NaN);
  for (let position = periods.length - 1; position >= 0; position--) {
    const result = results[position]!;
    if (result.standIn && !result.standIn.anchored && laterK.some(Number.isFinite)) {
      results[position] = fit(periods[position]!, laterK);
      await betweenPeriods(position, periods.length);
    }
    for (const fitted of results[position]!.fits) laterK[fitted.unit] = fitted.k;
  }
}
