import { randomFillSync } from "node:crypto";

/**
 * Ids for rows written in bulk (imported observations, the k coefficients of
 * a recompute): standard version-7 UUIDs (RFC 9562 §5.7),
 * a 48-bit Unix-millisecond timestamp followed by random bits, so a 36-character
 * TEXT id like every other. A random (version-4) id lands anywhere in the primary
 * key's index; 100,000 of them in one transaction touch nearly every page of it.
 * Time-ordered ids of one batch all go to its right-hand end instead.
 *
 * The 26 bits after the version (the "rand_a" field and the top of "rand_b") hold
 * the row's number in its batch (an import's line number) as the counter of RFC 9562 §6.2 method 1, so the ids of one
 * import sort in file order and never repeat within it; the last 48 bits are
 * random. A line past the counter's range moves on to the next millisecond.
 */
export const LINE_COUNTER_BITS = 26;
const LINE_COUNTER_SPAN = 2 ** LINE_COUNTER_BITS;
const RANDOM_BYTES = 6;
const POOL_IDS = 4096;

/** A maker of ids for one batch, all stamped with its start time. */
export function makeOrderedIdMaker({ startMs }: { startMs: number }) {
  const pool = Buffer.alloc(RANDOM_BYTES * POOL_IDS);
  // Random hex for the next few thousand ids at once: one native call per
  // pool rather than one per id (an import makes 100,000 of them).
  let randomHex = "";
  let next = POOL_IDS;
  let prefixMs = Number.NaN;
  let prefix = "";

  return function makeOrderedId(line: number): string {
    if (!Number.isInteger(line) || line < 0) throw new RangeError(`No id for line ${line}.`);
    if (next === POOL_IDS) {
      randomHex = randomFillSync(pool).toString("hex");
      next = 0;
    }
    const random = randomHex.slice(next * RANDOM_BYTES * 2, (next + 1) * RANDOM_BYTES * 2);
    next++;
    const ms = startMs + Math.floor(line / LINE_COUNTER_SPAN);
    if (ms !== prefixMs) {
      const hex = ms.toString(16).padStart(12, "0");
      prefix = `${hex.slice(0, 8)}-${hex.slice(8, 12)}-7`;
      prefixMs = ms;
    }
    const counter = line % LINE_COUNTER_SPAN;
    // The counter's top 12 bits; the variant's two bits (binary 10) with the
    // counter's bits 13 and 12; its low 12 bits.
    return `${prefix}${HEX3[counter >>> 14]}-${VARIANT_HEX[(counter >>> 12) & 0x3]}${HEX3[counter & 0xfff]}-${random}`;
  };
}

const HEX3 = Array.from({ length: 4096 }, (_, n) => n.toString(16).padStart(3, "0"));
const VARIANT_HEX = ["8", "9", "a", "b"];
