/**
 * `npm run dev` and `npm start`: prepares the embedded database (migrate and,
 * on first run, seed the demo network), starts the local mail sink and the
 * local photo store, then the Next.js server. One command, no environment file.
 */
import { spawn } from "node:child_process";
import { createRequire } from "node:module";
import path from "node:path";

import { getEnv, getUploadthingEnv } from "@/lib/env";
import { startMailSink } from "@/lib/mail/sink";
import { startFrontServer } from "@/lib/server/front-server";
import { findFreePort } from "@/lib/server/free-port";

import { startUploadsHost } from "../uploads-fake/server";
import { parseToken } from "../uploads-fake/token";
import { prepareAndSeed } from "./prepare-db";

const mode = process.argv[2] === "start" ? "start" : "dev";
process.env.NEXT_TELEMETRY_DISABLED ??= "1";
if (mode === "start") (process.env as Record<string, string>).NODE_ENV = "production";

const started = Date.now();
const env = getEnv();
process.env.NEXTAUTH_URL ??= `http://localhost:${env.PORT}`;

await prepareAndSeed();

const services: Array<{ name: string; close: () => Promise<void> }> = [];
if (env.MAIL_SINK) {
  try {
    const sink = await startMailSink({ port: env.SMTP_PORT, host: env.SMTP_HOST, log: console.log });
    services.push({ name: "mail sink", close: sink.close });
    console.log(
      `Mail sink listening on smtp://${env.SMTP_HOST}:${sink.port} (messages appear under Admin → Mail).`,
    );
  } catch (error) {
    console.warn(`Mail sink not started (${(error as Error).message}); is another copy running?`);
  }
}

// Photo storage: hand the SDK its settings through its own variables (what lib/env.ts decided, defaults
// included), and with the local token start the local storage host that stands in for the hosted service.
const uploadthing = getUploadthingEnv(env);
for (const [name, value] of [
  ["UPLOADTHING_TOKEN", uploadthing.token],
  ["UPLOADTHING_INGEST_URL", uploadthing.ingestUrl],
  ["UPLOADTHING_API_URL", uploadthing.apiUrl],
  ["UPLOADTHING_UFS_HOST", uploadthing.ufsHost],
  ["UPLOADTHING_UFS_APP_ID_LOCATION", uploadthing.ufsAppIdLocation],
  ["UPLOADTHING_CALLBACK_URL", uploadthing.callbackUrl],
] as const) {
  if (value !== undefined) process.env[name] ??= value;
}
if (uploadthing.local) {
  try {
    const { apiKey, appId } = parseToken(uploadthing.token);
    const store = await startUploadsHost({
      port: env.UPLOADS_FAKE_PORT,
      dataDir: path.resolve(env.UPLOADS_FAKE_DATA_DIR),
      apiKey,
      appId,
      ...(uploadthing.ufsHost ? { publicBaseUrl: `http://${uploadthing.ufsHost}` } : {}),
      quiet: true,
    });
    services.push({ name: "photo store", close: store.close });
    console.log(`Local photo store listening on ${store.url} (files in ${env.UPLOADS_FAKE_DATA_DIR}).`);
  } catch (error) {
    console.warn(`Local photo store not started (${(error as Error).message}); is another copy running?`);
  }
}

// In production a small front server takes the public port: it answers the
// published-series pages itself and passes everything else to Next on a
// loopback port (lib/server/front-server.ts says why). HELIOTALLY_FRONT=false
// serves Next on the public port directly, as `npm run dev` always does.
const withFront = mode === "start" && env.HELIOTALLY_FRONT;
const nextPort = withFront ? await findFreePort() : env.PORT;
// The front first: if the public port is taken, stop before Next starts.
if (withFront) {
  const { GET: seriesPage } = await import("@/app/api/v1/series/[kind]/route");
  const front = await startFrontServer({
    port: env.PORT,
    upstream: { host: "127.0.0.1", port: nextPort },
    fastRoutes: [
      {
        pattern: /^\/api\/v1\/series\/(?<kind>(?:daily|monthly|yearly)(?:\.csv)?)$/,
        handler: (request, { params }) =>
          seriesPage(request, { params: params as Promise<{ kind: string }> }),
      },
    ],
    log: console.warn,
  }).catch((error: unknown) => {
    console.error(
      `Could not listen on port ${env.PORT} (${(error as Error).message}); is another copy running?`,
    );
    process.exit(1);
  });
  services.push({ name: "front server", close: front.close });
}
const require = createRequire(import.meta.url);
const nextBin = require.resolve("next/dist/bin/next");
const child = spawn(
  process.execPath,
  [nextBin, mode, "--port", String(nextPort), ...(withFront ? ["--hostname", "127.0.0.1"] : [])],
  { stdio: "inherit", env: process.env },
);
console.log(
  `Heliotally (${mode}) starting on http://localhost:${env.PORT} — prepared in ${Date.now() - started} ms.` +
    (withFront ? ` Next listens behind it on 127.0.0.1:${nextPort}.` : ""),
);

let stopping = false;
async function stop(code: number) {
  if (stopping) return;
  stopping = true;
  if (child.exitCode === null) child.kill("SIGTERM");
  await Promise.all(services.map((s) => s.close().catch(() => {})));
  process.exit(code);
}
process.on("SIGINT", () => void stop(0));
process.on("SIGTERM", () => void stop(0));
child.on("exit", (code) => void stop(code ?? 0));
