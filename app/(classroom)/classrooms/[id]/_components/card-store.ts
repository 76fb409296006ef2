/**
 * Fresh PINs travel from the enrol (or reset) form to the printable cards
 * page through this tab's sessionStorage: the server keeps only their hashes,
 * so the cards can show a PIN only on the device that just issued it. They
 * are forgotten after a few hours, when the tab closes, or on request.
 */

const KEEP_MS = 6 * 60 * 60 * 1000;

const keyOf = (classroomId: string) => `heliotally.cards.${classroomId}`;

type Stored = { savedAt: number; pins: Record<string, string> };

export function readIssuedPins(classroomId: string): Record<string, string> {
  try {
    const raw = window.sessionStorage.getItem(keyOf(classroomId));
    if (!raw) return {};
    const stored = JSON.parse(raw) as Stored;
    if (Date.now() - stored.savedAt > KEEP_MS) {
      window.sessionStorage.removeItem(keyOf(classroomId));
      return {};
    }
    return stored.pins;
  } catch {
    return {};
  }
}

export function rememberIssuedPins(
  classroomId: string,
  cards: ReadonlyArray<{ userId: string; pin: string }>,
) {
  const pins = { ...readIssuedPins(classroomId) };
  for (const card of cards) pins[card.userId] = card.pin;
  window.sessionStorage.setItem(
    keyOf(classroomId),
    JSON.stringify({ savedAt: Date.now(), pins } satisfies Stored),
  );
}

export function forgetIssuedPins(classroomId: string) {
  window.sessionStorage.removeItem(keyOf(classroomId));
}
