import { PhotoPanel } from "@/components/photo/photo-panel";
import { listPhotosOfObservation } from "@/db/queries/photos";

/** The observation's photo, loaded on the server (the page has already checked the owner). */
export async function PhotoSection({ observationId }: { observationId: string }) {
  const photos = await listPhotosOfObservation({ observationId });
  return (
    <PhotoPanel
      observationId={observationId}
      editable
      photos={photos.map((p) => ({
        id: p.id,
        name: p.name,
        sizeBytes: p.sizeBytes,
        mimeType: p.mimeType,
        widthPx: p.widthPx,
        heightPx: p.heightPx,
        exifTakenAtIso: p.exifTakenAt?.toISOString() ?? null,
      }))}
    />
  );
}
