import { createReadStream } from "node:fs";

import { getObserverById } from "@/db/queries/imports";
import { getObserverByUserId } from "@/db/queries/observers";
import { roleSatisfies } from "@/lib/auth/roles";
import { requireRole, type SessionUser } from "@/lib/auth/session";
import { describeProblem, importLogbook, type ImportReport } from "@/lib/import/run-import";
import { spoolRequestBody } from "@/lib/import/spool";
import { AppError, invalidInput } from "@/lib/http/errors";
import { withIdempotency } from "@/lib/http/idempotency";
import { errorResponse, handleRoute } from "@/lib/http/respond";
import { MAX_IMPORT_BYTES, importOptionsSchema } from "@/lib/validation/import";

const CSV_TYPES = [
  "text/csv",
  "text/plain",
  "application/csv",
  "application/vnd.ms-excel",
  "application/octet-stream",
];

/**
 * Imports a CSV logbook: the file is the body, the reading options are the
 * query string. Either every line is stored or none is. With
 * `Accept: application/x-ndjson` (and no Idempotency-Key) the answer is a
 * stream of progress lines ending with the result, for the browser's
 * progress bar; otherwise one JSON answer.
 */
export const POST = handleRoute(async (request: Request) => {
  const user = await requireRole(["observer", "coordinator"], { request });
  const parsed = importOptionsSchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw invalidInput(parsed.error, "The import options need attention.");
  const options = parsed.data;
  const observer = await resolveObserver({ user, observerId: options.observerId });

  const type = (request.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  if (!CSV_TYPES.includes(type)) {
    throw new AppError(
      "unsupported_media_type",
      "Send the CSV file itself as the body, with Content-Type: text/csv.",
    );
  }

  const file = await spoolRequestBody({ request, maxBytes: MAX_IMPORT_BYTES });
  const run = (
    extra: { onProgress?: Parameters<typeof importLogbook>[0]["onProgress"]; signal?: AbortSignal } = {},
  ) =>
    importLogbook({
      observerId: observer.id,
      byUserId: user.id,
      input: createReadStream(file.path, { highWaterMark: 256 * 1024 }),
      totalBytes: file.bytes,
      fileHash: file.sha256,
      options,
      ...extra,
    });

  const wantsStream = (request.headers.get("accept") ?? "").includes("application/x-ndjson");
  if (wantsStream && !request.headers.has("idempotency-key"))
    return streamImport({ run, remove: file.remove });

  try {
    return await withIdempotency(
      {
        request,
        userId: user.id,
        scope: `POST /api/v1/imports:${observer.id}`,
        body: { sha256: file.sha256, options },
      },
      async () => toJsonResult(await run()),
    );
  } finally {
    await file.remove();
  }
});

async function resolveObserver({ user, observerId }: { user: SessionUser; observerId: string | undefined }) {
  const own = await getObserverByUserId({ userId: user.id });
  if (observerId === undefined || observerId === own?.id) {
    if (own) return own;
    throw roleSatisfies({ role: user.role, required: ["coordinator"] })
      ? new AppError("invalid_input", "Say whose logbook this is: add observerId to the query string.", {
          issues: [{ path: "observerId", message: "Choose the observer you are importing for." }],
        })
      : new AppError("forbidden", "Your account has no observer profile.");
  }
  // Only coordinators import for someone else; to anyone else another
  // observer simply does not exist, so ids cannot be probed.
  const other = roleSatisfies({ role: user.role, required: ["coordinator"] })
    ? await getObserverById({ observerId })
    : null;
  if (!other) throw new AppError("not_found", "No such observer.");
  return other;
}

function toJsonResult(report: ImportReport): { status: number; body: unknown } {
  if (report.ok) return { status: 201, body: withoutOk(report) };
  throw failureError(report);
}

/** The success report as the API answers it (the `ok` flag is implied by the status). */
function withoutOk(report: Extract<ImportReport, { ok: true }>) {
  return {
    batchId: report.batchId,
    rowsRead: report.rowsRead,
    imported: report.imported,
    skipped: report.skipped,
    firstDay: report.firstDay,
    lastDay: report.lastDay,
    flags: report.flags,
  };
}

function failureError(report: Extract<ImportReport, { ok: false }>): AppError {
  return new AppError("invalid_input", report.message, {
    issues: report.problems.map((p) => ({
      path: `line ${p.line}${p.field ? `.${p.field}` : ""}`,
      message: describeProblem(p),
    })),
  });
}

function streamImport({
  run,
  remove,
}: {
  run: (extra: { onProgress?: (p: unknown) => void; signal?: AbortSignal }) => Promise<ImportReport>;
  remove: () => Promise<void>;
}): Response {
  const abort = new AbortController();
  const encoder = new TextEncoder();
  const body = new ReadableStream<Uint8Array>({
    async start(controller) {
      const send = (event: unknown) => {
        if (!abort.signal.aborted) controller.enqueue(encoder.encode(`${JSON.stringify(event)}\n`));
      };
      try {
        const report = await run({
          onProgress: (p) => send({ type: "progress", ...(p as object) }),
          signal: abort.signal,
        });
        if (report.ok) {
          send({ type: "done", status: 201, result: withoutOk(report) });
        } else {
          send({ type: "failed", status: 400, ...failureError(report).toBody(), report });
        }
      } catch (error) {
        const answer = errorResponse(error);
        send({ type: "failed", status: answer.status, ...(await answer.json()) });
      } finally {
        await remove();
        if (!abort.signal.aborted) controller.close();
      }
    },
    cancel() {
      // The browser went away: stop reading and roll everything back.
      abort.abort();
    },
  });
  return new Response(body, {
    status: 200,
    headers: {
      "content-type": "application/x-ndjson; charset=utf-8",
      "cache-control": "no-store",
      "x-accel-buffering": "no",
    },
  });
}
