import type { Metadata } from "next";
import Link from "next/link";

import { PageHeader } from "@/components/layout/app-shell";
import { listDeciders, listObserversForReview } from "@/db/queries/review";
import { requireRole } from "@/lib/auth/session";

import { DecisionLog } from "./_components/decision-log";

export const metadata: Metadata = { title: "Decision log" };
export const dynamic = "force-dynamic";

export default async function DecisionLogPage() {
  await requireRole(["coordinator"]);
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
      <DecisionLog observers={observers} deciders={deciders} />
    </div>
  );
}
