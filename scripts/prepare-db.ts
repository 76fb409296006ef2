/**
 * Creates, migrates and (when empty and in demo mode) seeds the database named
 * by DATABASE_URL. Run by `npm run dev` and `npm start` before the server.
 */
import { getDb } from "@/db/client";
import { prepareDatabase } from "@/db/prepare";
import { runFullRecompute } from "@/db/queries/recompute";
import { flagAwaitingReview } from "@/db/queries/review-flags";
import { isDatabaseEmpty, seedDemo } from "@/db/seed";
import { getEnv } from "@/lib/env";

export async function prepareAndSeed({ log = console.log }: { log?: (line: string) => void } = {}) {
  const env = getEnv();
  const db = getDb();
  await prepareDatabase({ db, url: env.DATABASE_URL });
  if (env.HELIOTALLY_DEMO && (await isDatabaseEmpty(db))) {
    const started = Date.now();
    const { observations } = await seedDemo(db);
    log(
      `Seeded the demo network (invented data): ${observations} observations in ${Date.now() - started} ms.`,
    );
    // Fit every k and fill the Archive now, so the demo opens with a series.
    const recomputed = await runFullRecompute();
    log(`Fitted ${recomputed.kCoefficients} k coefficients; the series holds ${recomputed.days} days.`);
    // Judge the waiting counts again now that every observer has a fitted k.
    await flagAwaitingReview({ db });
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  prepareAndSeed()
    .then(() => console.log("Database ready."))
    .catch((error: unknown) => {
      console.error(error);
      process.exit(1);
    });
}
