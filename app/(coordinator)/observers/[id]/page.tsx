import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";

import { PageHeader } from "@/components/layout/app-shell";
import { KTable, ObserverComparison } from "@/components/series/observer-comparison";
import { getKSettings, getObserverSummary, listKDriftAlerts, listKHistory } from "@/db/queries/k";

import { DriftAlerts } from "../_components/drift-alerts";

export const metadata: Metadata = { title: "Observer's k" };

type Props = { params: Promise<{ id: string }> };

/** One observer's k history per instrument and period, drift alerts, and their counts against the network. */
export default async function ObserverKPage({ params }: Props) {
  const { id } = await params;
  const observer = await getObserverSummary({ observerId: id });
  if (!observer) notFound();
  const settings = await getKSettings();
  const [history, alerts] = await Promise.all([
    listKHistory({ observerId: id }),
    listKDriftAlerts({ maxFraction: settings.driftFraction, observerId: id }),
  ]);
  return (
    <>
      <PageHeader
        title={observer.displayName}
        lead={
          <>
            Observer {observer.code}
            {observer.country ? `, ${observer.country}` : ""}. k per instrument and {settings.periodKind}.{" "}
            <Link href={`/observers/${id}/instruments`} className="text-corona-700 underline">
              Instruments
            </Link>{" "}
            ·{" "}
            <Link href={`/review/decisions?observerId=${id}`} className="text-corona-700 underline">
              Review decisions
            </Link>{" "}
            ·{" "}
            <Link href="/observers" className="text-corona-700 underline">
              All observers
            </Link>
          </>
        }
      />
      <div className="flex flex-col gap-8">
        <DriftAlerts alerts={alerts} driftFraction={settings.driftFraction} />
        <section aria-labelledby="history-heading" className="flex flex-col gap-3">
          <h2 id="history-heading" className="text-lg font-semibold text-ink-900">
            k history
          </h2>
          <KTable rows={history} />
        </section>
        <ObserverComparison
          choices={[]}
          fixedObserverId={null}
          observerId={id}
          heading="Counts against the network"
          showKTable={false}
        />
      </div>
    </>
  );
}
