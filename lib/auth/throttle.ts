import "server-only";

import { clearThrottleRow, getThrottleRows, saveThrottleRow } from "@/db/queries/throttle";

/**
 * Failed sign-ins are counted per account and per network address over a
 * window; past the limit the key is locked for a while. Per-account limits
 * stop guessing one password; per-address limits stop spraying many.
 */
export const THROTTLE_RULES = {
  account: { maxFailures: 5, windowMs: 15 * 60_000, lockMs: 15 * 60_000 },
  address: { maxFailures: 20, windowMs: 15 * 60_000, lockMs: 15 * 60_000 },
} as const;

type Kind = keyof typeof THROTTLE_RULES;

const keyOf = (kind: Kind, value: string) => `${kind}:${value.toLowerCase()}`;

export class SignInLockedError extends Error {
  constructor(readonly retryAfterMs: number) {
    const minutes = Math.max(1, Math.ceil(retryAfterMs / 60_000));
    super(
      `Too many failed sign-ins. Try again in ${minutes} minute${minutes === 1 ? "" : "s"}, or use a sign-in link.`,
    );
  }
}

export async function assertSignInAllowed({
  email,
  address,
  now = new Date(),
}: {
  email: string;
  address: string;
  now?: Date;
}) {
  const rows = await getThrottleRows({ keys: [keyOf("account", email), keyOf("address", address)] });
  const waits = rows
    .map((r) => (r.lockedUntil ? r.lockedUntil.getTime() - now.getTime() : 0))
    .filter((ms) => ms > 0);
  if (waits.length > 0) throw new SignInLockedError(Math.max(...waits));
}

export async function recordSignInFailure({
  email,
  address,
  now = new Date(),
}: {
  email: string;
  address: string;
  now?: Date;
}) {
  const pairs: Array<[Kind, string]> = [
    ["account", keyOf("account", email)],
    ["address", keyOf("address", address)],
  ];
  const rows = await getThrottleRows({ keys: pairs.map(([, key]) => key) });
  for (const [kind, key] of pairs) {
    const rule = THROTTLE_RULES[kind];
    const row = rows.find((r) => r.key === key);
    const fresh = !row || now.getTime() - row.windowStartedAt.getTime() > rule.windowMs;
    const failures = fresh ? 1 : row.failures + 1;
    await saveThrottleRow({
      key,
      failures,
      windowStartedAt: fresh ? now : row.windowStartedAt,
      lockedUntil: failures >= rule.maxFailures ? new Date(now.getTime() + rule.lockMs) : null,
    });
  }
}

export async function recordSignInSuccess({ email }: { email: string }) {
  await clearThrottleRow({ key: keyOf("account", email) });
}
