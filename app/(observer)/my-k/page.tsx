import type { Metadata } from "next";
import Link from "next/link";

import { PageHeader } from "@/components/layout/app-shell";
import { KTable, ObserverComparison } from "@/components/series/observer-comparison";
import { listKHistory } from "@/db/queries/k";
import { requireObserver } from "@/lib/auth/session";

export const metadata: Metadata = { title: "My k" };

/** The observer's own k per instrument and period, and their counts against the network. */
export default async function MyKPage() {
  const { observer } = await requireObserver();
  const history = await listKHistory({ observerId: observer.id });
  const newest = [...history].sort((a, b) => b.periodEnd.localeCompare(a.periodEnd))[0];
  return (
    <>
      <PageHeader
        title="My k"
        lead={
          <>
            Your personal coefficient k brings your raw count 10g + s onto the network&apos;s scale: R = k(10g
            + s). Your coordinator fits it from the days you and the reference both counted.{" "}
            {newest ? (
              <>
                Your newest k is <strong>{newest.k.toFixed(3)}</strong>
                {newest.sigma !== null ? ` ± ${newest.sigma.toFixed(3)}` : ""} (
                {newest.instrumentName ?? "all instruments"}, {newest.periodStart} – {newest.periodEnd},{" "}
                {newest.commonDays} common days).
              </>
            ) : (
              "No k has been fitted for you yet, so your counts stand as they are (k = 1.0)."
            )}{" "}
            <Link href="/archive" className="text-corona-700 underline">
              Open the Archive
            </Link>
          </>
        }
      />
      <div className="flex flex-col gap-8">
        <section aria-labelledby="history-heading" className="flex flex-col gap-3">
          <h2 id="history-heading" className="text-lg font-semibold text-ink-900">
            k by instrument and period
          </h2>
          <KTable rows={history} />
        </section>
        <ObserverComparison
          choices={[]}
          fixedObserverId={observer.id}
          heading="My counts against the network"
          showKTable={false}
        />
      </div>
    </>
  );
}
