import { deletePhotoRow, findOwnPhoto, findPhotoForViewer } from "@/db/queries/photos";
import { ROLES } from "@/lib/auth/roles";
import { requireObserver, requireRole } from "@/lib/auth/session";
import { AppError } from "@/lib/http/errors";
import { withIdempotency } from "@/lib/http/idempotency";
import { handleRoute } from "@/lib/http/respond";
import { deleteStoredFiles } from "@/lib/photo-store/storage";

type Context = { params: Promise<{ id: string }> };

// Missing and not-yours answer alike, so photo ids cannot be probed.
const notFound = () => new AppError("not_found", "No such photo.");

/** A photo's facts (never its storage address). Owner, coordinators, the owner's educator. */
export const GET = handleRoute(async (request: Request, context: Context) => {
  const user = await requireRole(ROLES, { request });
  const { id } = await context.params;
  const photo = await findPhotoForViewer({ viewer: user, photoId: id });
  if (!photo) throw notFound();
  return Response.json({
    id: photo.id,
    observationId: photo.observationId,
    name: photo.name,
    sizeBytes: photo.sizeBytes,
    mimeType: photo.mimeType,
    widthPx: photo.widthPx,
    heightPx: photo.heightPx,
    exifTakenAt: photo.exifTakenAt?.toISOString() ?? null,
    createdAt: photo.createdAt.toISOString(),
    imageUrl: `/api/v1/photos/${photo.id}/image?variant=view`,
    thumbnailUrl: `/api/v1/photos/${photo.id}/image?variant=thumbnail`,
  });
});

/**
 * The owner removes a photo: its files first (so none is left behind), then its row.
 * Honours Idempotency-Key: a retried delete gets its 204 again rather than a 404.
 */
export const DELETE = handleRoute(async (request: Request, context: Context) => {
  const { user, observer } = await requireObserver(undefined, { request });
  const { id } = await context.params;
  return withIdempotency(
    { request, userId: user.id, scope: `DELETE /api/v1/photos/${id}`, body: null },
    async () => {
      const photo = await findOwnPhoto({ observerId: observer.id, photoId: id });
      if (!photo) throw notFound();
      await deleteStoredFiles({
        keys: photo.thumbnailKey ? [photo.fileKey, photo.thumbnailKey] : [photo.fileKey],
      });
      await deletePhotoRow({ photoId: photo.id });
      return { status: 204, body: undefined };
    },
  );
});
