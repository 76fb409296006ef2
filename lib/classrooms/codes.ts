/**
 * Classroom codes, student PINs and display names. Pure functions: the
 * random source is injectable so tests can pin it.
 */
// Letters and digits a child cannot misread when copying from a printed card
// (no 0/O, 1/I/L, 5/S, 2/Z, 8/B, U/V); the same alphabet as observer codes.
const CODE_ALPHABET = "34679ACDEFGHJKMNPQRTWXY";
const CODE_PREFIX = "SUN";

export const PIN_LENGTH = 4;

type RandomInt = (max: number) => number;

/**
 * A uniform whole number in [0, max) from the Web Crypto generator (present
 * in Node and in browsers, so this file can be shared with forms). Rejection
 * sampling keeps it unbiased.
 */
export function secureRandomInt(max: number): number {
  const limit = Math.floor(0x1_0000_0000 / max) * max;
  const buffer = new Uint32Array(1);
  for (;;) {
    globalThis.crypto.getRandomValues(buffer);
    const value = buffer[0] as number;
    if (value < limit) return value % max;
  }
}

/** A classroom code such as "SUN-7KQ4": short enough to copy from a board. */
export function makeJoinCode({ random = secureRandomInt }: { random?: RandomInt } = {}): string {
  let body = "";
  for (let i = 0; i < 4; i++) body += CODE_ALPHABET[random(CODE_ALPHABET.length)];
  return `${CODE_PREFIX}-${body}`;
}

/**
 * Tidies what a student typed into the stored form of a code: capitals, one
 * hyphen after the prefix ("sun hls8", "SUNHLS8" and "SUN–HLS8" all become
 * "SUN-HLS8").
 */
export function normaliseJoinCode(typed: string): string {
  const tidy = typed
    .normalize("NFKC")
    .toUpperCase()
    .replace(/[\s_\u2010-\u2015]+/g, "-")
    .replace(/[^A-Z0-9-]/g, "")
    .replace(/-+/g, "-")
    .replace(/^-|-$/g, "");
  // Our codes are a three-letter prefix and four characters; a code typed
  // without its hyphen gets it back.
  if (/^[A-Z0-9]{7}$/.test(tidy)) return `${tidy.slice(0, 3)}-${tidy.slice(3)}`;
  return tidy;
}

/**
 * A personal PIN of four digits. PINs anyone would try first (one digit
 * repeated, a straight run such as 1234 or 9876) are drawn again.
 */
export function makePin({ random = secureRandomInt }: { random?: RandomInt } = {}): string {
  for (;;) {
    let pin = "";
    for (let i = 0; i < PIN_LENGTH; i++) pin += String(random(10));
    if (!isObviousPin(pin)) return pin;
  }
}

export function isObviousPin(pin: string): boolean {
  const digits = [...pin].map(Number);
  const steps = digits.slice(1).map((d, i) => d - (digits[i] as number));
  const allSame = steps.every((s) => s === 0);
  const run = steps.every((s) => s === 1) || steps.every((s) => s === -1);
  return allSame || run;
}

/**
 * How two display names are compared: case, full stops and extra spaces do
 * not matter, so "Ava P." signs in as "ava p" and the educator cannot enrol
 * "Ava P" beside "Ava P.".
 */
export function normaliseDisplayName(name: string): string {
  return name.normalize("NFKC").toLowerCase().replace(/[.’']/g, "").replace(/\s+/g, " ").trim();
}
