/**
 * Checks that Chromium and a build are there, starts the built app on free
 * ports with a temporary database (tests/support/start-app.ts), and tells the
 * tests where to find it.
 */
import { existsSync } from "node:fs";
import path from "node:path";

import type { TestProject } from "vitest/node";

import { startBuiltApp, type StartedApp } from "../support/start-app";

import { chromiumPath } from "./browser";

declare module "vitest" {
  export interface ProvidedContext {
    baseUrl: string;
    databaseUrl: string;
  }
}

let app: StartedApp | undefined;

export default async function setup(project: TestProject) {
  if (!existsSync(chromiumPath())) {
    throw new Error(
      `Chromium was not found at ${chromiumPath()}. Install Debian's package (apt-get install -y chromium) or set CHROMIUM_PATH.`,
    );
  }
  if (!existsSync(path.join(process.cwd(), ".next", "BUILD_ID"))) {
    throw new Error("The app is not built. Run `npm run build` first (npm test does this for you).");
  }
  app = await startBuiltApp({ label: "e2e", nextAuthSecret: "e2e-secret-e2e-secret-e2e-secret-e2e" });
  project.provide("baseUrl", app.baseUrl);
  project.provide("databaseUrl", app.databaseUrl);

  return async () => {
    await app?.stop();
  };
}
