/**
 * The rules a disk photo must meet, checked by content. Shared by the
 * browser's early check and the server's check after upload (the one that
 * counts: a browser can be bypassed).
 */
import { readExif, type ExifFacts } from "./exif";
import { orientedSize, readImageHeader, type PhotoFormat } from "./formats";

export const MAX_PHOTO_BYTES = 25 * 1024 * 1024;
export const MAX_PHOTO_PIXELS = 50_000_000;
export const PHOTO_ACCEPT = "image/jpeg,image/png,image/webp,image/tiff";

export type PhotoCheck =
  | {
      ok: true;
      format: PhotoFormat;
      /** Shown size, after EXIF orientation. */
      widthPx: number;
      heightPx: number;
      exif: ExifFacts;
    }
  | {
      ok: false;
      reason: "not_image" | "truncated" | "corrupt" | "too_large" | "too_many_pixels" | "empty";
      message: string;
    };

/**
 * Checks the bytes (or at least the first part of them; `sizeBytes` is the
 * whole file's size) without decoding pixels. A file that passes may still be
 * cut off inside its pixel data: the server's decoder finds that.
 */
export function checkPhotoBytes({ bytes, sizeBytes }: { bytes: Uint8Array; sizeBytes: number }): PhotoCheck {
  if (sizeBytes === 0) return { ok: false, reason: "empty", message: "The file is empty." };
  if (sizeBytes > MAX_PHOTO_BYTES) {
    return {
      ok: false,
      reason: "too_large",
      message: `The photo is ${formatMegabytes(sizeBytes)}; the limit is ${formatMegabytes(MAX_PHOTO_BYTES)}. Save it at a lower quality or size and try again.`,
    };
  }
  const header = readImageHeader({ bytes });
  if (!header.ok) return { ok: false, reason: header.reason, message: header.message };
  const exif = readExif({ bytes });
  const { storedWidthPx, storedHeightPx, format } = header.header;
  const pixels = storedWidthPx * storedHeightPx;
  if (pixels > MAX_PHOTO_PIXELS) {
    return {
      ok: false,
      reason: "too_many_pixels",
      message: `The photo is ${storedWidthPx} × ${storedHeightPx} pixels (${(pixels / 1e6).toFixed(0)} megapixels); the limit is ${MAX_PHOTO_PIXELS / 1e6} megapixels. Scale it down and try again.`,
    };
  }
  const orientation = exif.orientation ?? header.header.orientation;
  const shown = orientedSize({ widthPx: storedWidthPx, heightPx: storedHeightPx, orientation });
  return { ok: true, format, ...shown, exif: { ...exif, ...(orientation ? { orientation } : {}) } };
}

export function formatMegabytes(bytes: number): string {
  return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
}
