import type { Metadata } from "next";
import { notFound } from "next/navigation";

import { PageHeader } from "@/components/layout/app-shell";
import { SafetyNotice } from "@/components/safety-notice";
import { ButtonLink } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { getInstrumentWithUsage } from "@/db/queries/instruments";
import { requireObserver } from "@/lib/auth/session";
import { describeInstrumentDimensions } from "@/lib/instruments/describe";
import { describeSafetyEmphasis, INSTRUMENT_KIND_LABELS } from "@/lib/instruments/fields";
import { getProjectedDiskDiameterMm } from "@/lib/optics/disk-size";
import { formatLength } from "@/lib/optics/units";

import { InstrumentActions } from "../_components/instrument-actions";

export const metadata: Metadata = { title: "Instrument" };

export default async function InstrumentPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<{ saved?: string }>;
}) {
  const { observer } = await requireObserver();
  const [{ id }, { saved }] = await Promise.all([params, searchParams]);
  const instrument = await getInstrumentWithUsage({ observerId: observer.id, instrumentId: id });
  if (!instrument) notFound();
  const unitSystem = observer.unitSystem;
  const dimensions = describeInstrumentDimensions({
    kind: instrument.kind,
    params: instrument.params,
    unitSystem,
  });
  const diskMm = getProjectedDiskDiameterMm({ instrument, at: new Date() });
  const archived = instrument.archivedAt !== null;
  const n = instrument.observationCount;
  return (
    <>
      <PageHeader
        title={instrument.name}
        lead={INSTRUMENT_KIND_LABELS[instrument.kind]}
        actions={
          archived ? undefined : (
            <>
              <ButtonLink href={`/instruments/${instrument.id}/plan`} variant="secondary">
                Plan a projection
              </ButtonLink>
              <ButtonLink href={`/instruments/${instrument.id}/edit`}>Edit</ButtonLink>
            </>
          )
        }
      />
      <div className="grid gap-8 lg:grid-cols-[2fr_1fr]">
        <div className="flex flex-col gap-5">
          {saved ? <FormMessage tone="success">Instrument saved.</FormMessage> : null}
          {archived ? (
            <FormMessage tone="info">
              Archived on {instrument.archivedAt!.toISOString().slice(0, 10)}. It no longer appears when you
              log a count, but it stays on the {n} {n === 1 ? "observation" : "observations"} made with it.
            </FormMessage>
          ) : null}
          <section className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm">
            <h2 className="text-sm font-semibold tracking-wide text-ink-600 uppercase">Set-up</h2>
            {dimensions.length > 0 ? (
              <dl className="mt-3 grid grid-cols-[auto_1fr] gap-x-6 gap-y-1 text-sm">
                {dimensions.map((d) => (
                  <div key={d.label} className="contents">
                    <dt className="text-ink-500">{d.label}</dt>
                    <dd className="text-ink-900">{d.value}</dd>
                  </div>
                ))}
              </dl>
            ) : (
              <p className="mt-2 text-sm text-caution-700">
                Its sizes have not been entered yet. Edit the instrument to add them; the planner needs them.
              </p>
            )}
            {instrument.notes ? (
              <p className="mt-3 text-sm whitespace-pre-line text-ink-700">{instrument.notes}</p>
            ) : null}
          </section>
          <section className="grid gap-3 sm:grid-cols-3">
            <Stat
              label="Disk today"
              value={diskMm !== null ? formatLength({ valueMm: diskMm, unitSystem }) : "—"}
            />
            <Stat label="Observations" value={String(n)} />
            <Stat
              label="k for this instrument"
              value={instrument.k ? instrument.k.k.toFixed(3) : "Not yet computed"}
              hint={
                instrument.k
                  ? `${instrument.k.periodStart} to ${instrument.k.periodEnd}${instrument.k.sigma !== null ? `, ± ${instrument.k.sigma.toFixed(3)}` : ""}`
                  : "Your coordinator computes it from your counts."
              }
            />
          </section>
          <InstrumentActions instrumentId={instrument.id} archived={archived} observationCount={n} />
        </div>
        <SafetyNotice emphasis={describeSafetyEmphasis({ kind: instrument.kind })} />
      </div>
    </>
  );
}

function Stat({ label, value, hint }: { label: string; value: string; hint?: string }) {
  return (
    <div className="rounded-lg border border-ink-100 bg-white p-4">
      <p className="text-xs text-ink-500">{label}</p>
      <p className="text-lg font-semibold text-ink-950">{value}</p>
      {hint ? <p className="text-xs text-ink-500">{hint}</p> : null}
    </div>
  );
}
