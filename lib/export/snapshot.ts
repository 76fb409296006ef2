import "server-only";

import { createReadStream } from "node:fs";
import { mkdtemp, rm, stat } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";

import { vacuumInto } from "@/db/queries/snapshot";
import { getEnv } from "@/lib/env";
import { AppError } from "@/lib/http/errors";

/**
 * A snapshot of the embedded database as a download: copied into a private
 * temporary folder, streamed, and deleted once sent (or abandoned).
 */
export async function createSnapshotDownload({ now = new Date() }: { now?: Date } = {}): Promise<{
  stream: ReadableStream<Uint8Array>;
  bytes: number;
  fileName: string;
}> {
  if (!getEnv().DATABASE_URL.startsWith("file:")) {
    throw new AppError(
      "unavailable",
      "Snapshots are made of the embedded database. With a libSQL server, use the server's own backups.",
    );
  }
  const folder = await mkdtemp(path.join(tmpdir(), "heliotally-snapshot-"));
  const file = path.join(folder, "snapshot.sqlite");
  const remove = () => rm(folder, { recursive: true, force: true });
  try {
    await vacuumInto({ path: file });
    const { size } = await stat(file);
    const source = createReadStream(file, { highWaterMark: 1024 * 1024 });
    const iterator = source[Symbol.asyncIterator]() as AsyncIterator<Buffer>;
    const stream = new ReadableStream<Uint8Array>({
      async pull(controller) {
        try {
          const { value, done } = await iterator.next();
          if (done) {
            controller.close();
            await remove();
          } else controller.enqueue(new Uint8Array(value));
        } catch (error) {
          controller.error(error);
          await remove();
        }
      },
      async cancel() {
        source.destroy();
        await remove();
      },
    });
    const stamp = now.toISOString().replace(/[-:]/g, "").replace("T", "-").slice(0, 15);
    return { stream, bytes: size, fileName: `heliotally-snapshot-${stamp}Z.sqlite` };
  } catch (error) {
    await remove();
    throw error;
  }
}
