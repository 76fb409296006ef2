import type { Metadata } from "next";
import Link from "next/link";

import { PageHeader } from "@/components/layout/app-shell";
import { ButtonLink } from "@/components/ui/button";
import { StaticTable } from "@/components/ui/static-table";
import { describeKReference, getKSettings, listKDriftAlerts, listObserverKSummaries } from "@/db/queries/k";
import { listReferenceSeries } from "@/db/queries/reference-series";
import { K_METHOD_LABELS, NETWORK_REFERENCE } from "@/lib/validation/k-settings";

import { DriftAlerts } from "./_components/drift-alerts";

export const metadata: Metadata = { title: "Observers" };

export default async function ObserversPage() {
  const settings = await getKSettings();
  const [summaries, alerts, references] = await Promise.all([
    listObserverKSummaries(),
    listKDriftAlerts({ maxFraction: settings.driftFraction }),
    listReferenceSeries(),
  ]);
  const seriesNames = new Map(references.map((r) => [r.id, r.name]));
  const isDrifting = (summary: (typeof summaries)[number]) =>
    alerts.some((a) => a.observerId === summary.observerId && a.instrumentName === summary.instrumentName);
  const referenceName =
    settings.referenceSeriesId === NETWORK_REFERENCE
      ? "the network itself, pilot held fixed"
      : (seriesNames.get(settings.referenceSeriesId) ?? "a reference series that no longer exists");

  return (
    <>
      <PageHeader
        title="Observers"
        lead={
          <>
            Every observer and instrument with accepted counts, with its newest k. k is fitted per{" "}
            {settings.periodKind} by {K_METHOD_LABELS[settings.method].toLowerCase()} against {referenceName},
            from at least {settings.minCommonDays} common days.
          </>
        }
        actions={<ButtonLink href="/observers/k-settings">k settings and recompute</ButtonLink>}
      />
      <DriftAlerts alerts={alerts} driftFraction={settings.driftFraction} />
      <section aria-labelledby="observers-heading" className="mt-8 flex flex-col gap-3">
        <h2 id="observers-heading" className="text-lg font-semibold text-ink-900">
          Observers and their k
        </h2>
        <StaticTable
          caption="Observers with their newest k"
          rows={summaries}
          rowKey={(summary) => summary.instrumentId}
          rowClassName={() => "hover:bg-corona-50"}
          empty={
            <>
              No accepted counts yet. Accept counts on the{" "}
              <Link href="/review" className="font-semibold text-corona-700 underline">
                Review desk
              </Link>
              , then run a recompute to fit each observer&apos;s k.
            </>
          }
          columns={[
            {
              key: "observer",
              header: "Observer",
              cell: (summary) => (
                <>
                  <Link
                    href={`/observers/${summary.observerId}`}
                    className="font-medium text-ink-900 underline-offset-2 hover:underline"
                  >
                    {summary.displayName}
                  </Link>{" "}
                  <span className="text-xs text-ink-500">{summary.code}</span>
                </>
              ),
            },
            { key: "instrument", header: "Instrument", cell: (summary) => summary.instrumentName },
            { key: "accepted", header: "Accepted counts", cell: (summary) => summary.acceptedCounts },
            {
              key: "k",
              header: "Newest k",
              className: "font-semibold",
              cell: (summary) => (
                <>
                  {summary.latest ? (
                    summary.latest.k.toFixed(3)
                  ) : (
                    <span className="font-normal text-ink-500">none yet (1.0 in use)</span>
                  )}
                  {isDrifting(summary) ? (
                    <span className="ml-2 rounded bg-caution-50 px-1.5 py-0.5 text-xs font-semibold text-caution-700">
                      drift
                    </span>
                  ) : null}
                </>
              ),
            },
            {
              key: "sigma",
              header: "σ",
              cell: (summary) =>
                summary.latest?.reference.startsWith("network:")
                  ? "held fixed"
                  : summary.latest?.sigma == null
                    ? "—"
                    : `± ${summary.latest.sigma.toFixed(3)}`,
            },
            { key: "days", header: "Common days", cell: (summary) => summary.latest?.commonDays ?? "—" },
            {
              key: "period",
              header: "Period",
              className: "whitespace-nowrap",
              cell: (summary) =>
                summary.latest ? (
                  <>
                    {summary.latest.periodStart} – {summary.latest.periodEnd}
                    <span className="block text-xs text-ink-500">
                      {describeKReference({ reference: summary.latest.reference, seriesNames })}
                    </span>
                  </>
                ) : (
                  "—"
                ),
            },
            { key: "periods", header: "Periods with k", cell: (summary) => summary.periods },
          ]}
        />
      </section>
    </>
  );
}
