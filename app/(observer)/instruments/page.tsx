import type { Metadata } from "next";
import Link from "next/link";

import { PageHeader } from "@/components/layout/app-shell";
import { SafetyNotice } from "@/components/safety-notice";
import { ButtonLink } from "@/components/ui/button";
import { listInstrumentsWithUsage } from "@/db/queries/instruments";
import { requireObserver } from "@/lib/auth/session";

import { InstrumentCard } from "@/components/instruments/instrument-card";
import { UnitSystemToggle } from "./_components/unit-system-toggle";

export const metadata: Metadata = { title: "Instruments" };

export default async function InstrumentsPage() {
  const { observer } = await requireObserver();
  const instruments = await listInstrumentsWithUsage({ observerId: observer.id });
  const inUse = instruments.filter((i) => i.archivedAt === null);
  const archived = instruments.filter((i) => i.archivedAt !== null);
  const now = new Date();
  return (
    <>
      <PageHeader
        title="Instruments"
        lead="The set-ups you count with. Each count in your Logbook records which one you used, and your k is kept per instrument."
        actions={
          <>
            <ButtonLink href="/planner" variant="secondary">
              Projection planner
            </ButtonLink>
            <ButtonLink href="/instruments/new">Add an instrument</ButtonLink>
          </>
        }
      />
      <div className="mb-6 flex flex-wrap items-center gap-3 text-sm text-ink-700">
        <span>Show sizes in</span>
        <UnitSystemToggle unitSystem={observer.unitSystem} />
      </div>
      <div className="grid gap-8 lg:grid-cols-[2fr_1fr]">
        <div className="flex flex-col gap-6">
          {inUse.length === 0 ? (
            <div className="rounded-lg border border-dashed border-ink-200 bg-white p-6 text-sm text-ink-700">
              <p className="font-semibold text-ink-900">No instruments in use</p>
              <p className="mt-1">
                Add the pinhole box, mirror or telescope you count with. The Projection planner then shows how
                large and how sharp its disk will be, and your counts can name it.
              </p>
              <div className="mt-3">
                <ButtonLink href="/instruments/new">Add an instrument</ButtonLink>
              </div>
            </div>
          ) : (
            <ul className="grid gap-4 sm:grid-cols-2" aria-label="Instruments in use">
              {inUse.map((instrument) => (
                <li key={instrument.id}>
                  <InstrumentCard
                    instrument={instrument}
                    unitSystem={observer.unitSystem}
                    at={now}
                    href={`/instruments/${instrument.id}`}
                    planHref={`/instruments/${instrument.id}/plan`}
                  />
                </li>
              ))}
            </ul>
          )}
          {archived.length > 0 ? (
            <section>
              <h2 className="text-sm font-semibold tracking-wide text-ink-600 uppercase">Archived</h2>
              <p className="mt-1 text-sm text-ink-600">
                Archived instruments stay on the observations made with them. Open one to restore it.
              </p>
              <ul className="mt-3 flex flex-col divide-y divide-ink-100 rounded-lg border border-ink-100 bg-white">
                {archived.map((instrument) => (
                  <li
                    key={instrument.id}
                    className="flex flex-wrap items-center justify-between gap-2 px-4 py-2 text-sm"
                  >
                    <Link
                      href={`/instruments/${instrument.id}`}
                      className="font-medium text-corona-700 underline"
                    >
                      {instrument.name}
                    </Link>
                    <span className="text-ink-500">
                      {instrument.observationCount}{" "}
                      {instrument.observationCount === 1 ? "observation" : "observations"}
                    </span>
                  </li>
                ))}
              </ul>
            </section>
          ) : null}
        </div>
        <SafetyNotice compact />
      </div>
    </>
  );
}
