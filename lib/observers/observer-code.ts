import { randomInt } from "node:crypto";

// Letters and digits that cannot be misread for one another when written on
// a paper logbook (no 0/O, 1/I/L, 5/S, 2/Z, 8/B, U/V).
const ALPHABET = "34679ACDEFGHJKMNPQRTWXY";

/** Heliotally's observer code: "HT-" and four unambiguous characters. */
export function makeObserverCode(random: (max: number) => number = randomInt): string {
  let body = "";
  for (let i = 0; i < 4; i++) body += ALPHABET[random(ALPHABET.length)];
  return `HT-${body}`;
}

export const OBSERVER_CODE_PATTERN = /^HT-[34679ACDEFGHJKMNPQRTWXY]{4}$/;
