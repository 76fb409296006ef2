/**
 * Protocol tests for uploads-fake. Wherever the SDK does the work itself, the
 * real SDK drives the fake: the app side is uploadthing 7.7.4's own
 * `createRouteHandler`, the server API is `UTApi`, and presigned URLs are made
 * by @uploadthing/shared's `generateSignedURL` (the function the SDK uses).
 * Only the browser side is re-enacted with fetch, step for step as
 * uploadthing/client's `uploadFile` does it (HEAD, then PUT with Range).
 */
import { createHash, createHmac } from "node:crypto";
import { mkdtemp, rm, stat } from "node:fs/promises";
import { createServer, request, type IncomingMessage, type Server } from "node:http";
import { tmpdir } from "node:os";
import path from "node:path";
import { generateSignedURL } from "@uploadthing/shared";
import * as Micro from "effect/Micro";
import * as Redacted from "effect/Redacted";
import { createRouteHandler, createUploadthing, UTApi, UTFile } from "uploadthing/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startUploadsHost, type UploadsHost } from "../../uploads-fake/server";
import {
  LOCAL_API_KEY,
  LOCAL_APP_ID,
  LOCAL_UPLOADTHING_TOKEN,
  makeLocalToken,
  parseToken,
} from "../../uploads-fake/token";

const apiKey = LOCAL_API_KEY;
const appId = LOCAL_APP_ID;
const token = LOCAL_UPLOADTHING_TOKEN;

let dataDir: string;
let uploads: UploadsHost;
let ufsHost: string;
let ufsBase: string;

beforeAll(async () => {
  dataDir = await mkdtemp(path.join(tmpdir(), "uploads-fake-"));
  uploads = await startUploadsHost({
    port: 0,
    dataDir,
    apiKey,
    appId,
    quiet: true,
    metadataWaitMs: 2_000,
    serverDataWaitMs: 10_000,
  });
  ufsHost = `localhost:${new URL(uploads.url).port}`;
  ufsBase = `http://${ufsHost}`;
});

afterAll(async () => {
  await uploads.close();
  await rm(dataDir, { recursive: true, force: true });
});

// ---------------------------------------------------------------- helpers

const md5 = (bytes: Uint8Array) => createHash("md5").update(bytes).digest("hex");
const hmac = (text: string) => "hmac-sha256=" + createHmac("sha256", apiKey).update(text).digest("hex");

function bytesOf(size: number, seed = 7): Uint8Array<ArrayBuffer> {
  const bytes = new Uint8Array(size);
  for (let i = 0; i < size; i++) bytes[i] = (i * 31 + seed) % 251;
  return bytes;
}

let keyCounter = 0;
const newKey = () => `testkey${Date.now().toString(36)}${(keyCounter += 1)}`;

/** A presigned URL made by the SDK's own signing function, as `handleUploadAction` calls it. */
async function presign({
  key,
  name,
  size,
  type = "application/octet-stream",
  slug,
  acl,
  ttlInSeconds,
  secret = apiKey,
}: {
  key: string;
  name: string;
  size: number;
  type?: string;
  slug?: string;
  acl?: "public-read" | "private";
  ttlInSeconds?: number;
  secret?: string;
}): Promise<string> {
  return Micro.runPromise(
    generateSignedURL(`${uploads.url}/${key}`, Redacted.make(secret), {
      ...(ttlInSeconds !== undefined ? { ttlInSeconds } : {}),
      data: {
        "x-ut-identifier": appId,
        "x-ut-file-name": name,
        "x-ut-file-size": size,
        "x-ut-file-type": type,
        "x-ut-slug": slug,
        "x-ut-custom-id": undefined,
        "x-ut-content-disposition": "inline",
        "x-ut-acl": acl,
      },
    }),
  );
}

/** The browser's part, as uploadthing/client's `uploadFile` does it: HEAD for the resume point, then PUT the rest. */
async function putLikeBrowser({
  url,
  bytes,
  name,
  type = "application/octet-stream",
}: {
  url: string;
  bytes: Uint8Array;
  name: string;
  type?: string;
}) {
  const head = await fetch(url, { method: "HEAD" });
  const start = parseInt(head.headers.get("x-ut-range-start") ?? "0", 10);
  const form = new FormData();
  form.append("file", new Blob([bytes.slice(start)], { type }), start > 0 ? "blob" : name);
  const response = await fetch(url, {
    method: "PUT",
    headers: { Range: `bytes=${start}-`, "x-uploadthing-version": "7.7.4" },
    body: form,
  });
  return { start, status: response.status, json: (await response.json()) as Record<string, unknown> };
}

/** Peeks at the fake's partial-upload file (its own storage layout) so the test needs no timing guesses. */
async function waitForPartialBytes({ key, atLeast }: { key: string; atLeast: number }): Promise<void> {
  for (let tries = 0; tries < 200; tries++) {
    const size = await stat(path.join(dataDir, "partial", key)).then(
      (s) => s.size,
      () => 0,
    );
    if (size >= atLeast) return;
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
  throw new Error(`partial upload of ${key} never reached ${atLeast} bytes`);
}

function listen(server: Server): Promise<string> {
  return new Promise((resolve) =>
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      resolve(`http://127.0.0.1:${typeof address === "object" && address ? address.port : 0}`);
    }),
  );
}

async function readBody(req: IncomingMessage): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of req) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString("utf8");
}

/** The app: the SDK's own route handler behind a node:http server, as Next.js would host it. */
async function startSdkApp({ isDev }: { isDev: boolean }) {
  const completed: Array<{ file: Record<string, unknown>; metadata: Record<string, unknown> }> = [];
  const f = createUploadthing();
  const router = {
    observationPhoto: f({ image: { maxFileSize: "4MB" } })
      .middleware(() => ({ observerId: "observer-7" }))
      .onUploadComplete(({ file, metadata }) => {
        completed.push({ file: { ...file }, metadata });
        return { storedFor: metadata.observerId, key: file.key };
      }),
  };
  const server = createServer((req, res) => {
    void (async () => {
      const body = req.method === "POST" ? await readBody(req) : undefined;
      const headers = new Headers();
      for (const [name, value] of Object.entries(req.headers))
        if (typeof value === "string") headers.set(name, value);
      const response = await handler(
        new Request(new URL(req.url ?? "/", appUrl), { method: req.method, headers, body }),
      );
      res.writeHead(response.status, Object.fromEntries(response.headers));
      res.end(Buffer.from(await response.arrayBuffer()));
    })();
  });
  const appUrl = await listen(server);
  const handler = createRouteHandler({
    router,
    config: {
      token,
      ingestUrl: uploads.url,
      callbackUrl: `${appUrl}/api/uploadthing`,
      isDev,
      logLevel: "Error",
    },
  });
  return {
    url: appUrl,
    completed,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

async function requestPresigned({
  appUrl,
  name,
  size,
  type,
}: {
  appUrl: string;
  name: string;
  size: number;
  type: string;
}) {
  const response = await fetch(`${appUrl}/api/uploadthing?actionType=upload&slug=observationPhoto`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ input: null, files: [{ name, size, type, lastModified: Date.now() }] }),
  });
  expect(response.status).toBe(200);
  const presigneds = (await response.json()) as Array<{
    url: string;
    key: string;
    name: string;
    customId: string | null;
  }>;
  expect(presigneds).toHaveLength(1);
  return presigneds[0]!;
}

function utapi(overrides: { token?: string } = {}) {
  return new UTApi({
    token: overrides.token ?? token,
    apiUrl: uploads.url,
    ingestUrl: uploads.url,
    ufsHost,
    ufsAppIdLocation: "path",
    logLevel: "Error",
  });
}

// ---------------------------------------------------------------- tests

describe("token", () => {
  it("the fixed local token is the padded base64 the SDK decodes, and UTApi accepts it", async () => {
    expect(makeLocalToken({ apiKey, appId })).toBe(LOCAL_UPLOADTHING_TOKEN);
    expect(LOCAL_UPLOADTHING_TOKEN.length % 4).toBe(0);
    expect(parseToken(LOCAL_UPLOADTHING_TOKEN)).toEqual({ apiKey, appId, regions: ["local"] });
    expect(() => makeLocalToken({ apiKey: "pk_nope", appId })).toThrow(/sk_/);
    await expect(utapi().listFiles()).resolves.toHaveProperty("files");
  });
});

describe("uploads through the app's file route (SDK route handler)", () => {
  for (const isDev of [false, true]) {
    it(`${isDev ? "dev stream" : "callback"} mode: stores the bytes, runs onUploadComplete, returns its serverData`, async () => {
      const app = await startSdkApp({ isDev });
      try {
        const bytes = bytesOf(150_000, isDev ? 3 : 5);
        const name = `disk ${isDev ? "dev" : "prod"} äö.png`;
        const presigned = await requestPresigned({
          appUrl: app.url,
          name,
          size: bytes.length,
          type: "image/png",
        });
        expect(presigned.url.startsWith(`${uploads.url}/${presigned.key}?`)).toBe(true);

        const put = await putLikeBrowser({ url: presigned.url, bytes, name, type: "image/png" });
        expect(put.status).toBe(200);
        expect(put.json).not.toHaveProperty("error");
        expect(put.json.fileHash).toBe(md5(bytes));
        expect(put.json.ufsUrl).toBe(`${ufsBase}/a/${appId}/${presigned.key}`);
        expect(put.json.serverData).toEqual({ storedFor: "observer-7", key: presigned.key });

        expect(app.completed).toHaveLength(1);
        const { file, metadata } = app.completed[0]!;
        expect(metadata).toEqual({ observerId: "observer-7" });
        expect(file).toMatchObject({
          key: presigned.key,
          name,
          size: bytes.length,
          type: "image/png",
          customId: null,
        });
        expect(file.fileHash).toBe(md5(bytes));

        const served = await fetch(put.json.ufsUrl as string);
        expect(served.status).toBe(200);
        expect(served.headers.get("content-type")).toBe("image/png");
        expect(new Uint8Array(await served.arrayBuffer())).toEqual(bytes);
        const viaF = await fetch(`${ufsBase}/f/${presigned.key}`);
        expect(md5(new Uint8Array(await viaF.arrayBuffer()))).toBe(md5(bytes));
      } finally {
        await app.close();
      }
    });
  }
});

describe("completion callback", () => {
  it("posts to callbackUrl?slug= with uploadthing-hook and an HMAC of the raw body, then waits for /callback-result", async () => {
    const seen: Array<{ url: string; hook?: string; signature?: string; raw: string }> = [];
    const appServer = createServer((req, res) => {
      void (async () => {
        const raw = await readBody(req);
        seen.push({
          url: req.url ?? "",
          hook: req.headers["uploadthing-hook"] as string,
          signature: req.headers["x-uploadthing-signature"] as string,
          raw,
        });
        const body = JSON.parse(raw) as { file: { key: string }; origin: string };
        // Like the SDK outside dev: answer the callback only after reporting the result.
        const result = await fetch(`${body.origin}/callback-result`, {
          method: "POST",
          headers: { "content-type": "application/json", "x-uploadthing-api-key": apiKey },
          body: JSON.stringify({ fileKey: body.file.key, callbackData: { thumbnail: "ok" } }),
        });
        expect(await result.json()).toEqual({ ok: true });
        res.writeHead(200, { "content-type": "application/json" }).end("null");
      })();
    });
    const appUrl = await listen(appServer);
    try {
      const key = newKey();
      const bytes = bytesOf(2_000);
      const registered = await fetch(`${uploads.url}/route-metadata`, {
        method: "POST",
        headers: { "content-type": "application/json", "x-uploadthing-api-key": apiKey },
        body: JSON.stringify({
          fileKeys: [key],
          metadata: { observerId: "o-1" },
          isDev: false,
          callbackUrl: `${appUrl}/api/uploadthing`,
          callbackSlug: "observationPhoto",
          awaitServerData: true,
        }),
      });
      expect(await registered.json()).toEqual({ ok: true });

      const url = await presign({ key, name: "a.bin", size: bytes.length, slug: "observationPhoto" });
      const put = await putLikeBrowser({ url, bytes, name: "a.bin" });
      expect(put.json.serverData).toEqual({ thumbnail: "ok" });

      expect(seen).toHaveLength(1);
      const call = seen[0]!;
      expect(call.url).toBe("/api/uploadthing?slug=observationPhoto");
      expect(call.hook).toBe("callback");
      expect(call.signature).toBe(hmac(call.raw));
      expect(JSON.parse(call.raw)).toEqual({
        status: "uploaded",
        file: {
          name: "a.bin",
          size: bytes.length,
          type: "application/octet-stream",
          customId: null,
          key,
          url: `${ufsBase}/f/${key}`,
          appUrl: `${ufsBase}/a/${appId}/${key}`,
          ufsUrl: `${ufsBase}/a/${appId}/${key}`,
          fileHash: md5(bytes),
        },
        origin: uploads.url,
        metadata: { observerId: "o-1" },
      });
    } finally {
      await new Promise<void>((resolve) => appServer.close(() => resolve()));
    }
  });

  it("dev mode streams one signed JSON line per key and closes the stream when every key is reported", async () => {
    const keys = [newKey(), newKey()];
    const response = await fetch(`${uploads.url}/route-metadata`, {
      method: "POST",
      headers: { "content-type": "application/json", "x-uploadthing-api-key": apiKey },
      body: JSON.stringify({
        fileKeys: keys,
        metadata: {},
        isDev: true,
        callbackUrl: "http://127.0.0.1:9/api/uploadthing",
        callbackSlug: "observationPhoto",
        awaitServerData: false,
      }),
    });
    expect(response.status).toBe(200);
    const streamText = response.text();
    for (const key of keys) {
      const bytes = bytesOf(1_000, key.length);
      const url = await presign({ key, name: `${key}.bin`, size: bytes.length, slug: "observationPhoto" });
      const put = await putLikeBrowser({ url, bytes, name: `${key}.bin` });
      expect(put.json.serverData).toBeNull();
    }
    const text = await streamText; // resolves only because the host ends the stream
    expect(text.endsWith("\n")).toBe(true);
    const lines = text
      .trimEnd()
      .split("\n")
      .map((line) => JSON.parse(line) as Record<string, string>);
    expect(lines.map((l) => (JSON.parse(l.payload!) as { file: { key: string } }).file.key)).toEqual(keys);
    for (const line of lines) {
      expect(Object.keys(line).sort()).toEqual(["hook", "payload", "signature"]);
      expect(line.hook).toBe("callback");
      expect(line.signature).toBe(hmac(line.payload!));
    }
  });
});

describe("failed uploads", () => {
  it("reports a signed upload with the wrong size to the app as an error hook", async () => {
    const key = newKey();
    const response = await fetch(`${uploads.url}/route-metadata`, {
      method: "POST",
      headers: { "content-type": "application/json", "x-uploadthing-api-key": apiKey },
      body: JSON.stringify({
        fileKeys: [key],
        metadata: {},
        isDev: true,
        callbackUrl: "http://127.0.0.1:9/api/uploadthing",
        callbackSlug: "observationPhoto",
        awaitServerData: true,
      }),
    });
    const streamText = response.text();
    const url = await presign({ key, name: "short.bin", size: 100, slug: "observationPhoto" });
    const put = await putLikeBrowser({ url, bytes: bytesOf(5_000), name: "short.bin" });
    expect(put.status).toBe(400);
    expect(put.json.error).toMatch(/larger than the 100 bytes/);
    const [line] = (await streamText)
      .trimEnd()
      .split("\n")
      .map((l) => JSON.parse(l) as Record<string, string>);
    expect(line!.hook).toBe("error");
    expect(line!.signature).toBe(hmac(line!.payload!));
    expect(JSON.parse(line!.payload!)).toEqual({ fileKey: key, error: expect.stringMatching(/larger/) });
  });

  it("fails the PUT with an error when the app refuses the callback", async () => {
    const appServer = createServer((req, res) => {
      req.resume();
      res.writeHead(400, { "content-type": "application/json" }).end('{"message":"Invalid signature"}');
    });
    const appUrl = await listen(appServer);
    try {
      const key = newKey();
      await fetch(`${uploads.url}/route-metadata`, {
        method: "POST",
        headers: { "content-type": "application/json", "x-uploadthing-api-key": apiKey },
        body: JSON.stringify({
          fileKeys: [key],
          metadata: {},
          isDev: false,
          callbackUrl: `${appUrl}/api/uploadthing`,
          callbackSlug: "observationPhoto",
          awaitServerData: true,
        }),
      });
      const url = await presign({ key, name: "x.bin", size: 10, slug: "observationPhoto" });
      const put = await putLikeBrowser({ url, bytes: bytesOf(10), name: "x.bin" });
      expect(put.status).toBe(500);
      expect(put.json.error).toMatch(/callback hook .* failed: answered 400/);
    } finally {
      await new Promise<void>((resolve) => appServer.close(() => resolve()));
    }
  });
});

describe("presigned URL signature", () => {
  it("accepts the SDK's signature and refuses forged, tampered, foreign-key and expired URLs with 403 JSON", async () => {
    const key = newKey();
    const bytes = bytesOf(500);
    const good = await presign({ key, name: "s.bin", size: bytes.length });
    expect((await fetch(good, { method: "HEAD" })).status).toBe(200);

    const hex = /signature=hmac-sha256%3D([0-9a-f]{64})$/.exec(good)![1]!;
    const forged = good.replace(hex, (hex[0] === "a" ? "b" : "a") + hex.slice(1));
    const tampered = good.replace(`x-ut-file-size=${bytes.length}`, "x-ut-file-size=1");
    const foreign = await presign({ key, name: "s.bin", size: bytes.length, secret: "sk_someone_else" });
    const expired = await presign({ key, name: "s.bin", size: bytes.length, ttlInSeconds: -60 });
    for (const [url, message] of [
      [forged, "Invalid signature"],
      [tampered, "Invalid signature"],
      [foreign, "Invalid signature"],
      [expired, "URL expired"],
    ] as const) {
      const put = await putLikeBrowser({ url, bytes, name: "s.bin" });
      expect(put.status).toBe(403);
      expect(put.json).toEqual({ error: message });
    }
    expect((await putLikeBrowser({ url: good, bytes, name: "s.bin" })).status).toBe(200);
  });

  it("refuses a PUT whose signed size is over the 26 MB limit with 413", async () => {
    const url = await presign({ key: newKey(), name: "huge.bin", size: 27 * 1024 * 1024 });
    const put = await putLikeBrowser({ url, bytes: bytesOf(10), name: "huge.bin" });
    expect(put.status).toBe(413);
    expect(put.json.error).toMatch(/refused/);
  });
});

describe("CORS", () => {
  it("answers the preflight for HEAD and PUT and exposes x-ut-range-start", async () => {
    const url = await presign({ key: newKey(), name: "c.bin", size: 10 });
    const preflight = await fetch(url, {
      method: "OPTIONS",
      headers: {
        Origin: "http://localhost:3000",
        "Access-Control-Request-Method": "PUT",
        "Access-Control-Request-Headers": "b3,content-type,range,traceparent,x-uploadthing-version",
      },
    });
    expect(preflight.status).toBe(204);
    expect(preflight.headers.get("access-control-allow-origin")).toBe("*");
    const methods = preflight.headers.get("access-control-allow-methods") ?? "";
    expect(methods).toContain("PUT");
    expect(methods).toContain("HEAD");
    const allowed = (preflight.headers.get("access-control-allow-headers") ?? "").split(/,\s*/);
    for (const header of ["b3", "traceparent", "x-uploadthing-version", "range", "content-type"]) {
      expect(allowed).toContain(header);
    }
    const head = await fetch(url, { method: "HEAD", headers: { Origin: "http://localhost:3000" } });
    expect(head.headers.get("access-control-allow-origin")).toBe("*");
    expect(head.headers.get("access-control-expose-headers")).toContain("x-ut-range-start");
    expect(head.headers.get("x-ut-range-start")).toBe("0");
  });
});

describe("resume", () => {
  it("keeps the bytes of an interrupted PUT, reports them via HEAD and accepts the rest with Range", async () => {
    const key = newKey();
    const bytes = bytesOf(1_200_000, 11);
    const url = await presign({ key, name: "long.bin", size: bytes.length });
    const half = 600_000;

    // First attempt: send half the file, then drop the connection.
    await new Promise<void>((resolve) => {
      const boundary = "----resumeBoundary";
      const req = request(url, {
        method: "PUT",
        headers: { "content-type": `multipart/form-data; boundary=${boundary}`, range: "bytes=0-" },
      });
      req.on("error", () => resolve());
      req.write(
        `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="long.bin"\r\n` +
          "Content-Type: application/octet-stream\r\n\r\n",
      );
      req.write(bytes.subarray(0, half), () => {
        // Drop the connection only once the host has stored what was sent, as a paused browser upload would.
        void waitForPartialBytes({ key, atLeast: half - 100 }).then(() => {
          req.destroy();
          setTimeout(resolve, 100);
        });
      });
    });

    const head = await fetch(url, { method: "HEAD" });
    const start = Number(head.headers.get("x-ut-range-start"));
    expect(start).toBeGreaterThan(half - 100); // only a possible delimiter prefix is held back
    expect(start).toBeLessThanOrEqual(half);

    const put = await putLikeBrowser({ url, bytes, name: "long.bin" });
    expect(put.start).toBe(start);
    expect(put.status).toBe(200);
    expect(put.json.fileHash).toBe(md5(bytes));
    const served = await fetch(`${ufsBase}/f/${key}`);
    expect(md5(new Uint8Array(await served.arrayBuffer()))).toBe(md5(bytes));

    // A later HEAD on a finished upload reports the whole file.
    expect((await fetch(url, { method: "HEAD" })).headers.get("x-ut-range-start")).toBe(String(bytes.length));
  });
});

describe("server API through UTApi", () => {
  it("uploads, lists, renames, deletes", async () => {
    const api = utapi();
    const bytes = bytesOf(4_321, 17);
    const uploaded = await api.uploadFiles(new UTFile([bytes], "server side.txt", { customId: "obs-42" }));
    expect(uploaded.error).toBeNull();
    const key = uploaded.data!.key;
    expect(uploaded.data!.ufsUrl).toBe(`${ufsBase}/a/${appId}/${key}`);
    expect(uploaded.data!.fileHash).toBe(md5(bytes));
    expect(new Uint8Array(await (await fetch(uploaded.data!.ufsUrl)).arrayBuffer())).toEqual(bytes);

    const listed = await api.listFiles();
    expect(listed.files.find((f) => f.key === key)).toMatchObject({
      customId: "obs-42",
      name: "server side.txt",
      size: bytes.length,
      status: "Uploaded",
    });
    expect((await api.listFiles({ limit: 1 })).files).toHaveLength(1);

    expect(await api.renameFiles({ customId: "obs-42", newName: "renamed.txt" })).toEqual({ success: true });
    expect((await api.listFiles()).files.find((f) => f.key === key)?.name).toBe("renamed.txt");
    expect((await api.getFileUrls(key)).data).toEqual([{ key, url: `${ufsBase}/f/${key}` }]);

    expect(await api.deleteFiles(key)).toEqual({ success: true, deletedCount: 1 });
    expect((await fetch(uploaded.data!.ufsUrl)).status).toBe(404);
    expect((await api.listFiles()).files.some((f) => f.key === key)).toBe(false);
    expect(await api.deleteFiles(key)).toEqual({ success: true, deletedCount: 0 });
  });

  it("private files need a signed URL as generateSignedURL or getSignedURL make it", async () => {
    const api = utapi();
    const bytes = bytesOf(999, 23);
    const uploaded = await api.uploadFiles(new UTFile([bytes], "private.bin"), { acl: "private" });
    const key = uploaded.data!.key;
    expect((await fetch(uploaded.data!.ufsUrl)).status).toBe(403);

    const { ufsUrl } = await api.generateSignedURL(key, { expiresIn: 60 });
    expect(ufsUrl.startsWith(`${ufsBase}/a/${appId}/${key}?expires=`)).toBe(true);
    expect(new Uint8Array(await (await fetch(ufsUrl)).arrayBuffer())).toEqual(bytes);

    const requested = await api.getSignedURL(key, { expiresIn: 60 });
    expect((await fetch(requested.ufsUrl)).status).toBe(200);
    expect((await fetch(requested.url)).status).toBe(200);

    const expired = await Micro.runPromise(
      generateSignedURL(`${ufsBase}/a/${appId}/${key}`, Redacted.make(apiKey), { ttlInSeconds: -1 }),
    );
    expect((await fetch(expired)).status).toBe(403);

    expect(await api.updateACL(key, "public-read")).toEqual({ success: true });
    expect((await fetch(uploaded.data!.ufsUrl)).status).toBe(200);
  });

  it("refuses a wrong or missing x-uploadthing-api-key", async () => {
    const stranger = utapi({ token: makeLocalToken({ apiKey: "sk_wrong_key", appId }) });
    await expect(stranger.listFiles()).rejects.toThrow();
    const bare = await fetch(`${uploads.url}/v6/listFiles`, { method: "POST", body: "{}" });
    expect(bare.status).toBe(401);
    expect(await bare.json()).toEqual({ error: "Missing or invalid x-uploadthing-api-key" });
  });
});
