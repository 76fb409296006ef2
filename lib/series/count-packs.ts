/**
 * An instrument's accepted counts as one binary value (a "count pack"), kept
 * in the database beside the observations so a full recompute can read a
 * million counts as a few hundred blobs instead of rebuilding them from the
 * index (db/queries/count-packs.ts keeps them current).
 *
 * Layout of a pack of n counts, little-endian, 10 bytes per count:
 *
 *   bytes 0 … 4n        n × Int32   the UT day, days since 1970-01-01
 *   bytes 4n … 10n      n × 3 × Uint16, per count:
 *                         10g + s,
 *                         10gN + sN + 1, or 0 when the count has no north/south split,
 *                         10gS + sS + 1, or 0 likewise
 *
 * the same fields, in the same order, as the packed integer of
 * lib/series/packed-count.ts. A pack whose length, days or order do not
 * check out is treated as missing and rebuilt from the observations.
 */

import { PACKED_DAY_OFFSET, PACKED_FIELD_LIMIT, PACKED_WIDTH } from "./packed-count";

/** Stored with each pack; a pack of another format is rebuilt. */
export const COUNT_PACK_FORMAT = 1;
export const COUNT_PACK_BYTES_PER_COUNT = 10;

/** The days a pack may hold: those a six-digit packed day can (lib/series/packed-count.ts). */
const FIRST_DAY = 100_000 - PACKED_DAY_OFFSET;
const LAST_DAY = 999_999 - PACKED_DAY_OFFSET;

const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/** One instrument's counts, in day order, as typed arrays over (or copied from) its pack. */
export type CountPack = {
  count: number;
  days: Int32Array;
  /** Three per count: 10g + s, north + 1 (0: no split), south + 1 (0: no split). */
  values: Uint16Array;
};

function emptyPack(count: number): { pack: CountPack; bytes: Uint8Array } {
  const buffer = new ArrayBuffer(count * COUNT_PACK_BYTES_PER_COUNT);
  return {
    pack: {
      count,
      days: new Int32Array(buffer, 0, count),
      values: new Uint16Array(buffer, 4 * count, 3 * count),
    },
    bytes: new Uint8Array(buffer),
  };
}

/** The bytes to store for a pack made in memory (little-endian whatever the machine). */
function bytesOf(pack: CountPack, bytes: Uint8Array): Uint8Array {
  if (LITTLE_ENDIAN) return bytes;
  const out = new Uint8Array(bytes.length);
  const view = new DataView(out.buffer);
  for (let i = 0; i < pack.count; i++) view.setInt32(4 * i, pack.days[i] as number, true);
  for (let i = 0; i < 3 * pack.count; i++)
    view.setUint16(4 * pack.count + 2 * i, pack.values[i] as number, true);
  return out;
}

const ONLY_DIGITS = /^[0-9]*$/;
const ZEROS_4 = 48 * 1111;

/** The number written by the four digits at `at` (checked to be digits beforehand). */
function digits4(text: string, at: number): number {
  return (
    text.charCodeAt(at) * 1000 +
    text.charCodeAt(at + 1) * 100 +
    text.charCodeAt(at + 2) * 10 +
    text.charCodeAt(at + 3) -
    ZEROS_4
  );
}

/** The number written by the six digits at `at` (checked to be digits beforehand). */
function digits6(text: string, at: number): number {
  return digits4(text, at) * 100 + text.charCodeAt(at + 4) * 10 + text.charCodeAt(at + 5) - 48 * 11;
}

/**
 * Several instruments' counts as the database writes them from its index
 * (fixed-width packed integers, one string for the lot, instrument after
 * instrument: `counts[i]` values for the i-th), as one pack each, with the
 * bytes to store. The string must hold exactly those values, digits only.
 */
export function packsFromPackedText(
  packed: string,
  counts: readonly number[],
): Array<{ pack: CountPack; bytes: Uint8Array }> {
  const total = counts.reduce((sum, n) => sum + n, 0);
  if (!counts.every((n) => Number.isInteger(n) && n >= 0) || total * PACKED_WIDTH !== packed.length) {
    throw new RangeError(
      `Read ${packed.length} packed characters for ${total} counts (${total * PACKED_WIDTH} expected)`,
    );
  }
  // One regular expression over the whole string runs far faster than a
  // check per character in the loop below.
  if (!ONLY_DIGITS.test(packed)) throw new RangeError("Packed counts must be digits only");
  let p = 0;
  return counts.map((count) => {
    const made = emptyPack(count);
    const { days, values } = made.pack;
    for (let i = 0; i < count; i++, p += PACKED_WIDTH) {
      days[i] = digits6(packed, p) - PACKED_DAY_OFFSET;
      values[3 * i] = digits4(packed, p + 6);
      values[3 * i + 1] = digits4(packed, p + 10);
      values[3 * i + 2] = digits4(packed, p + 14);
    }
    return { pack: made.pack, bytes: bytesOf(made.pack, made.bytes) };
  });
}

/**
 * A stored pack, or null when it cannot be trusted (wrong length, a day out
 * of range or out of order, a value too large): the caller then rebuilds it from the
 * observations.
 */
export function readCountPack(stored: ArrayBuffer | Uint8Array, count: number): CountPack | null {
  if (!(Number.isInteger(count) && count >= 0)) return null;
  const bytes = stored instanceof Uint8Array ? stored : new Uint8Array(stored);
  if (bytes.byteLength !== count * COUNT_PACK_BYTES_PER_COUNT) return null;
  let pack: CountPack;
  if (LITTLE_ENDIAN && bytes.byteOffset % 4 === 0) {
    pack = {
      count,
      days: new Int32Array(bytes.buffer, bytes.byteOffset, count),
      values: new Uint16Array(bytes.buffer, bytes.byteOffset + 4 * count, 3 * count),
    };
  } else {
    pack = emptyPack(count).pack;
    const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    for (let i = 0; i < count; i++) pack.days[i] = view.getInt32(4 * i, true);
    for (let i = 0; i < 3 * count; i++) pack.values[i] = view.getUint16(4 * count + 2 * i, true);
  }
  for (let i = 0; i < count; i++) {
    const day = pack.days[i] as number;
    if (day < FIRST_DAY || day > LAST_DAY) return null;
    if (i > 0 && day < (pack.days[i - 1] as number)) return null;
  }
  for (let i = 0; i < 3 * count; i++) if ((pack.values[i] as number) > PACKED_FIELD_LIMIT) return null;
  return pack;
}
