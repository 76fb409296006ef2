/**
 * Photo uploads end to end on the server side: the app's own uploadthing
 * route handler (served over HTTP so the storage host can call it back),
 * uploads-fake started in-process as the storage host, UTApi for deletes.
 * The browser's part is re-enacted with fetch as uploadthing/client does it
 * (ask the route for a presigned URL, HEAD, then PUT the file).
 */
import { mkdtemp, rm } from "node:fs/promises";
import { createServer, type IncomingMessage, type Server } from "node:http";
import { tmpdir } from "node:os";
import path from "node:path";

import { eq } from "drizzle-orm";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { getDb } from "@/db/client";
import { observations, photos } from "@/db/schema";
import { resetEnvCache } from "@/lib/env";

import { startUploadsHost, type UploadsHost } from "../../uploads-fake/server";
import { LOCAL_API_KEY, LOCAL_APP_ID } from "../../uploads-fake/token";
import { makeSyntheticDisk } from "../support/synthetic-disk";
import { apiRequest, enrolStudent, makeUser } from "./support";

type Made = Awaited<ReturnType<typeof makeUser>>;
type Routes = {
  uploadthing: typeof import("@/app/api/uploadthing/route");
  observations: typeof import("@/app/api/v1/observations/route");
  observation: typeof import("@/app/api/v1/observations/[id]/route");
  photo: typeof import("@/app/api/v1/photos/[id]/route");
  image: typeof import("@/app/api/v1/photos/[id]/image/route");
};

let dataDir: string;
let store: UploadsHost;
let storePort: number;
let app: Server;
let routes: Routes;
let alice: Made;
let bob: Made;
let coordinator: Made;
let educator: Made;
let otherEducator: Made;
let student: Made;

function startStore(port: number) {
  return startUploadsHost({
    port,
    dataDir,
    apiKey: LOCAL_API_KEY,
    appId: LOCAL_APP_ID,
    quiet: true,
    serverDataWaitMs: 20_000,
  });
}

async function readBody(req: IncomingMessage): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of req) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString("utf8");
}

beforeAll(async () => {
  dataDir = await mkdtemp(path.join(tmpdir(), "heliotally-photos-"));
  store = await startStore(0);
  storePort = Number(new URL(store.url).port);
  // The app as Next would host it: our route handler behind an HTTP server, so the store can POST its callback.
  app = createServer((req, res) => {
    void (async () => {
      const body = req.method === "POST" ? await readBody(req) : undefined;
      const headers = new Headers();
      for (const [name, value] of Object.entries(req.headers))
        if (typeof value === "string") headers.set(name, value);
      const handler = req.method === "POST" ? routes.uploadthing.POST : routes.uploadthing.GET;
      const response = await handler(
        new Request(new URL(req.url ?? "/", "http://127.0.0.1"), {
          method: req.method,
          headers,
          body,
        }) as never,
      );
      res.writeHead(response.status, Object.fromEntries(response.headers));
      res.end(Buffer.from(await response.arrayBuffer()));
    })();
  });
  await new Promise<void>((resolve) => app.listen(0, "127.0.0.1", () => resolve()));
  const appPort = (app.address() as { port: number }).port;

  // Only the SDK's documented environment points the app at the local store.
  process.env.UPLOADTHING_INGEST_URL = `http://localhost:${storePort}`;
  process.env.UPLOADTHING_API_URL = `http://localhost:${storePort}`;
  process.env.UPLOADTHING_UFS_HOST = `localhost:${storePort}`;
  process.env.UPLOADTHING_UFS_APP_ID_LOCATION = "path";
  process.env.UPLOADTHING_CALLBACK_URL = `http://127.0.0.1:${appPort}/api/uploadthing`;
  resetEnvCache();
  routes = {
    uploadthing: await import("@/app/api/uploadthing/route"),
    observations: await import("@/app/api/v1/observations/route"),
    observation: await import("@/app/api/v1/observations/[id]/route"),
    photo: await import("@/app/api/v1/photos/[id]/route"),
    image: await import("@/app/api/v1/photos/[id]/image/route"),
  };

  // One at a time: the helper numbers users from a shared counter.
  alice = await makeUser({ role: "observer" });
  bob = await makeUser({ role: "observer" });
  coordinator = await makeUser({ role: "coordinator" });
  educator = await makeUser({ role: "educator" });
  otherEducator = await makeUser({ role: "educator" });
  student = await makeUser({ role: "student" });
  await enrolStudent({ educatorUserId: educator.user.id, studentUserId: student.user.id });
});

afterAll(async () => {
  await new Promise<void>((resolve) => app.close(() => resolve()));
  await store.close();
  await rm(dataDir, { recursive: true, force: true });
});

// ---------------------------------------------------------------- helpers

async function createObservation(who: Made): Promise<string> {
  const response = await routes.observations.POST(
    await apiRequest("/api/v1/observations", {
      method: "POST",
      userId: who.user.id,
      body: {
        observedAt: "2026-03-14T09:30:00Z",
        seeing: 2,
        instrumentId: who.instrument!.id,
        groups: 2,
        spots: 7,
      },
    }),
  );
  expect(response.status).toBe(201);
  return ((await response.json()) as { id: string }).id;
}

let diskJpeg: Uint8Array | undefined;
/** A synthetic disk photo with EXIF capture time (12:34:56 at +02:00) and orientation 6. */
async function makeDiskJpeg(): Promise<Uint8Array> {
  if (diskJpeg) return diskJpeg;
  const gray = makeSyntheticDisk({
    width: 600,
    height: 400,
    centreXPx: 300,
    centreYPx: 200,
    radiusPx: 170,
    spots: [{ xPx: 320, yPx: 180, radiusPx: 8 }],
  });
  const buffer = await sharp(Buffer.from(gray.data.buffer), { raw: { width: 600, height: 400, channels: 1 } })
    .withExif({ IFD2: { DateTimeOriginal: "2026:03:14 11:29:00", OffsetTimeOriginal: "+02:00" } })
    .withMetadata({ orientation: 6 })
    .jpeg({ quality: 90 })
    .toBuffer();
  diskJpeg = new Uint8Array(buffer);
  return diskJpeg;
}

type UploadOutcome = {
  status: number;
  message?: string;
  key?: string;
  putStatus?: number;
  serverData?:
    | { ok: true; photoId: string; widthPx: number; heightPx: number; exifTakenAt: string | null }
    | { ok: false; message: string }
    | null;
};

/** The browser's steps: presigned URL from our route, then HEAD and PUT at the store. */
async function upload({
  userId,
  observationId,
  bytes,
  name = "disk.jpg",
  type = "image/jpeg",
  declaredSize,
}: {
  userId?: string;
  observationId: string;
  bytes: Uint8Array;
  name?: string;
  type?: string;
  declaredSize?: number;
}): Promise<UploadOutcome> {
  const presign = await routes.uploadthing.POST(
    (await apiRequest("/api/uploadthing?actionType=upload&slug=observationPhoto", {
      method: "POST",
      userId,
      body: {
        input: { observationId },
        files: [{ name, size: declaredSize ?? bytes.length, type, lastModified: Date.now() }],
      },
    })) as never,
  );
  if (presign.status !== 200)
    return { status: presign.status, message: ((await presign.json()) as { message: string }).message };
  const [presigned] = (await presign.json()) as Array<{ url: string; key: string }>;
  const head = await fetch(presigned!.url, { method: "HEAD" });
  const start = Number(head.headers.get("x-ut-range-start") ?? "0");
  const form = new FormData();
  form.append("file", new Blob([bytes.slice(start)], { type }), name);
  const put = await fetch(presigned!.url, {
    method: "PUT",
    headers: { Range: `bytes=${start}-` },
    body: form,
  });
  const json = (await put.json()) as { serverData?: UploadOutcome["serverData"]; error?: string };
  return {
    status: 200,
    key: presigned!.key,
    putStatus: put.status,
    serverData: json.serverData ?? null,
    message: json.error,
  };
}

async function storedKeys(): Promise<string[]> {
  const response = await fetch(`${store.url}/v6/listFiles`, {
    method: "POST",
    headers: { "content-type": "application/json", "x-uploadthing-api-key": LOCAL_API_KEY },
    body: JSON.stringify({ limit: 1000 }),
  });
  return ((await response.json()) as { files: Array<{ key: string }> }).files.map((f) => f.key);
}

async function getImage({
  photoId,
  userId,
  variant = "view",
}: {
  photoId: string;
  userId?: string;
  variant?: string;
}) {
  return routes.image.GET(
    await apiRequest(`/api/v1/photos/${photoId}/image?variant=${variant}`, { userId }),
    {
      params: Promise.resolve({ id: photoId }),
    },
  );
}

// ---------------------------------------------------------------- tests

let alicePhotoId: string;
let aliceObservationId: string;

describe("uploading a disk photo", () => {
  it("stores the photo through the SDK route: checked, thumbnailed, EXIF time and orientation honoured", async () => {
    aliceObservationId = await createObservation(alice);
    const bytes = await makeDiskJpeg();
    const outcome = await upload({ userId: alice.user.id, observationId: aliceObservationId, bytes });
    expect(outcome.putStatus).toBe(200);
    expect(outcome.serverData).toMatchObject({
      ok: true,
      widthPx: 400,
      heightPx: 600,
      exifTakenAt: "2026-03-14T09:29:00.000Z",
    });
    if (!outcome.serverData?.ok) throw new Error("upload refused");
    alicePhotoId = outcome.serverData.photoId;

    const [row] = await getDb().select().from(photos).where(eq(photos.id, alicePhotoId));
    expect(row).toMatchObject({
      fileKey: outcome.key,
      observerId: alice.observer!.id,
      observationId: aliceObservationId,
      name: "disk.jpg",
      sizeBytes: bytes.length,
      mimeType: "image/jpeg",
      widthPx: 400,
      heightPx: 600,
    });
    expect(row!.exifTakenAt?.toISOString()).toBe("2026-03-14T09:29:00.000Z");
    expect(row!.thumbnailKey).toBeTruthy();
    expect(await storedKeys()).toEqual(expect.arrayContaining([outcome.key, row!.thumbnailKey]));

    // The thumbnail is small, upright (portrait, as orientation 6 turns the landscape frame) and WebP.
    const thumb = await getImage({ photoId: alicePhotoId, userId: alice.user.id, variant: "thumbnail" });
    expect(thumb.status).toBe(307);
    const thumbBytes = Buffer.from(await (await fetch(thumb.headers.get("location")!)).arrayBuffer());
    const meta = await sharp(thumbBytes).metadata();
    expect(meta.format).toBe("webp");
    expect(meta.height).toBe(320);
    expect(meta.width).toBeLessThan(320);
  });

  it("refuses a non-image renamed .jpg, a truncated JPEG and an over-pixel image, and deletes each from the store", async () => {
    const observationId = await createObservation(alice);
    const full = await makeDiskJpeg();
    const bomb = new Uint8Array(64);
    bomb.set([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
    new DataView(bomb.buffer).setUint32(16, 20_000);
    new DataView(bomb.buffer).setUint32(20, 20_000);
    const cases = [
      {
        name: "notes.jpg",
        bytes: new TextEncoder().encode("Clear sky, 4 groups. Not a picture at all."),
        message: /not a JPEG, PNG, WebP or TIFF/,
      },
      { name: "cut.jpg", bytes: full.slice(0, Math.floor(full.length * 0.6)), message: /cut off/ },
      {
        name: "bomb.png",
        bytes: bomb,
        type: "image/png",
        message: /20000 × 20000 pixels .*limit is 50 megapixels/,
      },
    ];
    for (const c of cases) {
      const outcome = await upload({
        userId: alice.user.id,
        observationId,
        bytes: c.bytes,
        name: c.name,
        type: c.type,
      });
      expect(outcome.putStatus).toBe(200);
      expect(outcome.serverData).toEqual({ ok: false, message: expect.stringMatching(c.message) });
      expect(await storedKeys()).not.toContain(outcome.key);
    }
    expect(await getDb().select().from(photos).where(eq(photos.observationId, observationId))).toEqual([]);
  });

  it("refuses an oversize file before it is sent", async () => {
    const observationId = await createObservation(alice);
    const outcome = await upload({
      userId: alice.user.id,
      observationId,
      bytes: new Uint8Array(10),
      declaredSize: 26 * 1024 * 1024,
    });
    expect(outcome.status).toBe(413);
    expect(outcome.message).toMatch(/limit is 25\.0 MB/);
  });

  it("refuses someone signed out, someone without a Logbook, and someone else's observation", async () => {
    const observationId = await createObservation(alice);
    const bytes = await makeDiskJpeg();
    expect(await upload({ observationId, bytes })).toMatchObject({
      status: 403,
      message: "Sign in to add photos.",
    });
    expect(await upload({ userId: coordinator.user.id, observationId, bytes })).toMatchObject({
      status: 403,
      message: "Only observers and students can add photos.",
    });
    expect(await upload({ userId: bob.user.id, observationId, bytes })).toMatchObject({
      status: 404,
      message: "No such observation in your Logbook.",
    });
  });

  it("refuses a forged or expired upload signature at the store", async () => {
    const observationId = await createObservation(alice);
    const presign = await routes.uploadthing.POST(
      (await apiRequest("/api/uploadthing?actionType=upload&slug=observationPhoto", {
        method: "POST",
        userId: alice.user.id,
        body: {
          input: { observationId },
          files: [{ name: "a.jpg", size: 10, type: "image/jpeg", lastModified: 0 }],
        },
      })) as never,
    );
    const [presigned] = (await presign.json()) as Array<{ url: string }>;
    const url = presigned!.url;
    const forged = url.replace(
      /signature=hmac-sha256%3D([0-9a-f])/,
      (_match: string, c: string) => `signature=hmac-sha256%3D${c === "0" ? "1" : "0"}`,
    );
    const expired = url.replace(/expires=\d+/, `expires=${Date.now() - 1000}`);
    for (const [bad, message] of [
      [forged, "Invalid signature"],
      [expired, "Invalid signature"], // changing expires breaks the signature too: the URL cannot be extended
    ] as const) {
      const form = new FormData();
      form.append("file", new Blob([new Uint8Array(10)]), "a.jpg");
      const put = await fetch(bad, { method: "PUT", headers: { Range: "bytes=0-" }, body: form });
      expect(put.status).toBe(403);
      expect(await put.json()).toEqual({ error: message });
    }
  });

  it("answers a completion callback with a bad signature with 400", async () => {
    const body = JSON.stringify({ status: "uploaded", file: { key: "x" }, origin: store.url, metadata: {} });
    const response = await routes.uploadthing.POST(
      new Request("http://127.0.0.1/api/uploadthing?slug=observationPhoto", {
        method: "POST",
        headers: {
          "content-type": "application/json",
          "uploadthing-hook": "callback",
          "x-uploadthing-signature": "hmac-sha256=" + "0".repeat(64),
        },
        body,
      }) as never,
    );
    expect(response.status).toBe(400);
    expect(await response.json()).toEqual({ message: "Invalid signature" });
  });
});

describe("who may see a photo", () => {
  it("the owner, a coordinator and the student's educator get a short-lived signed link; others get 404", async () => {
    const ownerLink = await getImage({ photoId: alicePhotoId, userId: alice.user.id, variant: "original" });
    expect(ownerLink.status).toBe(307);
    const signed = ownerLink.headers.get("location")!;
    expect(signed).toMatch(/[?&]expires=\d+.*signature=/);
    expect((await fetch(signed)).status).toBe(200);
    expect((await getImage({ photoId: alicePhotoId, userId: coordinator.user.id })).status).toBe(307);
    expect((await getImage({ photoId: alicePhotoId, userId: bob.user.id })).status).toBe(404);
    expect((await getImage({ photoId: alicePhotoId, userId: educator.user.id })).status).toBe(404);
    expect((await getImage({ photoId: alicePhotoId })).status).toBe(401);

    // Without the app's signature the store refuses the file itself.
    const [row] = await getDb().select().from(photos).where(eq(photos.id, alicePhotoId));
    expect((await fetch(row!.url)).status).toBe(403);
    expect((await fetch(`${store.url}/f/${row!.fileKey}`)).status).toBe(403);

    const studentObservation = await createObservation(student);
    const outcome = await upload({
      userId: student.user.id,
      observationId: studentObservation,
      bytes: await makeDiskJpeg(),
    });
    if (!outcome.serverData?.ok) throw new Error("student upload refused");
    const studentPhoto = outcome.serverData.photoId;
    expect((await getImage({ photoId: studentPhoto, userId: educator.user.id })).status).toBe(307);
    expect((await getImage({ photoId: studentPhoto, userId: otherEducator.user.id })).status).toBe(404);
    expect((await getImage({ photoId: studentPhoto, userId: alice.user.id })).status).toBe(404);

    const facts = await routes.photo.GET(
      await apiRequest(`/api/v1/photos/${studentPhoto}`, { userId: educator.user.id }),
      {
        params: Promise.resolve({ id: studentPhoto }),
      },
    );
    expect(await facts.json()).toMatchObject({
      id: studentPhoto,
      mimeType: "image/jpeg",
      widthPx: 400,
      heightPx: 600,
    });
  });
});

describe("deleting", () => {
  it("deleting an observation deletes its photo files and rows; someone else's answers 404", async () => {
    const [row] = await getDb().select().from(photos).where(eq(photos.id, alicePhotoId));
    const byBob = await routes.observation.DELETE(
      await apiRequest(`/api/v1/observations/${aliceObservationId}`, {
        method: "DELETE",
        userId: bob.user.id,
      }),
      {
        params: Promise.resolve({ id: aliceObservationId }),
      },
    );
    expect(byBob.status).toBe(404);
    expect(await storedKeys()).toContain(row!.fileKey);

    const response = await routes.observation.DELETE(
      await apiRequest(`/api/v1/observations/${aliceObservationId}`, {
        method: "DELETE",
        userId: alice.user.id,
      }),
      { params: Promise.resolve({ id: aliceObservationId }) },
    );
    expect(response.status).toBe(204);
    const keys = await storedKeys();
    expect(keys).not.toContain(row!.fileKey);
    expect(keys).not.toContain(row!.thumbnailKey);
    expect(await getDb().select().from(photos).where(eq(photos.id, alicePhotoId))).toEqual([]);
    expect(await getDb().select().from(observations).where(eq(observations.id, aliceObservationId))).toEqual(
      [],
    );
  });
});

describe("removing a photo", () => {
  it("the owner removes a photo and its files; another observer gets 404 and a coordinator may not remove it", async () => {
    const observationId = await createObservation(alice);
    const outcome = await upload({ userId: alice.user.id, observationId, bytes: await makeDiskJpeg() });
    if (!outcome.serverData?.ok) throw new Error("upload refused");
    const photoId = outcome.serverData.photoId;
    const [row] = await getDb().select().from(photos).where(eq(photos.id, photoId));
    const remove = async (userId: string) =>
      routes.photo.DELETE(await apiRequest(`/api/v1/photos/${photoId}`, { method: "DELETE", userId }), {
        params: Promise.resolve({ id: photoId }),
      });
    expect((await remove(bob.user.id)).status).toBe(404);
    expect((await remove(coordinator.user.id)).status).toBe(403);
    expect((await remove(alice.user.id)).status).toBe(204);
    const keys = await storedKeys();
    expect(keys).not.toContain(row!.fileKey);
    expect(keys).not.toContain(row!.thumbnailKey);
    expect(await getDb().select().from(photos).where(eq(photos.id, photoId))).toEqual([]);
  });
});

describe("when the store is down", () => {
  it("tells the observer, keeps the observation (and refuses to delete one half-way), and a retry works once the store is back", async () => {
    const observationId = await createObservation(alice);
    const bytes = await makeDiskJpeg();
    const photoObservation = await createObservation(alice);
    const stored = await upload({ userId: alice.user.id, observationId: photoObservation, bytes });
    expect(stored.serverData).toMatchObject({ ok: true });
    await store.close();
    try {
      const refused = await upload({ userId: alice.user.id, observationId, bytes });
      expect(refused.status).toBe(500);
      expect(refused.message).toMatch(/photo store is not answering.*count is kept/);
      const kept = await routes.observation.GET(
        await apiRequest(`/api/v1/observations/${observationId}`, { userId: alice.user.id }),
        {
          params: Promise.resolve({ id: observationId }),
        },
      );
      expect(kept.status).toBe(200);
      const deleteWhileDown = await routes.observation.DELETE(
        await apiRequest(`/api/v1/observations/${photoObservation}`, {
          method: "DELETE",
          userId: alice.user.id,
        }),
        { params: Promise.resolve({ id: photoObservation }) },
      );
      expect(deleteWhileDown.status).toBe(503);
      expect(((await deleteWhileDown.json()) as { error: { message: string } }).error.message).toMatch(
        /Nothing was deleted/,
      );
      expect(
        await getDb().select().from(observations).where(eq(observations.id, photoObservation)),
      ).toHaveLength(1);
    } finally {
      store = await startStore(storePort);
    }
    const retried = await upload({ userId: alice.user.id, observationId, bytes });
    expect(retried.serverData).toMatchObject({ ok: true });
  });
});
