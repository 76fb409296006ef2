/**
 * The two EXIF facts Heliotally uses: the orientation (so the disk is shown
 * the right way round) and the capture time (offered as the observation
 * time). A small reader of the EXIF TIFF structure (JEITA CP-3451, common
 * practice across cameras) that runs in the browser and on the server.
 */
import { ascii, parseTiffIfd, sniffPhotoFormat, u16be, u32be, u32le } from "./formats";

export type ExifFacts = {
  orientation?: number;
  /** "YYYY:MM:DD HH:MM:SS" as the camera wrote it (its own clock, usually local time). */
  takenAtText?: string;
  /** "+HH:MM" when the camera recorded its offset from UTC. */
  takenAtOffset?: string;
};

const TAG_ORIENTATION = 0x0112;
const TAG_DATETIME = 0x0132;
const TAG_EXIF_IFD = 0x8769;
const TAG_DATETIME_ORIGINAL = 0x9003;
const TAG_OFFSET_TIME_ORIGINAL = 0x9011;

/** Orientation and capture time, from whichever place the format keeps EXIF. Never throws. */
export function readExif({ bytes }: { bytes: Uint8Array }): ExifFacts {
  try {
    const base = findExifTiff(bytes);
    if (base === null) return {};
    const ifd0 = parseTiffIfd(bytes, base);
    if (typeof ifd0 === "string") return {};
    const facts: ExifFacts = {};
    const orientation = ifd0.numbers.get(TAG_ORIENTATION);
    if (orientation !== undefined && orientation >= 1 && orientation <= 8) facts.orientation = orientation;
    let taken = ifd0.texts.get(TAG_DATETIME);
    const exifOffset = ifd0.numbers.get(TAG_EXIF_IFD);
    if (exifOffset !== undefined) {
      const exifIfd = parseTiffIfd(bytes, base, exifOffset);
      if (typeof exifIfd !== "string") {
        taken = exifIfd.texts.get(TAG_DATETIME_ORIGINAL) ?? taken;
        const offset = exifIfd.texts.get(TAG_OFFSET_TIME_ORIGINAL);
        if (offset && /^[+-]\d{2}:\d{2}$/.test(offset)) facts.takenAtOffset = offset;
      }
    }
    if (taken && EXIF_TIME.test(taken)) facts.takenAtText = taken;
    return facts;
  } catch {
    return {};
  }
}

const EXIF_TIME = /^(\d{4}):(\d{2}):(\d{2}) (\d{2}):(\d{2}):(\d{2})$/;

/**
 * The capture instant in UT. With a recorded offset it is exact; without one
 * the camera clock is taken to be on the observer's time zone (the usual
 * setting), which the interface says when it offers the time.
 */
export function exifTimeToUtc({
  takenAtText,
  takenAtOffset,
  timeZone,
}: {
  takenAtText: string;
  takenAtOffset?: string;
  timeZone: string;
}): Date | null {
  const m = EXIF_TIME.exec(takenAtText);
  if (!m) return null;
  const [year, month, day, hour, minute, second] = m.slice(1).map(Number) as [
    number,
    number,
    number,
    number,
    number,
    number,
  ];
  if (
    year < 1900 ||
    month < 1 ||
    month > 12 ||
    day < 1 ||
    day > 31 ||
    hour > 23 ||
    minute > 59 ||
    second > 60
  )
    return null;
  const asUtc = Date.UTC(year, month - 1, day, hour, minute, second);
  if (takenAtOffset) {
    const sign = takenAtOffset.startsWith("-") ? -1 : 1;
    const offsetMin = sign * (Number(takenAtOffset.slice(1, 3)) * 60 + Number(takenAtOffset.slice(4, 6)));
    return new Date(asUtc - offsetMin * 60_000);
  }
  // Wall-clock time in a zone → instant: subtract the zone's offset, twice to settle across a DST change.
  let guess = asUtc - zoneOffsetMs(asUtc, timeZone);
  guess = asUtc - zoneOffsetMs(guess, timeZone);
  return new Date(guess);
}

function zoneOffsetMs(instantMs: number, timeZone: string): number {
  try {
    const parts = new Intl.DateTimeFormat("en-US", {
      timeZone,
      hourCycle: "h23",
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      second: "2-digit",
    }).formatToParts(new Date(instantMs));
    const get = (type: string) => Number(parts.find((p) => p.type === type)?.value ?? 0);
    const wall = Date.UTC(
      get("year"),
      get("month") - 1,
      get("day"),
      get("hour"),
      get("minute"),
      get("second"),
    );
    return wall - Math.floor(instantMs / 1000) * 1000;
  } catch {
    return 0;
  }
}

/** Offset of the TIFF block holding EXIF, or null. */
function findExifTiff(b: Uint8Array): number | null {
  switch (sniffPhotoFormat({ bytes: b })) {
    case "tiff":
      return 0;
    case "jpeg": {
      let at = 2;
      while (at + 4 <= b.length && b[at] === 0xff) {
        const marker = b[at + 1]!;
        if (marker === 0xda || marker === 0xd9) return null;
        const length = u16be(b, at + 2);
        if (marker === 0xe1 && ascii(b, at + 4, 6) === "Exif\0\0") return at + 10;
        at += 2 + length;
      }
      return null;
    }
    case "png": {
      let at = 8;
      while (at + 8 <= b.length) {
        const length = u32be(b, at);
        const type = ascii(b, at + 4, 4);
        if (type === "eXIf") return at + 8;
        if (type === "IDAT" || type === "IEND") return null;
        at += 12 + length;
      }
      return null;
    }
    case "webp": {
      let at = 12;
      while (at + 8 <= b.length) {
        const type = ascii(b, at, 4);
        const length = u32le(b, at + 4);
        if (type === "EXIF") {
          // Some writers keep the JPEG-style "Exif\0\0" prefix inside the chunk.
          return ascii(b, at + 8, 6) === "Exif\0\0" ? at + 14 : at + 8;
        }
        at += 8 + length + (length % 2);
      }
      return null;
    }
    default:
      return null;
  }
}
