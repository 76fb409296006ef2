import type { Metadata } from "next";
import Link from "next/link";

import { PageHeader } from "@/components/layout/app-shell";
import { ButtonLink } from "@/components/ui/button";
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
        {summaries.length === 0 ? (
          <p className="rounded-lg border border-dashed border-ink-200 px-4 py-6 text-sm text-ink-600">
            No accepted counts yet. Accept counts on the{" "}
            <Link href="/review" className="font-semibold text-corona-700 underline">
              Review desk
            </Link>
            , then run a recompute to fit each observer&apos;s k.
          </p>
        ) : (
          <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white shadow-sm">
            <table className="min-w-full text-sm">
              <caption className="sr-only">Observers with their newest k</caption>
              <thead className="bg-ink-50 text-left text-xs tracking-wide text-ink-600 uppercase">
                <tr>
                  <th scope="col" className="px-3 py-2">
                    Observer
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Instrument
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Accepted counts
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Newest k
                  </th>
                  <th scope="col" className="px-3 py-2">
                    σ
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Common days
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Period
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Periods with k
                  </th>
                </tr>
              </thead>
              <tbody>
                {summaries.map((s) => {
                  const drifting = alerts.some(
                    (a) => a.observerId === s.observerId && a.instrumentName === s.instrumentName,
                  );
                  return (
                    <tr key={s.instrumentId} className="border-t border-ink-100 hover:bg-corona-50">
                      <td className="px-3 py-2">
                        <Link
                          href={`/observers/${s.observerId}`}
                          className="font-medium text-ink-900 underline-offset-2 hover:underline"
                        >
                          {s.displayName}
                        </Link>{" "}
                        <span className="text-xs text-ink-500">{s.code}</span>
                      </td>
                      <td className="px-3 py-2">{s.instrumentName}</td>
                      <td className="px-3 py-2 tabular-nums">{s.acceptedCounts}</td>
                      <td className="px-3 py-2 font-semibold tabular-nums">
                        {s.latest ? (
                          s.latest.k.toFixed(3)
                        ) : (
                          <span className="font-normal text-ink-500">none yet (1.0 in use)</span>
                        )}
                        {drifting ? (
                          <span className="ml-2 rounded bg-caution-50 px-1.5 py-0.5 text-xs font-semibold text-caution-700">
                            drift
                          </span>
                        ) : null}
                      </td>
                      <td className="px-3 py-2 tabular-nums">
                        {s.latest?.reference.startsWith("network:")
                          ? "held fixed"
                          : s.latest?.sigma == null
                            ? "—"
                            : `± ${s.latest.sigma.toFixed(3)}`}
                      </td>
                      <td className="px-3 py-2 tabular-nums">{s.latest?.commonDays ?? "—"}</td>
                      <td className="px-3 py-2 whitespace-nowrap tabular-nums">
                        {s.latest ? `${s.latest.periodStart} – ${s.latest.periodEnd}` : "—"}
                        {s.latest ? (
                          <span className="block text-xs text-ink-500">
                            {describeKReference({ reference: s.latest.reference, seriesNames })}
                          </span>
                        ) : null}
                      </td>
                      <td className="px-3 py-2 tabular-nums">{s.periods}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        )}
      </section>
    </>
  );
}
