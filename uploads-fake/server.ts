/**
 * A local stand-in for the hosted uploadthing storage service, speaking the
 * protocol the uploadthing 7.7.4 SDK expects (see README.md beside this file).
 * The app keeps using the SDK unchanged; only its environment points here.
 *
 * Run: `npx tsx uploads-fake/server.ts` (port UPLOADS_FAKE_PORT, default 3100).
 */
import { createHash, createHmac, randomUUID, timingSafeEqual } from "node:crypto";
import { createReadStream } from "node:fs";
import { mkdir, open, readFile, rename, rm, stat, truncate, writeFile } from "node:fs/promises";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { LOCAL_UPLOADTHING_TOKEN, parseToken } from "./token";

export type UploadsHostOptions = {
  port: number;
  host?: string;
  dataDir: string;
  apiKey: string;
  appId: string;
  /** Base of the file links handed out (url, appUrl, ufsUrl). Default `http://localhost:{port}`, matching UPLOADTHING_UFS_HOST=localhost:{port}. */
  publicBaseUrl?: string;
  /** No per-request log lines. */
  quiet?: boolean;
  log?: (line: string) => void;
  /** How long a route upload's PUT waits for POST /route-metadata (in dev mode the app sends it concurrently). */
  metadataWaitMs?: number;
  /** How long a PUT waits for the app's POST /callback-result when the route awaits server data. */
  serverDataWaitMs?: number;
};

export type UploadsHost = { url: string; close: () => Promise<void> };

/** Largest PUT body accepted (multipart overhead included). */
const MAX_PUT_BODY_BYTES = 26 * 1024 * 1024;
const MAX_JSON_BODY_BYTES = 1024 * 1024;
/** The longest a dev-mode JSON-lines stream stays open waiting for uploads (the SDK's default presigned TTL). */
const DEV_STREAM_MAX_MS = 60 * 60 * 1000;
const REGISTRATION_MAX_AGE_MS = 2 * 60 * 60 * 1000;
const SIGNATURE_PREFIX = "hmac-sha256=";
/** Keys come from the SDK's generateKey (sqids letters and digits); anything else never reaches the disk. */
const KEY_PATTERN = /^[A-Za-z0-9_-][A-Za-z0-9._-]{0,199}$/;
const CORS_ALLOW_HEADERS = "b3, traceparent, x-uploadthing-version, range, content-type";

type Acl = "public-read" | "private";
type ContentDisposition = "inline" | "attachment";

type FileRecord = {
  id: string;
  key: string;
  name: string;
  size: number;
  type: string;
  customId: string | null;
  acl: Acl;
  contentDisposition: ContentDisposition;
  fileHash: string;
  uploadedAt: number;
};

/** What POST /route-metadata registers for the keys of one upload request. */
type Registration = {
  metadata: Record<string, unknown>;
  isDev: boolean;
  callbackUrl: string;
  callbackSlug: string;
  awaitServerData: boolean;
  unreported: Set<string>;
  stream: ServerResponse | null;
  registeredAt: number;
};

type CallbackResult = { ok: true; callbackData: unknown } | { ok: false; error: string };

/** The fake's one error type: a status and a message sent as `{ error }` (the shape the SDK reads). */
class HostError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly headers: Record<string, string> = {},
  ) {
    super(message);
    this.name = "HostError";
  }
}

// ---------------------------------------------------------------- signing

function hmacHex({ secret, text }: { secret: string; text: string }): string {
  return createHmac("sha256", secret).update(text, "utf8").digest("hex");
}

function sameText(a: string, b: string): boolean {
  const left = Buffer.from(a);
  const right = Buffer.from(b);
  return left.length === right.length && timingSafeEqual(left, right);
}

/** Same steps as `generateSignedURL` in @uploadthing/shared 7.1.10: append `expires`, sign the href, append `signature`. */
function signUrl({ url, apiKey, ttlSeconds }: { url: string; apiKey: string; ttlSeconds: number }): string {
  const signed = new URL(url);
  signed.searchParams.append("expires", String(Date.now() + ttlSeconds * 1000));
  signed.searchParams.append(
    "signature",
    SIGNATURE_PREFIX + hmacHex({ secret: apiKey, text: signed.toString() }),
  );
  return signed.href;
}

/** The origins a signed URL may have been built with: what the client addressed (Host) and the configured public base. */
function candidateBases({ req, publicBaseUrl }: { req: IncomingMessage; publicBaseUrl: string }): string[] {
  const host = firstHeader(req.headers["x-forwarded-host"]) ?? req.headers.host;
  const proto = firstHeader(req.headers["x-forwarded-proto"]) ?? "http";
  const bases = [publicBaseUrl];
  if (host) bases.unshift(`${proto}://${host}`);
  return [
    ...new Set(
      bases.flatMap((base) => {
        try {
          return [new URL(base).href.replace(/\/$/, "")];
        } catch {
          return [];
        }
      }),
    ),
  ];
}

/**
 * Checks a URL signed as the SDK signs it: lowercase hex HMAC-SHA256 (apiKey)
 * over the full URL text before `&signature=`, and `expires` (ms) not passed.
 * Returns the signed query parameters.
 */
function verifySignedUrl({
  req,
  apiKey,
  publicBaseUrl,
}: {
  req: IncomingMessage;
  apiKey: string;
  publicBaseUrl: string;
}): URLSearchParams {
  const raw = req.url ?? "/";
  const at = raw.lastIndexOf("&signature=");
  if (at === -1) throw new HostError(403, "Missing signature");
  const signedPart = raw.slice(0, at);
  const encodedSignature = raw.slice(at + "&signature=".length);
  if (encodedSignature.includes("&")) throw new HostError(403, "Invalid signature");
  let signature: string;
  try {
    signature = decodeURIComponent(encodedSignature);
  } catch {
    throw new HostError(403, "Invalid signature");
  }
  if (!signature.startsWith(SIGNATURE_PREFIX)) throw new HostError(403, "Invalid signature");
  const valid = candidateBases({ req, publicBaseUrl }).some((base) =>
    sameText(signature, SIGNATURE_PREFIX + hmacHex({ secret: apiKey, text: base + signedPart })),
  );
  if (!valid) throw new HostError(403, "Invalid signature");
  const params = new URL(signedPart, "http://signed.invalid").searchParams;
  const expiresMs = Number(params.get("expires"));
  if (!Number.isFinite(expiresMs)) throw new HostError(403, "Missing expiry");
  if (Date.now() > expiresMs) throw new HostError(403, "URL expired");
  return params;
}

type PresignedFields = {
  name: string;
  size: number;
  type: string;
  slug: string | null;
  customId: string | null;
  contentDisposition: ContentDisposition;
  acl: Acl;
};

/** x-ut-* values are encodeURIComponent'd by the SDK and then encoded again by URLSearchParams: decode twice. */
function readPresignedFields({ params, appId }: { params: URLSearchParams; appId: string }): PresignedFields {
  const read = (name: string): string | null => {
    const value = params.get(name);
    if (value === null) return null;
    try {
      return decodeURIComponent(value);
    } catch {
      throw new HostError(400, `Malformed ${name}`);
    }
  };
  if (read("x-ut-identifier") !== appId) throw new HostError(403, "URL was signed for another app");
  const size = Number(read("x-ut-file-size"));
  if (!Number.isSafeInteger(size) || size < 0) throw new HostError(400, "Missing or invalid x-ut-file-size");
  const disposition = read("x-ut-content-disposition") ?? "inline";
  const acl = read("x-ut-acl") ?? "public-read";
  if (disposition !== "inline" && disposition !== "attachment")
    throw new HostError(400, "Invalid x-ut-content-disposition");
  if (acl !== "public-read" && acl !== "private") throw new HostError(400, "Invalid x-ut-acl");
  return {
    name: read("x-ut-file-name") ?? "file",
    size,
    type: read("x-ut-file-type") ?? "",
    slug: read("x-ut-slug"),
    customId: read("x-ut-custom-id"),
    contentDisposition: disposition,
    acl,
  };
}

// ---------------------------------------------------------------- http helpers

function firstHeader(value: string | string[] | undefined): string | undefined {
  return Array.isArray(value) ? value[0] : value;
}

function sendJson(
  res: ServerResponse,
  status: number,
  body: unknown,
  headers: Record<string, string> = {},
): void {
  if (res.headersSent) {
    res.end();
    return;
  }
  const text = JSON.stringify(body);
  res.writeHead(status, {
    ...headers,
    "content-type": "application/json; charset=utf-8",
    "content-length": Buffer.byteLength(text),
  });
  res.end(text);
}

/**
 * Feeds the request body to `onChunk` one chunk at a time (paused while it
 * works). Unlike `for await`, a failure here leaves the socket open, so the
 * error can still be answered; it rejects if the client goes away.
 */
function pumpBody({
  req,
  onChunk,
}: {
  req: IncomingMessage;
  onChunk: (chunk: Buffer) => Promise<void> | void;
}): Promise<void> {
  return new Promise((resolve, reject) => {
    let settled = false;
    // Chunks are handled strictly in order; "end" and "close" wait for the last one.
    let handled: Promise<void> = Promise.resolve();
    const settle = (error?: unknown) => {
      if (settled) return;
      settled = true;
      req.off("data", onData);
      if (error === undefined) resolve();
      else reject(error);
    };
    const onData = (chunk: Buffer) => {
      req.pause();
      handled = handled.then(async () => {
        await onChunk(chunk);
        if (!settled) req.resume();
      });
      handled.catch(settle);
    };
    req.on("data", onData);
    req.once("end", () => handled.then(() => settle(), settle));
    req.once("error", (error) => handled.then(() => settle(error), settle));
    req.once("close", () => {
      if (!req.complete) handled.then(() => settle(new Error("client went away")), settle);
    });
  });
}

async function readJsonBody(req: IncomingMessage): Promise<Record<string, unknown>> {
  const chunks: Buffer[] = [];
  let total = 0;
  await pumpBody({
    req,
    onChunk: (chunk) => {
      total += chunk.length;
      if (total > MAX_JSON_BODY_BYTES) throw new HostError(413, "JSON body too large");
      chunks.push(chunk);
    },
  });
  let parsed: unknown;
  try {
    parsed = JSON.parse(Buffer.concat(chunks).toString("utf8"));
  } catch {
    throw new HostError(400, "Body is not valid JSON");
  }
  if (typeof parsed !== "object" || parsed === null || Array.isArray(parsed))
    throw new HostError(400, "Body must be a JSON object");
  return parsed as Record<string, unknown>;
}

function stringArray(value: unknown, field: string): string[] {
  if (!Array.isArray(value) || !value.every((v) => typeof v === "string"))
    throw new HostError(400, `${field} must be an array of strings`);
  return value;
}

function contentDispositionHeader({
  disposition,
  name,
}: {
  disposition: ContentDisposition;
  name: string;
}): string {
  const ascii = name.replace(/[^\x20-\x7e]|["\\]/g, "_");
  return `${disposition}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(name)}`;
}

// ---------------------------------------------------------------- multipart

function multipartBoundary(contentType: string | undefined): string {
  const match = /^multipart\/form-data\s*;.*?boundary=(?:"([^"]+)"|([^\s;]+))/i.exec(contentType ?? "");
  const boundary = match?.[1] ?? match?.[2];
  if (!boundary) throw new HostError(400, "Expected multipart/form-data with a boundary");
  return boundary;
}

/**
 * Streams the multipart field `file` to `onFileData` as it arrives, so an
 * interrupted upload keeps what it received (the client resumes from
 * `x-ut-range-start`). The last few bytes that could begin a delimiter are
 * held back until the next chunk shows what they are.
 */
async function receiveFileField({
  req,
  boundary,
  onFileData,
}: {
  req: IncomingMessage;
  boundary: string;
  onFileData: (data: Buffer) => Promise<void>;
}): Promise<{ sawFile: boolean }> {
  const firstDelimiter = Buffer.from(`--${boundary}`);
  const delimiter = Buffer.from(`\r\n--${boundary}`);
  let state: "preamble" | "after-delimiter" | "headers" | "body" | "done" = "preamble";
  let buffer: Buffer = Buffer.alloc(0);
  let inFileField = false;
  let sawFile = false;
  let bodyBytes = 0;

  const onChunk = async (chunk: Buffer): Promise<void> => {
    bodyBytes += chunk.length;
    if (bodyBytes > MAX_PUT_BODY_BYTES)
      throw new HostError(413, `Uploads above ${MAX_PUT_BODY_BYTES} bytes (26 MiB) are refused by this host`);
    if (state === "done") return;
    buffer = buffer.length === 0 ? chunk : Buffer.concat([buffer, chunk]);
    for (;;) {
      if (state === "preamble") {
        const at = buffer.indexOf(firstDelimiter);
        if (at === -1) {
          buffer = buffer.subarray(Math.max(0, buffer.length - firstDelimiter.length + 1));
          break;
        }
        buffer = buffer.subarray(at + firstDelimiter.length);
        state = "after-delimiter";
      } else if (state === "after-delimiter") {
        if (buffer.length < 2) break;
        if (buffer[0] === 0x2d && buffer[1] === 0x2d) {
          state = "done";
          break;
        }
        const lineEnd = buffer.indexOf("\r\n");
        if (lineEnd === -1) break;
        buffer = buffer.subarray(lineEnd + 2);
        state = "headers";
      } else if (state === "headers") {
        const end = buffer.indexOf("\r\n\r\n");
        if (end === -1) {
          if (buffer.length > 16 * 1024) throw new HostError(400, "Multipart part headers too long");
          break;
        }
        const headers = buffer.subarray(0, end).toString("utf8");
        inFileField = /^content-disposition:[^\r\n]*;\s*name="file"/im.test(headers);
        sawFile ||= inFileField;
        buffer = buffer.subarray(end + 4);
        state = "body";
      } else if (state === "body") {
        const at = buffer.indexOf(delimiter);
        if (at === -1) {
          const safeLength = buffer.length - (delimiter.length - 1);
          if (safeLength > 0) {
            if (inFileField) await onFileData(buffer.subarray(0, safeLength));
            buffer = buffer.subarray(safeLength);
          }
          break;
        }
        if (inFileField && at > 0) await onFileData(buffer.subarray(0, at));
        buffer = buffer.subarray(at + delimiter.length);
        state = "after-delimiter";
      } else {
        break;
      }
    }
  };
  await pumpBody({ req, onChunk });
  return { sawFile };
}

// ---------------------------------------------------------------- storage

type FileIndex = {
  get: (key: string) => FileRecord | undefined;
  all: () => FileRecord[];
  put: (record: FileRecord) => Promise<void>;
  remove: (key: string) => Promise<void>;
};

async function openFileIndex(dataDir: string): Promise<FileIndex> {
  const indexPath = path.join(dataDir, "index.json");
  const files = new Map<string, FileRecord>();
  try {
    const saved = JSON.parse(await readFile(indexPath, "utf8")) as { files?: Record<string, FileRecord> };
    for (const record of Object.values(saved.files ?? {})) files.set(record.key, record);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== "ENOENT") throw error;
  }
  // Writes are queued so two requests never interleave a rewrite of the index.
  let queue: Promise<void> = Promise.resolve();
  const save = (): Promise<void> => {
    const snapshot = JSON.stringify({ files: Object.fromEntries(files) }, null, 2);
    queue = queue
      .catch(() => undefined)
      .then(async () => {
        const temporary = `${indexPath}.${process.pid}.tmp`;
        await writeFile(temporary, snapshot);
        await rename(temporary, indexPath);
      });
    return queue;
  };
  return {
    get: (key) => files.get(key),
    all: () => [...files.values()],
    put: (record) => {
      files.set(record.key, record);
      return save();
    },
    remove: (key) => {
      files.delete(key);
      return save();
    },
  };
}

async function md5OfFile(filePath: string): Promise<string> {
  const hash = createHash("md5");
  for await (const chunk of createReadStream(filePath)) hash.update(chunk as Buffer);
  return hash.digest("hex");
}

async function sizeOrZero(filePath: string): Promise<number> {
  try {
    return (await stat(filePath)).size;
  } catch {
    return 0;
  }
}

// ---------------------------------------------------------------- the host

export async function startUploadsHost(options: UploadsHostOptions): Promise<UploadsHost> {
  const { port, host = "127.0.0.1", dataDir, apiKey, appId, quiet = false } = options;
  const log = options.log ?? ((line: string) => console.log(line));
  const metadataWaitMs = options.metadataWaitMs ?? 10_000;
  const serverDataWaitMs = options.serverDataWaitMs ?? 60_000;
  const filesDir = path.join(dataDir, "files");
  const partialDir = path.join(dataDir, "partial");
  await mkdir(filesDir, { recursive: true });
  await mkdir(partialDir, { recursive: true });
  const index = await openFileIndex(dataDir);

  const registrations = new Map<string, Registration>();
  const registrationWaiters = new Map<string, Array<() => void>>();
  const resultWaiters = new Map<string, (result: CallbackResult) => void>();
  const activeUploads = new Map<string, Promise<void>>();
  const openStreams = new Set<ServerResponse>();

  // Assigned once listening; `origin` in callbacks, where the app posts /callback-result.
  let selfUrl = "";
  let publicBaseUrl = "";
  const filePath = (key: string) => path.join(filesDir, key);
  const partialPath = (key: string) => path.join(partialDir, key);
  const fileUrls = (key: string) => ({
    url: `${publicBaseUrl}/f/${key}`,
    appUrl: `${publicBaseUrl}/a/${appId}/${key}`,
    ufsUrl: `${publicBaseUrl}/a/${appId}/${key}`,
  });
  const warn = (line: string) => {
    if (!quiet) log(`uploads-fake  warning: ${line}`);
  };

  function requireApiKey(req: IncomingMessage): void {
    const given = firstHeader(req.headers["x-uploadthing-api-key"]);
    if (!given || !sameText(given, apiKey))
      throw new HostError(401, "Missing or invalid x-uploadthing-api-key");
  }

  function requireKey(key: string): string {
    if (!KEY_PATTERN.test(key)) throw new HostError(404, "Not found");
    return key;
  }

  function waitForRegistration(key: string): Promise<Registration | undefined> {
    const known = registrations.get(key);
    if (known) return Promise.resolve(known);
    return new Promise((resolve) => {
      const wake = () => {
        clearTimeout(timer);
        resolve(registrations.get(key));
      };
      const timer = setTimeout(() => {
        const waiting = registrationWaiters.get(key)?.filter((w) => w !== wake) ?? [];
        if (waiting.length > 0) registrationWaiters.set(key, waiting);
        else registrationWaiters.delete(key);
        resolve(undefined);
      }, metadataWaitMs);
      registrationWaiters.set(key, [...(registrationWaiters.get(key) ?? []), wake]);
    });
  }

  function waitForCallbackResult(key: string): Promise<CallbackResult | undefined> {
    return new Promise((resolve) => {
      const timer = setTimeout(() => {
        resultWaiters.delete(key);
        resolve(undefined);
      }, serverDataWaitMs);
      resultWaiters.set(key, (result) => {
        clearTimeout(timer);
        resultWaiters.delete(key);
        resolve(result);
      });
    });
  }

  /** Sends the signed completion (or error) hook: on the dev stream if it is open, else straight to the app. */
  function reportToApp({
    key,
    registration,
    hook,
    payload,
  }: {
    key: string;
    registration: Registration;
    hook: "callback" | "error";
    payload: unknown;
  }): void {
    const body = JSON.stringify(payload);
    const signature = SIGNATURE_PREFIX + hmacHex({ secret: apiKey, text: body });
    registration.unreported.delete(key);
    registrations.delete(key);
    const stream = registration.stream;
    if (registration.isDev && stream && !stream.writableEnded && !stream.destroyed) {
      stream.write(`${JSON.stringify({ payload: body, signature, hook })}\n`);
      if (registration.unreported.size === 0) stream.end();
      return;
    }
    if (registration.isDev)
      warn(`dev stream for ${key} is closed; posting the ${hook} hook to the app directly`);
    const target = new URL(registration.callbackUrl);
    target.searchParams.set("slug", registration.callbackSlug);
    // Not awaited: outside dev the app answers only after it has posted /callback-result back here.
    fetch(target, {
      method: "POST",
      headers: {
        "content-type": "application/json",
        "uploadthing-hook": hook,
        "x-uploadthing-signature": signature,
      },
      body,
      signal: AbortSignal.timeout(serverDataWaitMs + 5_000),
    })
      .then(async (response) => {
        await response.arrayBuffer();
        if (!response.ok) throw new Error(`answered ${response.status}`);
      })
      .catch((error: unknown) => {
        const message = `${hook} hook to ${target.origin}${target.pathname} failed: ${(error as Error).message}`;
        warn(message);
        resultWaiters.get(key)?.({ ok: false, error: message });
      });
  }

  // ---- POST /route-metadata
  async function handleRouteMetadata(req: IncomingMessage, res: ServerResponse): Promise<void> {
    requireApiKey(req);
    const body = await readJsonBody(req);
    const fileKeys = stringArray(body.fileKeys, "fileKeys");
    if (fileKeys.length === 0) throw new HostError(400, "fileKeys must not be empty");
    if (typeof body.callbackUrl !== "string" || !URL.canParse(body.callbackUrl))
      throw new HostError(400, "callbackUrl must be a URL");
    if (typeof body.callbackSlug !== "string") throw new HostError(400, "callbackSlug must be a string");
    const metadata =
      typeof body.metadata === "object" && body.metadata !== null
        ? (body.metadata as Record<string, unknown>)
        : {};
    const registration: Registration = {
      metadata,
      isDev: body.isDev === true,
      callbackUrl: body.callbackUrl,
      callbackSlug: body.callbackSlug,
      awaitServerData: body.awaitServerData !== false,
      unreported: new Set(fileKeys),
      stream: null,
      registeredAt: Date.now(),
    };
    for (const [key, old] of registrations) {
      if (Date.now() - old.registeredAt > REGISTRATION_MAX_AGE_MS) registrations.delete(key);
    }
    for (const key of fileKeys) {
      registrations.set(key, registration);
      for (const wake of registrationWaiters.get(key) ?? []) wake();
      registrationWaiters.delete(key);
    }
    if (!registration.isDev) {
      sendJson(res, 200, { ok: true });
      return;
    }
    // Dev mode: one JSON line per key as its upload completes; closed once every key has been reported.
    res.writeHead(200, { "content-type": "application/x-ndjson", "cache-control": "no-store" });
    res.flushHeaders();
    registration.stream = res;
    openStreams.add(res);
    const timer = setTimeout(() => res.end(), DEV_STREAM_MAX_MS);
    res.on("close", () => {
      clearTimeout(timer);
      openStreams.delete(res);
      if (registration.stream === res) registration.stream = null;
    });
  }

  // ---- POST /callback-result
  async function handleCallbackResult(req: IncomingMessage, res: ServerResponse): Promise<void> {
    requireApiKey(req);
    const body = await readJsonBody(req);
    if (typeof body.fileKey !== "string") throw new HostError(400, "fileKey must be a string");
    const waiter = resultWaiters.get(body.fileKey);
    if (!waiter && !index.get(body.fileKey)) throw new HostError(404, `Unknown file key ${body.fileKey}`);
    // The app reports a failed dev-stream forward as `{ fileKey, error }`.
    waiter?.(
      typeof body.error === "string"
        ? { ok: false, error: body.error }
        : { ok: true, callbackData: body.callbackData ?? null },
    );
    sendJson(res, 200, { ok: true });
  }

  // ---- HEAD /{key}?… (resume point)
  async function handlePresignedHead(req: IncomingMessage, res: ServerResponse, key: string): Promise<void> {
    const fields = readPresignedFields({ params: verifySignedUrl({ req, apiKey, publicBaseUrl }), appId });
    await activeUploads.get(key);
    const rangeStart = index.get(key) ? fields.size : await sizeOrZero(partialPath(key));
    res.writeHead(200, { "x-ut-range-start": String(rangeStart), "content-length": "0" });
    res.end();
  }

  // ---- PUT /{key}?… (multipart field `file`, `Range: bytes=N-`)
  async function handlePresignedPut(req: IncomingMessage, res: ServerResponse, key: string): Promise<void> {
    const fields = readPresignedFields({ params: verifySignedUrl({ req, apiKey, publicBaseUrl }), appId });
    const declaredLength = Number(req.headers["content-length"]);
    if (fields.size > MAX_PUT_BODY_BYTES || declaredLength > MAX_PUT_BODY_BYTES) {
      throw new HostError(413, `Uploads above ${MAX_PUT_BODY_BYTES} bytes (26 MiB) are refused by this host`);
    }
    const done = index.get(key);
    if (done) {
      req.resume();
      sendJson(res, 200, { ...fileUrls(key), fileHash: done.fileHash, serverData: null });
      return;
    }
    const range = req.headers.range ?? "bytes=0-";
    const rangeMatch = /^bytes=(\d+)-$/.exec(range);
    if (!rangeMatch?.[1]) throw new HostError(400, `Unsupported Range header "${range}"`);
    const rangeStart = Number(rangeMatch[1]);
    const boundary = multipartBoundary(req.headers["content-type"]);

    // An interrupted PUT for this key may still be flushing; resume only after it has settled.
    while (activeUploads.has(key)) await activeUploads.get(key);
    let release = () => {};
    activeUploads.set(key, new Promise<void>((resolve) => (release = resolve)));
    let outcome: { stored: number; sawFile: boolean };
    try {
      outcome = await receiveIntoPartial({ req, key, boundary, rangeStart, expectedSize: fields.size });
    } finally {
      activeUploads.delete(key);
      release();
    }
    if (!outcome.sawFile) throw new HostError(400, "Multipart field `file` is missing");
    if (outcome.stored < fields.size) {
      throw new HostError(
        400,
        `Incomplete upload: ${outcome.stored} of ${fields.size} bytes stored; HEAD the URL for x-ut-range-start and resume`,
        {
          "x-ut-range-start": String(outcome.stored),
        },
      );
    }
    await rename(partialPath(key), filePath(key));
    const record: FileRecord = {
      id: randomUUID(),
      key,
      name: fields.name,
      size: outcome.stored,
      type: fields.type,
      customId: fields.customId,
      acl: fields.acl,
      contentDisposition: fields.contentDisposition,
      fileHash: await md5OfFile(filePath(key)),
      uploadedAt: Date.now(),
    };
    await index.put(record);
    const uploaded = { ...fileUrls(key), fileHash: record.fileHash };
    sendJson(res, 200, { ...uploaded, serverData: await completeRouteUpload({ record, slug: fields.slug }) });
  }

  async function receiveIntoPartial({
    req,
    key,
    boundary,
    rangeStart,
    expectedSize,
  }: {
    req: IncomingMessage;
    key: string;
    boundary: string;
    rangeStart: number;
    expectedSize: number;
  }) {
    const stored = await sizeOrZero(partialPath(key));
    if (rangeStart > stored) {
      throw new HostError(416, `Range starts at ${rangeStart} but ${stored} bytes are stored`, {
        "x-ut-range-start": String(stored),
      });
    }
    const handle = await open(partialPath(key), "a");
    let total = rangeStart;
    try {
      // A range below what is stored resends bytes we have: drop ours from there on.
      await truncate(partialPath(key), rangeStart);
      const { sawFile } = await receiveFileField({
        req,
        boundary,
        onFileData: async (data) => {
          if (total + data.length > expectedSize) {
            throw new HostError(400, `File is larger than the ${expectedSize} bytes the URL was signed for`);
          }
          await handle.write(data);
          total += data.length;
        },
      });
      return { stored: total, sawFile };
    } catch (error) {
      if (error instanceof HostError) {
        await rm(partialPath(key), { force: true });
        const registration = registrations.get(key);
        if (registration)
          reportToApp({ key, registration, hook: "error", payload: { fileKey: key, error: error.message } });
        throw error;
      }
      // The client went away mid-upload: keep what arrived so it can resume.
      return { stored: total, sawFile: true };
    } finally {
      await handle.close();
    }
  }

  /** For uploads made through the app's file route (x-ut-slug): run the callback and wait for the app's serverData. */
  async function completeRouteUpload({
    record,
    slug,
  }: {
    record: FileRecord;
    slug: string | null;
  }): Promise<unknown> {
    if (slug === null) return null; // UTApi.uploadFiles: no route, no callback.
    const registration = await waitForRegistration(record.key);
    if (!registration) {
      warn(
        `no /route-metadata for ${record.key} after ${metadataWaitMs} ms; upload stored without a callback`,
      );
      return null;
    }
    const result = registration.awaitServerData ? waitForCallbackResult(record.key) : undefined;
    reportToApp({
      key: record.key,
      registration,
      hook: "callback",
      payload: {
        status: "uploaded",
        file: {
          name: record.name,
          size: record.size,
          type: record.type,
          customId: record.customId,
          key: record.key,
          ...fileUrls(record.key),
          fileHash: record.fileHash,
        },
        origin: selfUrl,
        metadata: registration.metadata,
      },
    });
    if (!result) return null;
    const settled = await result;
    if (!settled) {
      warn(`no /callback-result for ${record.key} within ${serverDataWaitMs} ms; answering serverData null`);
      return null;
    }
    if (!settled.ok)
      throw new HostError(500, `Upload stored, but the app's onUploadComplete did not run: ${settled.error}`);
    return settled.callbackData;
  }

  // ---- GET /a/{appId}/{key}, /f/{key}
  async function handleServeFile(req: IncomingMessage, res: ServerResponse, key: string): Promise<void> {
    const record = index.get(key);
    if (!record) throw new HostError(404, "Not found");
    if (record.acl === "private") verifySignedUrl({ req, apiKey, publicBaseUrl });
    const etag = `"${record.fileHash}"`;
    const headers: Record<string, string> = {
      "content-type": record.type || "application/octet-stream",
      "content-disposition": contentDispositionHeader({
        disposition: record.contentDisposition,
        name: record.name,
      }),
      etag,
      "accept-ranges": "bytes",
      "cache-control": record.acl === "private" ? "private, no-cache" : "public, no-cache",
    };
    if (req.headers["if-none-match"] === etag) {
      res.writeHead(304, headers);
      res.end();
      return;
    }
    let start = 0;
    let end = record.size - 1;
    let status = 200;
    const range = /^bytes=(\d*)-(\d*)$/.exec(req.headers.range ?? "");
    if (range && (range[1] || range[2])) {
      start = range[1] ? Number(range[1]) : Math.max(0, record.size - Number(range[2]));
      end = range[1] && range[2] ? Math.min(Number(range[2]), record.size - 1) : record.size - 1;
      if (start > end || start >= record.size)
        throw new HostError(416, "Range not satisfiable", { "content-range": `bytes */${record.size}` });
      status = 206;
      headers["content-range"] = `bytes ${start}-${end}/${record.size}`;
    }
    headers["content-length"] = String(Math.max(0, end - start + 1));
    res.writeHead(status, headers);
    if (req.method === "HEAD" || record.size === 0) {
      res.end();
      return;
    }
    createReadStream(filePath(key), { start, end })
      .on("error", () => res.destroy())
      .pipe(res);
  }

  // ---- POST /v6/* (UTApi)
  function keysFrom(body: Record<string, unknown>): string[] {
    if (body.fileKeys !== undefined) return stringArray(body.fileKeys, "fileKeys");
    const customIds = new Set(stringArray(body.customIds, "fileKeys or customIds"));
    return index
      .all()
      .filter((r) => r.customId !== null && customIds.has(r.customId))
      .map((r) => r.key);
  }

  function recordFor(ref: Record<string, unknown>): FileRecord | undefined {
    if (typeof ref.fileKey === "string") return index.get(ref.fileKey);
    if (typeof ref.customId === "string") return index.all().find((r) => r.customId === ref.customId);
    throw new HostError(400, "Each entry needs fileKey or customId");
  }

  function updatesFrom(body: Record<string, unknown>): Array<Record<string, unknown>> {
    if (!Array.isArray(body.updates) || !body.updates.every((u) => typeof u === "object" && u !== null)) {
      throw new HostError(400, "updates must be an array of objects");
    }
    return body.updates as Array<Record<string, unknown>>;
  }

  async function handleApi(req: IncomingMessage, res: ServerResponse, action: string): Promise<void> {
    requireApiKey(req);
    const body = await readJsonBody(req);
    switch (action) {
      case "deleteFiles": {
        let deletedCount = 0;
        for (const key of keysFrom(body)) {
          if (!index.get(key)) continue;
          await index.remove(key);
          await rm(filePath(key), { force: true });
          deletedCount += 1;
        }
        return sendJson(res, 200, { success: true, deletedCount });
      }
      case "getFileUrl":
        return sendJson(res, 200, {
          data: keysFrom(body)
            .filter((k) => index.get(k))
            .map((key) => ({ key, url: fileUrls(key).url })),
        });
      case "listFiles": {
        const limit = body.limit === undefined ? 500 : Number(body.limit);
        const offset = body.offset === undefined ? 0 : Number(body.offset);
        if (!Number.isInteger(limit) || limit < 0 || !Number.isInteger(offset) || offset < 0)
          throw new HostError(400, "limit and offset must be non-negative integers");
        const all = index.all().sort((a, b) => a.uploadedAt - b.uploadedAt);
        const files = all.slice(offset, offset + limit).map((r) => ({
          id: r.id,
          customId: r.customId,
          key: r.key,
          name: r.name,
          size: r.size,
          status: "Uploaded" as const,
          uploadedAt: r.uploadedAt,
        }));
        return sendJson(res, 200, { hasMore: offset + limit < all.length, files });
      }
      case "renameFiles": {
        for (const update of updatesFrom(body)) {
          if (typeof update.newName !== "string" || update.newName === "")
            throw new HostError(400, "newName must be a non-empty string");
          const record = recordFor(update);
          if (record) await index.put({ ...record, name: update.newName });
        }
        return sendJson(res, 200, { success: true });
      }
      case "updateACL": {
        for (const update of updatesFrom(body)) {
          if (update.acl !== "public-read" && update.acl !== "private")
            throw new HostError(400, "acl must be public-read or private");
          const record = recordFor(update);
          if (record) await index.put({ ...record, acl: update.acl });
        }
        return sendJson(res, 200, { success: true });
      }
      case "requestFileAccess": {
        const record = recordFor(body);
        if (!record) throw new HostError(404, "File not found");
        const ttlSeconds = typeof body.expiresIn === "number" && body.expiresIn > 0 ? body.expiresIn : 3600;
        const urls = fileUrls(record.key);
        return sendJson(res, 200, {
          url: signUrl({ url: urls.url, apiKey, ttlSeconds }),
          ufsUrl: signUrl({ url: urls.ufsUrl, apiKey, ttlSeconds }),
        });
      }
      case "getUsageInfo": {
        const totalBytes = index.all().reduce((sum, r) => sum + r.size, 0);
        return sendJson(res, 200, {
          totalBytes,
          appTotalBytes: totalBytes,
          filesUploaded: index.all().length,
          limitBytes: 2 * 1024 ** 3,
        });
      }
      default:
        throw new HostError(404, `Unknown API /v6/${action}`);
    }
  }

  // ---- routing
  async function route(req: IncomingMessage, res: ServerResponse, pathname: string): Promise<void> {
    const method = req.method ?? "GET";
    let segments: string[];
    try {
      segments = pathname
        .split("/")
        .slice(1)
        .map((s) => decodeURIComponent(s));
    } catch {
      throw new HostError(404, "Not found");
    }
    if (method === "OPTIONS") {
      res.writeHead(204, {
        "access-control-allow-methods": "GET, HEAD, PUT",
        "access-control-allow-headers": CORS_ALLOW_HEADERS,
        "access-control-max-age": "600",
        ...(req.headers["access-control-request-private-network"]
          ? { "access-control-allow-private-network": "true" }
          : {}),
      });
      res.end();
      return;
    }
    if (method === "GET" && pathname === "/")
      return sendJson(res, 200, { ok: true, service: "uploads-fake", appId });
    if (method === "POST" && pathname === "/route-metadata") return handleRouteMetadata(req, res);
    if (method === "POST" && pathname === "/callback-result") return handleCallbackResult(req, res);
    if (method === "POST" && segments.length === 2 && segments[0] === "v6")
      return handleApi(req, res, segments[1] ?? "");
    if ((method === "GET" || method === "HEAD") && segments.length === 3 && segments[0] === "a") {
      if (segments[1] !== appId) throw new HostError(404, "Not found");
      return handleServeFile(req, res, requireKey(segments[2] ?? ""));
    }
    if ((method === "GET" || method === "HEAD") && segments.length === 2 && segments[0] === "f") {
      return handleServeFile(req, res, requireKey(segments[1] ?? ""));
    }
    if (segments.length === 1 && (method === "HEAD" || method === "PUT")) {
      const key = requireKey(segments[0] ?? "");
      return method === "HEAD" ? handlePresignedHead(req, res, key) : handlePresignedPut(req, res, key);
    }
    throw new HostError(404, "Not found");
  }

  const server = createServer((req, res) => {
    const startedAt = performance.now();
    let pathname = "/";
    try {
      pathname = new URL(req.url ?? "/", "http://host.invalid").pathname;
    } catch {
      // Logged and answered as 404 below.
    }
    // Every answer is readable cross-origin: the browser PUTs here and pages load files from here.
    res.setHeader("access-control-allow-origin", "*");
    res.setHeader("access-control-expose-headers", "x-ut-range-start");
    let clientGone = false;
    res.on("close", () => {
      clientGone = !res.writableFinished;
      if (quiet) return;
      const status = res.writableFinished ? res.statusCode : "--- client went away";
      log(
        `uploads-fake  ${req.method} ${pathname} ${status} ${Math.round(performance.now() - startedAt)} ms`,
      );
    });
    route(req, res, pathname).catch((error: unknown) => {
      if (clientGone) return;
      if (error instanceof HostError) {
        if (!req.complete) {
          // The client may still be sending; answer now and drop the rest.
          res.setHeader("connection", "close");
          req.resume();
        }
        sendJson(res, error.status, { error: error.message }, error.headers);
        return;
      }
      log(`uploads-fake  error: ${(error as Error).stack ?? String(error)}`);
      sendJson(res, 500, { error: "Internal error in uploads-fake" });
    });
  });
  server.requestTimeout = 15 * 60 * 1000;

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  const address = server.address();
  const boundPort = typeof address === "object" && address ? address.port : port;
  const reachableHost =
    host === "0.0.0.0" || host === "::" ? "127.0.0.1" : host.includes(":") ? `[${host}]` : host;
  selfUrl = `http://${reachableHost}:${boundPort}`;
  publicBaseUrl = (options.publicBaseUrl ?? `http://localhost:${boundPort}`).replace(/\/$/, "");

  return {
    url: selfUrl,
    close: async () => {
      for (const stream of openStreams) stream.end();
      for (const [key, settle] of resultWaiters)
        settle({ ok: false, error: `uploads-fake stopped before ${key} completed` });
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
    },
  };
}

// ---------------------------------------------------------------- CLI

async function runCli(): Promise<void> {
  const token = parseToken(process.env.UPLOADTHING_TOKEN || LOCAL_UPLOADTHING_TOKEN);
  const port = Number(process.env.UPLOADS_FAKE_PORT ?? 3100);
  if (!Number.isInteger(port) || port < 0 || port > 65535)
    throw new Error("UPLOADS_FAKE_PORT must be a port number");
  const ufsHost = process.env.UPLOADTHING_UFS_HOST;
  // Same rule as the SDK's generateSignedURL: http only when the host contains "local".
  const publicBaseUrl =
    process.env.UPLOADS_FAKE_PUBLIC_URL ||
    (ufsHost ? `${ufsHost.includes("local") ? "http" : "https"}://${ufsHost}` : undefined);
  const dataDir = path.resolve(process.env.UPLOADS_FAKE_DATA_DIR || "data/uploads");
  const uploads = await startUploadsHost({
    port,
    host: process.env.UPLOADS_FAKE_HOST || "127.0.0.1",
    dataDir,
    apiKey: token.apiKey,
    appId: token.appId,
    publicBaseUrl,
    quiet: process.env.UPLOADS_FAKE_QUIET === "1" || process.env.UPLOADS_FAKE_QUIET === "true",
  });
  console.log(
    `uploads-fake  listening on ${uploads.url} for app ${token.appId}; files in ${path.relative(process.cwd(), dataDir) || "."}`,
  );
  const stop = () => {
    void uploads.close().then(() => process.exit(0));
  };
  process.once("SIGINT", stop);
  process.once("SIGTERM", stop);
}

const invokedPath = process.argv[1];
if (invokedPath && import.meta.url === pathToFileURL(path.resolve(invokedPath)).href) {
  runCli().catch((error: unknown) => {
    console.error(`uploads-fake  cannot start: ${(error as Error).message}`);
    process.exit(1);
  });
}
