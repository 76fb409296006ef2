import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";

import { resetEnvCache } from "@/lib/env";

import { startUploadsHost } from "../../uploads-fake/server";
import { LOCAL_API_KEY, LOCAL_APP_ID } from "../../uploads-fake/token";

/**
 * Starts the local photo store on a free port with a temporary folder and
 * points the upload SDK at it, through the SDK's documented environment
 * only (as `npm run dev` does). `stop` closes it and removes the folder.
 */
export async function startPhotoStore({ name }: { name: string }) {
  const dataDir = await mkdtemp(path.join(tmpdir(), `heliotally-${name}-`));
  const store = await startUploadsHost({
    port: 0,
    dataDir,
    apiKey: LOCAL_API_KEY,
    appId: LOCAL_APP_ID,
    quiet: true,
  });
  const port = new URL(store.url).port;
  process.env.UPLOADTHING_INGEST_URL = `http://localhost:${port}`;
  process.env.UPLOADTHING_API_URL = `http://localhost:${port}`;
  process.env.UPLOADTHING_UFS_HOST = `localhost:${port}`;
  process.env.UPLOADTHING_UFS_APP_ID_LOCATION = "path";
  resetEnvCache();
  return {
    store,
    stop: async () => {
      await store.close();
      await rm(dataDir, { recursive: true, force: true });
    },
  };
}
