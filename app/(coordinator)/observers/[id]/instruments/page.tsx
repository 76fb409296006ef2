import type { Metadata } from "next";
import { notFound } from "next/navigation";

import { PageHeader } from "@/components/layout/app-shell";
import { getObserverSummary, listInstrumentsWithUsage } from "@/db/queries/instruments";
import { requirePageRole } from "@/lib/auth/page-guard";

import { InstrumentCard } from "@/components/instruments/instrument-card";

export const metadata: Metadata = { title: "Observer's instruments" };

/** A coordinator reads an observer's instruments; nothing here changes them. */
export default async function ObserverInstrumentsPage({ params }: { params: Promise<{ id: string }> }) {
  await requirePageRole(["coordinator"]);
  const { id } = await params;
  const observer = await getObserverSummary({ observerId: id });
  if (!observer) notFound();
  const instruments = await listInstrumentsWithUsage({ observerId: observer.id });
  const now = new Date();
  return (
    <>
      <PageHeader
        title={`Instruments of ${observer.displayName}`}
        lead={`Observer ${observer.code}. Read-only: observers keep their own instruments. Sizes are shown in their units (${observer.unitSystem}).`}
      />
      {instruments.length === 0 ? (
        <p className="rounded-lg border border-dashed border-ink-200 bg-white p-6 text-sm text-ink-700">
          This observer has not described any instruments yet. Ask them to add theirs under Instruments.
        </p>
      ) : (
        <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3" aria-label="Instruments">
          {instruments.map((instrument) => (
            <li key={instrument.id} className="relative">
              <InstrumentCard instrument={instrument} unitSystem={observer.unitSystem} at={now} />
              {instrument.archivedAt ? (
                <span className="absolute top-3 right-3 rounded-full bg-ink-100 px-2 py-0.5 text-xs text-ink-700">
                  Archived
                </span>
              ) : null}
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
