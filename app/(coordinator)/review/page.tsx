import type { Metadata } from "next";
import Link from "next/link";

import { PageHeader } from "@/components/layout/app-shell";
import { countAwaitingReview, listObserversForReview } from "@/db/queries/review";
import { getOutlierThreshold } from "@/db/queries/review-flags";
import { requireRole } from "@/lib/auth/session";

import { ReviewQueue } from "./_components/review-queue";
import { ReviewSettingsForm } from "./_components/settings-form";

export const metadata: Metadata = { title: "Review desk" };
export const dynamic = "force-dynamic";

export default async function ReviewDeskPage() {
  await requireRole(["coordinator"]);
  const [counts, observers, outlierThreshold] = await Promise.all([
    countAwaitingReview(),
    listObserversForReview(),
    getOutlierThreshold(),
  ]);
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Review desk"
        lead="Counts waiting for your decision. Only accepted counts enter the network series; flags point at counts worth a second look, they decide nothing."
        actions={
          <Link href="/review/decisions" className="text-sm font-semibold text-corona-700 underline">
            Decision log
          </Link>
        }
      />
      <ReviewSettingsForm outlierThreshold={outlierThreshold} />
      <ReviewQueue observers={observers} initialCounts={counts} />
    </div>
  );
}
