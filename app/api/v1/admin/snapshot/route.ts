import { requireRole } from "@/lib/auth/session";
import { attachmentHeaders } from "@/lib/export/observations";
import { createSnapshotDownload } from "@/lib/export/snapshot";
import { AppError } from "@/lib/http/errors";
import { handleRoute } from "@/lib/http/respond";

/** A consistent copy of the whole database, for admins signed in to the app. */
export const GET = handleRoute(async (request: Request) => {
  const user = await requireRole(["admin"], { request });
  // The snapshot holds every account's password and token hashes: it is
  // fetched from the admin pages, never by a script holding an API token.
  if (user.apiToken) {
    throw new AppError(
      "forbidden",
      "Database snapshots are downloaded from Admin → Backups while signed in, not with an API token.",
    );
  }
  const { stream, bytes, fileName } = await createSnapshotDownload();
  return new Response(stream, {
    headers: {
      ...attachmentHeaders({ fileName, type: "application/vnd.sqlite3" }),
      "content-length": String(bytes),
    },
  });
});
