import { findPhotoForViewer } from "@/db/queries/photos";
import { ROLES } from "@/lib/auth/roles";
import { requireRole } from "@/lib/auth/session";
import { AppError, invalidInput } from "@/lib/http/errors";
import { handleRoute } from "@/lib/http/respond";
import { MAX_PHOTO_BYTES } from "@/lib/photo/limits";
import { makeViewableCopy } from "@/lib/photo-store/inspect";
import { readStoredFile, signFileUrl, SIGNED_URL_TTL_S } from "@/lib/photo-store/storage";
import { photoImageQuerySchema } from "@/lib/validation/photo";

type Context = { params: Promise<{ id: string }> };

/**
 * The only way to a photo's pixels. Files are private at the store; after
 * the access check this answers with a redirect to a signed link that
 * expires in minutes. `view` is the original unless browsers cannot draw it
 * (TIFF): then an upright JPEG copy is streamed from here.
 */
export const GET = handleRoute(async (request: Request, context: Context) => {
  const user = await requireRole(ROLES, { request });
  const { id } = await context.params;
  const parsed = photoImageQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw invalidInput(parsed.error, "The query string needs attention.");
  const photo = await findPhotoForViewer({ viewer: user, photoId: id });
  if (!photo) throw new AppError("not_found", "No such photo.");
  const { variant } = parsed.data;
  // Never cached by shared caches; the browser may keep the redirect for less than the link lives.
  const cache = { "cache-control": `private, max-age=${Math.floor(SIGNED_URL_TTL_S / 2)}` };

  if (variant === "view" && photo.mimeType === "image/tiff") {
    const bytes = await readStoredFile({ key: photo.fileKey, maxBytes: MAX_PHOTO_BYTES });
    const jpeg = await makeViewableCopy({ bytes });
    return new Response(new Uint8Array(jpeg), { headers: { "content-type": "image/jpeg", ...cache } });
  }
  const key = variant === "thumbnail" ? (photo.thumbnailKey ?? photo.fileKey) : photo.fileKey;
  return new Response(null, { status: 307, headers: { location: await signFileUrl({ key }), ...cache } });
});
