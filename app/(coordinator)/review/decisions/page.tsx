import type { Metadata } from "next";
import Link from "next/link";

import { PageHeader } from "@/components/layout/app-shell";
import { listDeciders, listObserversForReview } from "@/db/queries/review";
import { requireRole } from "@/lib/auth/session";
import { decisionLogQuerySchema } from "@/lib/validation/review";

import { DecisionLog } from "./_components/decision-log";

export const metadata: Metadata = { title: "Decision log" };
export const dynamic = "force-dynamic";

export default async function DecisionLogPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  await requireRole(["coordinator"]);
  // A link may open the log already filtered (e.g. from an observer's page);
  // anything the schema refuses is simply not applied.
  const given = await searchParams;
  const pick = (key: "observerId" | "action") => (typeof given[key] === "string" ? given[key] : undefined);
  const parsed = decisionLogQuerySchema.safeParse({ observerId: pick("observerId"), action: pick("action") });
  const initial = parsed.success ? { observerId: parsed.data.observerId, action: parsed.data.action } : {};
  const [observers, deciders] = await Promise.all([listObserversForReview(), listDeciders()]);
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Decision log"
        lead="Every decision on the Review desk, by anyone: who decided, when, what and why. Nothing here can be edited; a change of mind is a new decision on the count's page."
        actions={
          <Link href="/review" className="text-sm font-semibold text-corona-700 underline">
            Back to the Review desk
          </Link>
        }
      />
      <DecisionLog observers={observers} deciders={deciders} initial={initial} />
    </div>
  );
}
