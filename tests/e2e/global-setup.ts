/**
 * Starts the built app the way `npm start` does (prepare and seed the demo
 * database, start the mail sink, then `next start`) on free ports with a
 * temporary database, and tells the tests where to find it.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { existsSync, mkdtempSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";

import type { TestProject } from "vitest/node";

import { chromiumPath } from "./browser";

declare module "vitest" {
  export interface ProvidedContext {
    baseUrl: string;
    databaseUrl: string;
  }
}

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      server.close(() => resolve(typeof address === "object" && address ? address.port : 0));
    });
  });
}

let child: ChildProcess | undefined;

export default async function setup(project: TestProject) {
  if (!existsSync(chromiumPath())) {
    throw new Error(
      `Chromium was not found at ${chromiumPath()}. Install Debian's package (apt-get install -y chromium) or set CHROMIUM_PATH.`,
    );
  }
  if (!existsSync(path.join(process.cwd(), ".next", "BUILD_ID"))) {
    throw new Error("The app is not built. Run `npm run build` first (npm test does this for you).");
  }
  const folder = mkdtempSync(path.join(tmpdir(), "heliotally-e2e-"));
  const [port, smtpPort, uploadsPort] = await Promise.all([freePort(), freePort(), freePort()]);
  const baseUrl = `http://localhost:${port}`;
  const databaseUrl = `file:${path.join(folder, "e2e.db")}`;
  const tsx = path.join(process.cwd(), "node_modules", "tsx", "dist", "cli.mjs");
  child = spawn(process.execPath, [tsx, "--conditions=react-server", "scripts/serve.ts", "start"], {
    env: {
      ...process.env,
      PORT: String(port),
      SMTP_PORT: String(smtpPort),
      // serve.ts starts the local photo store here, with its files in the run's temporary folder.
      UPLOADS_FAKE_PORT: String(uploadsPort),
      UPLOADS_FAKE_DATA_DIR: path.join(folder, "uploads"),
      DATABASE_URL: databaseUrl,
      NEXTAUTH_URL: baseUrl,
      NEXTAUTH_SECRET: "e2e-secret-e2e-secret-e2e-secret-e2e",
      HELIOTALLY_DEMO: "true",
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let output = "";
  child.stdout?.on("data", (d: Buffer) => (output += d.toString()));
  child.stderr?.on("data", (d: Buffer) => (output += d.toString()));

  const deadline = Date.now() + 120_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`The app exited during start-up:\n${output}`);
    try {
      const res = await fetch(`${baseUrl}/sign-in`);
      if (res.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error(`The app did not answer within 120 s:\n${output}`);
    await new Promise((r) => setTimeout(r, 500));
  }
  project.provide("baseUrl", baseUrl);
  project.provide("databaseUrl", databaseUrl);

  return async () => {
    if (child && child.exitCode === null) {
      child.kill("SIGTERM");
      await new Promise((r) => child?.once("exit", r));
    }
  };
}
