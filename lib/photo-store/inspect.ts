import "server-only";

import sharp from "sharp";

import { exifTimeToUtc } from "@/lib/photo/exif";
import { PHOTO_MIME_TYPES, type PhotoFormat } from "@/lib/photo/formats";
import { checkPhotoBytes, MAX_PHOTO_PIXELS } from "@/lib/photo/limits";

export const THUMBNAIL_PX = 320;

export type InspectedPhoto =
  | {
      ok: true;
      format: PhotoFormat;
      mimeType: string;
      widthPx: number;
      heightPx: number;
      exifTakenAt: Date | null;
      thumbnail: Buffer;
    }
  | { ok: false; reason: string; message: string };

/**
 * The server's check of a stored photo, in the order that keeps a hostile
 * file harmless: size, then format by magic bytes, then the pixel count read
 * from the header (a decompression bomb stops here, undecoded), and only
 * then a full decode (which finds files cut off inside their pixel data)
 * that also makes the list thumbnail, turned upright by the EXIF orientation.
 */
export async function inspectPhotoBytes({
  bytes,
  timeZone,
}: {
  bytes: Uint8Array;
  timeZone: string;
}): Promise<InspectedPhoto> {
  const check = checkPhotoBytes({ bytes, sizeBytes: bytes.byteLength });
  if (!check.ok) return check;
  let thumbnail: Buffer;
  try {
    thumbnail = await sharp(bytes, { limitInputPixels: MAX_PHOTO_PIXELS, failOn: "truncated" })
      .rotate()
      .resize(THUMBNAIL_PX, THUMBNAIL_PX, { fit: "inside", withoutEnlargement: true })
      .webp({ quality: 78 })
      .toBuffer();
  } catch (error) {
    const text = (error as Error).message ?? "";
    const truncated = /truncat|premature|unexpected end|end of (file|stream)|read error|not enough/i.test(
      text,
    );
    return truncated
      ? {
          ok: false,
          reason: "truncated",
          message: "The photo's data stops part-way: the file is cut off. Copy or export it again.",
        }
      : {
          ok: false,
          reason: "corrupt",
          message: "The photo's pixel data cannot be read: the file is damaged.",
        };
  }
  const { exif } = check;
  const exifTakenAt = exif.takenAtText
    ? exifTimeToUtc({ takenAtText: exif.takenAtText, takenAtOffset: exif.takenAtOffset, timeZone })
    : null;
  return {
    ok: true,
    format: check.format,
    mimeType: PHOTO_MIME_TYPES[check.format],
    widthPx: check.widthPx,
    heightPx: check.heightPx,
    exifTakenAt,
    thumbnail,
  };
}

/** An upright JPEG copy for browsers that cannot draw the stored format (TIFF). */
export async function makeViewableCopy({ bytes }: { bytes: Uint8Array }): Promise<Buffer> {
  return sharp(bytes, { limitInputPixels: MAX_PHOTO_PIXELS, failOn: "truncated" })
    .rotate()
    .jpeg({ quality: 92 })
    .toBuffer();
}
