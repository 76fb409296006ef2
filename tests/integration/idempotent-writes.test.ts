/**
 * Idempotency-Key on the writes that took it last: deletes, archiving, the
 * tracing save, the k settings and the recompute. A retry with the same key
 * gets the first status and body again (marked idempotent-replayed) and
 * changes nothing a second time.
 */

import { count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

import {
  DELETE as restoreInstrument,
  POST as archiveInstrument,
} from "@/app/api/v1/instruments/[id]/archive/route";
import { DELETE as deleteInstrument } from "@/app/api/v1/instruments/[id]/route";
import { PUT as putKSettings } from "@/app/api/v1/k-settings/route";
import { DELETE as deleteObservation } from "@/app/api/v1/observations/[id]/route";
import { PUT as putTracing } from "@/app/api/v1/observations/[id]/tracing/route";
import { DELETE as deletePhoto } from "@/app/api/v1/photos/[id]/route";
import { POST as startRecompute } from "@/app/api/v1/series/recompute/route";
import { getDb } from "@/db/client";
import { getJob } from "@/db/queries/jobs";
import { getKSettings } from "@/db/queries/k";
import { instruments, jobs, observations, photos, tracings } from "@/db/schema";
import { createEmptyTracing } from "@/lib/validation/tracing";

import { startPhotoStore } from "./photo-store-support";
import { apiRequest, insertInstrument, insertObservation, makeUser } from "./support";

type Made = Awaited<ReturnType<typeof makeUser>>;
let observer: Made;
let coordinator: Made;
let photoStore: Awaited<ReturnType<typeof startPhotoStore>>;

const params = (id: string) => ({ params: Promise.resolve({ id }) });
const keyed = (key: string) => ({ "idempotency-key": key });

async function send(
  handler: (request: Request, context: { params: Promise<{ id: string }> }) => Promise<Response>,
  {
    url,
    method,
    userId,
    id,
    key,
    body,
  }: { url: string; method: string; userId: string; id: string; key?: string; body?: unknown },
) {
  return handler(await apiRequest(url, { method, userId, body, headers: key ? keyed(key) : {} }), params(id));
}

/** Status, replay mark and body text, to compare a first answer with its replay. */
async function readAnswer(res: Response) {
  return { status: res.status, replayed: res.headers.get("idempotent-replayed"), body: await res.text() };
}

async function countRows(table: typeof instruments | typeof observations | typeof photos | typeof jobs) {
  const [row] = await getDb().select({ n: count() }).from(table);
  return row?.n ?? 0;
}

beforeAll(async () => {
  photoStore = await startPhotoStore({ name: "idempotent" });
  observer = await makeUser({ role: "observer" });
  coordinator = await makeUser({ role: "coordinator" });
});

afterAll(async () => {
  await photoStore.stop();
});

describe("Idempotency-Key on deletes", () => {
  it("DELETE /api/v1/instruments/[id]: the retry gets 204 again, without a key it is 404", async () => {
    const id = await insertInstrument({ owner: observer, name: "Spare pinhole" });
    const call = (key?: string) =>
      send(deleteInstrument, {
        url: `/api/v1/instruments/${id}`,
        method: "DELETE",
        userId: observer.user.id,
        id,
        key,
      });
    const first = await readAnswer(await call("delete-instrument-0001"));
    const before = await countRows(instruments);
    const again = await readAnswer(await call("delete-instrument-0001"));
    expect(first).toEqual({ status: 204, replayed: null, body: "" });
    expect(again).toEqual({ status: 204, replayed: "true", body: "" });
    expect(await countRows(instruments)).toBe(before);
    expect((await call()).status).toBe(404);
  });

  it("DELETE /api/v1/observations/[id]: the retry gets 204 again and deletes nothing else", async () => {
    const id = await insertObservation({ owner: observer, day: "2026-02-01" });
    const keep = await insertObservation({ owner: observer, day: "2026-02-02" });
    const call = () =>
      send(deleteObservation, {
        url: `/api/v1/observations/${id}`,
        method: "DELETE",
        userId: observer.user.id,
        id,
        key: "delete-observation-0001",
      });
    const first = await readAnswer(await call());
    const before = await countRows(observations);
    const again = await readAnswer(await call());
    expect(first.status).toBe(204);
    expect(again).toEqual({ status: 204, replayed: "true", body: "" });
    expect(await countRows(observations)).toBe(before);
    const [kept] = await getDb().select().from(observations).where(eq(observations.id, keep));
    expect(kept).toBeDefined();
  });

  it("DELETE /api/v1/photos/[id]: the retry gets 204 again", async () => {
    const observationId = await insertObservation({ owner: observer, day: "2026-02-03" });
    const [photo] = await getDb()
      .insert(photos)
      .values({
        fileKey: "idempotent-photo",
        observerId: observer.observer!.id,
        observationId,
        name: "disk.jpg",
        sizeBytes: 1000,
        mimeType: "image/jpeg",
        url: "https://example.test/idempotent-photo",
      })
      .returning();
    const call = () =>
      send(deletePhoto, {
        url: `/api/v1/photos/${photo!.id}`,
        method: "DELETE",
        userId: observer.user.id,
        id: photo!.id,
        key: "delete-photo-0001",
      });
    const first = await readAnswer(await call());
    const again = await readAnswer(await call());
    expect(first.status).toBe(204);
    expect(again).toEqual({ status: 204, replayed: "true", body: "" });
    expect(await getDb().select().from(photos).where(eq(photos.id, photo!.id))).toEqual([]);
  });
});

describe("Idempotency-Key on archiving", () => {
  it("a replayed archive answers the first body and does not archive again", async () => {
    const id = await insertInstrument({ owner: observer, name: "Old pinhole" });
    const url = `/api/v1/instruments/${id}/archive`;
    const archive = () =>
      send(archiveInstrument, { url, method: "POST", userId: observer.user.id, id, key: "archive-0001" });
    const first = await readAnswer(await archive());
    expect(first.status).toBe(200);
    expect(JSON.parse(first.body).archivedAt).not.toBeNull();

    const restored = await send(restoreInstrument, {
      url,
      method: "DELETE",
      userId: observer.user.id,
      id,
      key: "restore-0001",
    });
    expect((await restored.json()).archivedAt).toBeNull();

    const again = await readAnswer(await archive());
    expect(again).toEqual({ ...first, replayed: "true" });
    // The replay changed nothing: the instrument stays restored.
    const [row] = await getDb().select().from(instruments).where(eq(instruments.id, id));
    expect(row!.archivedAt).toBeNull();
  });
});

describe("Idempotency-Key on the tracing save", () => {
  it("a retried save gets its first answer, not a stale-revision 409, and stores one revision", async () => {
    const id = await insertObservation({ owner: observer, day: "2026-02-04" });
    const body = {
      document: {
        ...createEmptyTracing(),
        disk: { cx: 500, cy: 500, r: 400, method: "drag", limbPoints: [] },
        orientation: { mode: "north", point: { x: 500, y: 60 }, mirrored: false },
      },
      baseRevision: 0,
    };
    const save = (key?: string) =>
      send(putTracing, {
        url: `/api/v1/observations/${id}/tracing`,
        method: "PUT",
        userId: observer.user.id,
        id,
        key,
        body,
      });
    const first = await readAnswer(await save("tracing-save-0001"));
    expect(first.status).toBe(200);
    expect(JSON.parse(first.body).revision).toBe(1);
    const again = await readAnswer(await save("tracing-save-0001"));
    expect(again).toEqual({ ...first, replayed: "true" });
    const [row] = await getDb().select().from(tracings).where(eq(tracings.observationId, id));
    expect(row!.revision).toBe(1);
    // Without the key the same send is refused as stale.
    expect((await save()).status).toBe(409);
  });
});

describe("Idempotency-Key on the coordinator's writes", () => {
  const settings = (pilotK: number) => ({
    periodKind: "year",
    method: "ratio-of-sums",
    minCommonDays: 10,
    referenceSeriesId: "network",
    pilotObserverId: null,
    pilotK,
    driftFraction: 0.1,
  });
  const putSettings = async (body: unknown, key?: string) =>
    putKSettings(
      await apiRequest("/api/v1/k-settings", {
        method: "PUT",
        userId: coordinator.user.id,
        body,
        headers: key ? keyed(key) : {},
      }),
    );

  it("PUT /api/v1/k-settings: a late replay answers the first body and does not overwrite newer settings", async () => {
    const first = await readAnswer(await putSettings(settings(1.2), "k-settings-0001"));
    expect(first.status).toBe(200);
    expect(JSON.parse(first.body).pilotK).toBe(1.2);
    expect((await putSettings(settings(1.5))).status).toBe(200);
    const again = await readAnswer(await putSettings(settings(1.2), "k-settings-0001"));
    expect(again).toEqual({ ...first, replayed: "true" });
    expect((await getKSettings()).pilotK).toBe(1.5);
  });

  it("POST /api/v1/series/recompute: the retry answers the first job, with its Location, and starts no other", async () => {
    const call = async () =>
      startRecompute(
        await apiRequest("/api/v1/series/recompute", {
          method: "POST",
          userId: coordinator.user.id,
          headers: keyed("recompute-0001"),
        }),
      );
    const jobsBefore = await countRows(jobs);
    const firstRes = await call();
    const first = await readAnswer(firstRes);
    expect(first.status).toBe(202);
    const { job } = JSON.parse(first.body) as { job: { id: string } };
    expect(firstRes.headers.get("location")).toBe(`/api/v1/jobs/${job.id}`);

    // Wait for the job to end: a plain second request would then start a new one.
    for (let attempt = 0; attempt < 400; attempt += 1) {
      const current = await getJob({ jobId: job.id });
      if (current?.status === "done" || current?.status === "failed") break;
      await new Promise((resolve) => setTimeout(resolve, 50));
    }
    const againRes = await call();
    const again = await readAnswer(againRes);
    expect(again).toEqual({ ...first, replayed: "true" });
    expect(againRes.headers.get("location")).toBe(`/api/v1/jobs/${job.id}`);
    expect(await countRows(jobs)).toBe(jobsBefore + 1);
  });
});
