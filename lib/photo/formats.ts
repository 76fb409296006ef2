/**
 * What a photo file really is, read from its bytes: the format by its magic
 * bytes and the pixel size from the header, without decoding any pixel data.
 * The same code runs in the browser (a quick check before uploading) and on
 * the server (the check that counts), so a decompression bomb is refused
 * before any decoder sees it.
 */

export const PHOTO_FORMATS = ["jpeg", "png", "webp", "tiff"] as const;
export type PhotoFormat = (typeof PHOTO_FORMATS)[number];

export const PHOTO_MIME_TYPES: Record<PhotoFormat, string> = {
  jpeg: "image/jpeg",
  png: "image/png",
  webp: "image/webp",
  tiff: "image/tiff",
};

export type ImageHeader = {
  format: PhotoFormat;
  /** As stored, before any EXIF orientation is applied. */
  storedWidthPx: number;
  storedHeightPx: number;
  /** EXIF orientation 1–8 when the header names one (TIFF only here; JPEG/WebP carry it in EXIF). */
  orientation?: number;
};

export type HeaderResult =
  | { ok: true; header: ImageHeader }
  | { ok: false; reason: "not_image" | "truncated" | "corrupt"; message: string };

const NOT_IMAGE: HeaderResult = {
  ok: false,
  reason: "not_image",
  message:
    "This file is not a JPEG, PNG, WebP or TIFF image (its content says otherwise, whatever its name).",
};

const truncated = (what: string): HeaderResult => ({
  ok: false,
  reason: "truncated",
  message: `The ${what} file ends before its header does: it looks cut off. Export or copy it again.`,
});

const corrupt = (what: string): HeaderResult => ({
  ok: false,
  reason: "corrupt",
  message: `The ${what} file's header is damaged, so its size cannot be read.`,
});

/** The format named by the first bytes, or null for anything else. */
export function sniffPhotoFormat({ bytes }: { bytes: Uint8Array }): PhotoFormat | null {
  const b = bytes;
  if (b.length >= 3 && b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff) return "jpeg";
  if (
    b.length >= 8 &&
    b[0] === 0x89 &&
    b[1] === 0x50 &&
    b[2] === 0x4e &&
    b[3] === 0x47 &&
    b[4] === 0x0d &&
    b[5] === 0x0a &&
    b[6] === 0x1a &&
    b[7] === 0x0a
  )
    return "png";
  if (b.length >= 12 && ascii(b, 0, 4) === "RIFF" && ascii(b, 8, 4) === "WEBP") return "webp";
  if (
    b.length >= 4 &&
    ((b[0] === 0x49 && b[1] === 0x49 && b[2] === 0x2a && b[3] === 0x00) ||
      (b[0] === 0x4d && b[1] === 0x4d && b[2] === 0x00 && b[3] === 0x2a))
  )
    return "tiff";
  return null;
}

/** Format and stored pixel size from the header alone. */
export function readImageHeader({ bytes }: { bytes: Uint8Array }): HeaderResult {
  const format = sniffPhotoFormat({ bytes });
  if (!format) return NOT_IMAGE;
  const result = (() => {
    switch (format) {
      case "jpeg":
        return readJpegHeader(bytes);
      case "png":
        return readPngHeader(bytes);
      case "webp":
        return readWebpHeader(bytes);
      case "tiff":
        return readTiffHeader(bytes);
    }
  })();
  if (result.ok && (result.header.storedWidthPx < 1 || result.header.storedHeightPx < 1))
    return corrupt(format.toUpperCase());
  return result;
}

/** Width and height as shown, after EXIF orientation (5–8 swap the axes). */
export function orientedSize({
  widthPx,
  heightPx,
  orientation,
}: {
  widthPx: number;
  heightPx: number;
  orientation?: number;
}): { widthPx: number; heightPx: number } {
  return orientation !== undefined && orientation >= 5 && orientation <= 8
    ? { widthPx: heightPx, heightPx: widthPx }
    : { widthPx, heightPx };
}

// --------------------------------------------------------------- JPEG

const JPEG_SOF = new Set([0xc0, 0xc1, 0xc2, 0xc3, 0xc5, 0xc6, 0xc7, 0xc9, 0xca, 0xcb, 0xcd, 0xce, 0xcf]);

function readJpegHeader(b: Uint8Array): HeaderResult {
  let at = 2;
  while (at < b.length) {
    if (b[at] !== 0xff) return corrupt("JPEG");
    // Any number of 0xFF fill bytes may precede a marker.
    while (at < b.length && b[at] === 0xff) at += 1;
    if (at >= b.length) break;
    const marker = b[at]!;
    at += 1;
    if (marker === 0xd8 || marker === 0x01 || (marker >= 0xd0 && marker <= 0xd7)) continue;
    if (marker === 0xd9 || marker === 0xda) return corrupt("JPEG"); // image data or end before any frame header
    if (at + 2 > b.length) break;
    const length = u16be(b, at);
    if (length < 2) return corrupt("JPEG");
    if (JPEG_SOF.has(marker)) {
      if (at + 7 > b.length) break;
      const heightPx = u16be(b, at + 3);
      const widthPx = u16be(b, at + 5);
      return { ok: true, header: { format: "jpeg", storedWidthPx: widthPx, storedHeightPx: heightPx } };
    }
    at += length;
  }
  return truncated("JPEG");
}

// --------------------------------------------------------------- PNG

function readPngHeader(b: Uint8Array): HeaderResult {
  if (b.length < 24) return truncated("PNG");
  if (ascii(b, 12, 4) !== "IHDR") return corrupt("PNG");
  return { ok: true, header: { format: "png", storedWidthPx: u32be(b, 16), storedHeightPx: u32be(b, 20) } };
}

// --------------------------------------------------------------- WebP

function readWebpHeader(b: Uint8Array): HeaderResult {
  if (b.length < 30) return truncated("WebP");
  const chunk = ascii(b, 12, 4);
  const data = 20;
  if (chunk === "VP8X") {
    const widthPx = 1 + (b[data + 4]! | (b[data + 5]! << 8) | (b[data + 6]! << 16));
    const heightPx = 1 + (b[data + 7]! | (b[data + 8]! << 8) | (b[data + 9]! << 16));
    return { ok: true, header: { format: "webp", storedWidthPx: widthPx, storedHeightPx: heightPx } };
  }
  if (chunk === "VP8 ") {
    // Frame tag (3 bytes), start code 9d 01 2a, then 14-bit width and height.
    if (b[data + 3] !== 0x9d || b[data + 4] !== 0x01 || b[data + 5] !== 0x2a) return corrupt("WebP");
    const widthPx = u16le(b, data + 6) & 0x3fff;
    const heightPx = u16le(b, data + 8) & 0x3fff;
    return { ok: true, header: { format: "webp", storedWidthPx: widthPx, storedHeightPx: heightPx } };
  }
  if (chunk === "VP8L") {
    if (b[data] !== 0x2f) return corrupt("WebP");
    const bits = b[data + 1]! | (b[data + 2]! << 8) | (b[data + 3]! << 16) | (b[data + 4]! << 24);
    const widthPx = 1 + (bits & 0x3fff);
    const heightPx = 1 + ((bits >>> 14) & 0x3fff);
    return { ok: true, header: { format: "webp", storedWidthPx: widthPx, storedHeightPx: heightPx } };
  }
  return corrupt("WebP");
}

// --------------------------------------------------------------- TIFF

function readTiffHeader(b: Uint8Array): HeaderResult {
  const tiff = parseTiffIfd(b, 0);
  if (tiff === "truncated") return truncated("TIFF");
  if (tiff === "corrupt") return corrupt("TIFF");
  const widthPx = tiff.numbers.get(256);
  const heightPx = tiff.numbers.get(257);
  if (widthPx === undefined || heightPx === undefined) return corrupt("TIFF");
  const orientation = tiff.numbers.get(274);
  return {
    ok: true,
    header: {
      format: "tiff",
      storedWidthPx: widthPx,
      storedHeightPx: heightPx,
      ...(orientation ? { orientation } : {}),
    },
  };
}

export type TiffIfd = {
  little: boolean;
  /** SHORT/LONG values (first value) by tag. */
  numbers: Map<number, number>;
  /** ASCII values by tag. */
  texts: Map<number, string>;
};

/**
 * Reads one IFD of a TIFF structure that starts at `base` (a TIFF file, or the
 * TIFF block inside an EXIF segment). `ifdOffset` undefined means IFD0.
 */
export function parseTiffIfd(
  b: Uint8Array,
  base: number,
  ifdOffset?: number,
): TiffIfd | "truncated" | "corrupt" {
  if (base + 8 > b.length) return "truncated";
  const little = b[base] === 0x49;
  if (!little && b[base] !== 0x4d) return "corrupt";
  const r16 = (at: number) => (little ? u16le(b, at) : u16be(b, at));
  const r32 = (at: number) => (little ? u32le(b, at) : u32be(b, at));
  const start = base + (ifdOffset ?? r32(base + 4));
  if (start + 2 > b.length) return "truncated";
  const count = r16(start);
  if (count > 4096) return "corrupt";
  if (start + 2 + count * 12 > b.length) return "truncated";
  const numbers = new Map<number, number>();
  const texts = new Map<number, string>();
  for (let i = 0; i < count; i += 1) {
    const entry = start + 2 + i * 12;
    const tag = r16(entry);
    const type = r16(entry + 2);
    const n = r32(entry + 4);
    if (type === 3) numbers.set(tag, r16(entry + 8));
    else if (type === 4) numbers.set(tag, r32(entry + 8));
    else if (type === 2) {
      const at = n <= 4 ? entry + 8 : base + r32(entry + 8);
      if (at + n <= b.length) texts.set(tag, ascii(b, at, n).replace(/\0+$/, ""));
    }
  }
  return { little, numbers, texts };
}

// --------------------------------------------------------------- bytes

export function ascii(b: Uint8Array, at: number, length: number): string {
  let out = "";
  for (let i = at; i < at + length && i < b.length; i += 1) out += String.fromCharCode(b[i]!);
  return out;
}
export const u16be = (b: Uint8Array, at: number) => ((b[at] ?? 0) << 8) | (b[at + 1] ?? 0);
export const u16le = (b: Uint8Array, at: number) => (b[at] ?? 0) | ((b[at + 1] ?? 0) << 8);
export const u32be = (b: Uint8Array, at: number) => (u16be(b, at) * 0x10000 + u16be(b, at + 2)) >>> 0;
export const u32le = (b: Uint8Array, at: number) => (u16le(b, at) + u16le(b, at + 2) * 0x10000) >>> 0;
