import type { Metadata } from "next";
import Link from "next/link";

import { PageHeader } from "@/components/layout/app-shell";
import { SafetyNotice } from "@/components/safety-notice";
import { getCurrentKs, listInstrumentsByObserver } from "@/db/queries/observers";
import { requireObserver } from "@/lib/auth/session";

import { ObservationForm } from "./_components/observation-form";

export const metadata: Metadata = { title: "Log a count" };

export default async function NewObservationPage() {
  const { observer } = await requireObserver();
  const [instruments, kFor] = await Promise.all([
    listInstrumentsByObserver({ observerId: observer.id }),
    getCurrentKs({ observerId: observer.id }),
  ]);
  const options = instruments.map((i) => ({ id: i.id, name: i.name, k: kFor(i.id).k }));
  return (
    <div className="grid gap-8 lg:grid-cols-[2fr_1fr]">
      <div>
        <PageHeader
          title="Log a count"
          lead="Count the groups (g) and the individual spots (s) you see on the projected disk."
        />
        {options.length === 0 ? (
          <p className="rounded-lg border border-ink-100 bg-white p-6 text-sm text-ink-700">
            You have no instruments in use yet.{" "}
            <Link href="/instruments/new" className="text-corona-700 underline">
              Add the one you count with
            </Link>
            , then come back to log your count.
          </p>
        ) : (
          <ObservationForm
            instruments={options}
            timeZone={observer.timeZone}
            nowIso={new Date().toISOString()}
          />
        )}
        <p className="mt-4 text-sm text-ink-600">
          <Link href="/logbook" className="text-corona-700 underline">
            Back to the Logbook
          </Link>
        </p>
      </div>
      <div className="flex flex-col gap-4">
        <SafetyNotice />
        <section className="rounded-lg border border-ink-100 bg-white p-4 text-sm text-ink-700">
          <h2 className="font-semibold text-ink-900">How the relative number is made</h2>
          <p className="mt-1">
            <strong>R = k(10g + s)</strong>: ten for each group plus one for each spot, scaled by your
            personal coefficient <em>k</em>, which your coordinator finds by comparing your counts with the
            network&apos;s.
          </p>
        </section>
      </div>
    </div>
  );
}
