import type { FlagReason } from "@/db/schema";

/**
 * Short names for the automatic flags, shown as chips on the Review desk.
 * Kept apart from db/schema so client components can use them without
 * pulling the database layer into the browser bundle.
 */
export const FLAG_LABELS = {
  "far-from-network": "Far from the network",
  "hemispheres-inconsistent": "Hemispheres don't add up",
  "unusual-spots-per-group": "Unusual s/g",
  "second-of-the-day": "Second count that day",
} as const satisfies Record<FlagReason, string>;

/** The same reasons as db/schema FLAG_REASONS, as a tuple zod can enumerate. */
export const FLAG_REASON_LIST = [
  "far-from-network",
  "hemispheres-inconsistent",
  "unusual-spots-per-group",
  "second-of-the-day",
] as const satisfies readonly FlagReason[];

// Fails to compile if db/schema gains a reason this list does not name.
type Missing = Exclude<FlagReason, (typeof FLAG_REASON_LIST)[number]>;
export const flagListIsComplete: Missing extends never ? true : never = true;
