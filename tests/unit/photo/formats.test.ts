import sharp from "sharp";
import { describe, expect, it } from "vitest";

import { exifTimeToUtc, readExif } from "@/lib/photo/exif";
import { readImageHeader, sniffPhotoFormat } from "@/lib/photo/formats";
import { checkPhotoBytes, MAX_PHOTO_BYTES } from "@/lib/photo/limits";

const FORMATS = ["jpeg", "png", "webp", "tiff"] as const;

async function makeImage(format: (typeof FORMATS)[number], { width = 60, height = 30, exif = false } = {}) {
  let pipeline = sharp({ create: { width, height, channels: 3, background: "#caa040" } });
  if (exif) {
    pipeline = pipeline
      .withExif({ IFD2: { DateTimeOriginal: "2024:05:10 12:34:56", OffsetTimeOriginal: "+02:00" } })
      .withMetadata({ orientation: 6 });
  }
  return new Uint8Array(await pipeline[format]().toBuffer());
}

/** A PNG signature and IHDR claiming a size, with no pixel data at all (a decompression bomb's header). */
function pngHeaderOnly({ width, height }: { width: number; height: number }) {
  const bytes = new Uint8Array(33);
  bytes.set([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
  const view = new DataView(bytes.buffer);
  view.setUint32(16, width);
  view.setUint32(20, height);
  bytes[24] = 8;
  bytes[25] = 2;
  return bytes;
}

describe("format by content", () => {
  for (const format of FORMATS) {
    it(`reads a ${format}'s format and pixel size from its header`, async () => {
      const bytes = await makeImage(format);
      expect(sniffPhotoFormat({ bytes })).toBe(format);
      expect(readImageHeader({ bytes })).toEqual({
        ok: true,
        header: expect.objectContaining({ format, storedWidthPx: 60, storedHeightPx: 30 }),
      });
    });
  }

  it("refuses text renamed .jpg, a GIF and an empty file, whatever they are called", () => {
    const text = new TextEncoder().encode("this is not a photo of the sun, just text saved as disk.jpg");
    expect(checkPhotoBytes({ bytes: text, sizeBytes: text.length })).toMatchObject({
      ok: false,
      reason: "not_image",
    });
    const gif = new TextEncoder().encode("GIF89a\x01\x00\x01\x00");
    expect(checkPhotoBytes({ bytes: gif, sizeBytes: gif.length })).toMatchObject({
      ok: false,
      reason: "not_image",
    });
    expect(checkPhotoBytes({ bytes: new Uint8Array(), sizeBytes: 0 })).toMatchObject({
      ok: false,
      reason: "empty",
    });
  });

  it("calls a JPEG cut off before its frame header truncated", async () => {
    const bytes = (await makeImage("jpeg", { exif: true })).slice(0, 40);
    const check = checkPhotoBytes({ bytes, sizeBytes: bytes.length });
    expect(check).toMatchObject({ ok: false, reason: "truncated" });
    if (!check.ok) expect(check.message).toMatch(/cut off/);
  });

  it("refuses more than 50 megapixels from the header alone, before any pixel is decoded", () => {
    const bomb = pngHeaderOnly({ width: 10_000, height: 10_000 });
    const check = checkPhotoBytes({ bytes: bomb, sizeBytes: bomb.length });
    expect(check).toMatchObject({ ok: false, reason: "too_many_pixels" });
    if (!check.ok) expect(check.message).toContain("10000 × 10000");
    expect(
      checkPhotoBytes({ bytes: pngHeaderOnly({ width: 7000, height: 7000 }), sizeBytes: 33 }),
    ).toMatchObject({ ok: true });
  });

  it("refuses more than 25 MB by size", () => {
    const bytes = pngHeaderOnly({ width: 10, height: 10 });
    expect(checkPhotoBytes({ bytes, sizeBytes: MAX_PHOTO_BYTES + 1 })).toMatchObject({
      ok: false,
      reason: "too_large",
    });
    expect(checkPhotoBytes({ bytes, sizeBytes: MAX_PHOTO_BYTES })).toMatchObject({ ok: true });
  });
});

describe("EXIF", () => {
  for (const format of ["jpeg", "png", "webp"] as const) {
    it(`reads orientation and capture time from a ${format}, and swaps the shown size for orientation 6`, async () => {
      const bytes = await makeImage(format, { exif: true });
      expect(readExif({ bytes })).toEqual({
        orientation: 6,
        takenAtText: "2024:05:10 12:34:56",
        takenAtOffset: "+02:00",
      });
      expect(checkPhotoBytes({ bytes, sizeBytes: bytes.length })).toMatchObject({
        ok: true,
        widthPx: 30,
        heightPx: 60,
      });
    });
  }

  it("reads a TIFF's orientation from its own first directory", async () => {
    const bytes = await makeImage("tiff", { exif: true });
    expect(readExif({ bytes }).orientation).toBe(6);
  });

  it("has nothing to say about a photo without EXIF, and never throws on garbage", async () => {
    expect(readExif({ bytes: await makeImage("png") })).toEqual({});
    const garbage = new Uint8Array([
      0xff, 0xd8, 0xff, 0xe1, 0x00, 0x10, 0x45, 0x78, 0x69, 0x66, 0, 0, 0x49, 0x49, 0x2a, 0, 0xff, 0xff, 0xff,
      0xff,
    ]);
    expect(readExif({ bytes: garbage })).toEqual({});
  });

  it("turns the camera's time into UT: exactly with a recorded offset, else on the observer's zone", () => {
    expect(
      exifTimeToUtc({
        takenAtText: "2024:05:10 12:34:56",
        takenAtOffset: "+02:00",
        timeZone: "UTC",
      })?.toISOString(),
    ).toBe("2024-05-10T10:34:56.000Z");
    // Europe/London is on BST (UT+1) in May and on GMT in January.
    expect(
      exifTimeToUtc({ takenAtText: "2024:05:10 12:34:56", timeZone: "Europe/London" })?.toISOString(),
    ).toBe("2024-05-10T11:34:56.000Z");
    expect(
      exifTimeToUtc({ takenAtText: "2024:01:10 12:34:56", timeZone: "Europe/London" })?.toISOString(),
    ).toBe("2024-01-10T12:34:56.000Z");
    expect(exifTimeToUtc({ takenAtText: "0000:00:00 00:00:00", timeZone: "UTC" })).toBeNull();
  });
});
