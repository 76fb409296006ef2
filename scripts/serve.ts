/**
 * `npm run dev` and `npm start`: prepares the embedded database (migrate and,
 * on first run, seed the demo network), starts the local mail sink, then the
 * Next.js server. One command, no environment file.
 */
import { spawn } from "node:child_process";
import { createRequire } from "node:module";

import { getEnv } from "@/lib/env";
import { startMailSink } from "@/lib/mail/sink";

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
    console.log(`Mail sink listening on smtp://${env.SMTP_HOST}:${sink.port} (messages appear under Admin → Mail).`);
  } catch (error) {
    console.warn(`Mail sink not started (${(error as Error).message}); is another copy running?`);
  }
}

const require = createRequire(import.meta.url);
const nextBin = require.resolve("next/dist/bin/next");
const child = spawn(process.execPath, [nextBin, mode, "--port", String(env.PORT)], {
  stdio: "inherit",
  env: process.env,
});
console.log(`Heliotally (${mode}) starting on http://localhost:${env.PORT} — prepared in ${Date.now() - started} ms.`);

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
