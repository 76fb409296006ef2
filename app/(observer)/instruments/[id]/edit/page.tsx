import type { Metadata } from "next";
import { notFound } from "next/navigation";

import { PageHeader } from "@/components/layout/app-shell";
import { getInstrumentWithUsage } from "@/db/queries/instruments";
import { requireObserver } from "@/lib/auth/session";
import { toInstrumentFormValues } from "@/lib/instruments/profile";

import { InstrumentForm } from "../../_components/instrument-form";

export const metadata: Metadata = { title: "Edit instrument" };

export default async function EditInstrumentPage({ params }: { params: Promise<{ id: string }> }) {
  const { observer } = await requireObserver();
  const { id } = await params;
  const instrument = await getInstrumentWithUsage({ observerId: observer.id, instrumentId: id });
  if (!instrument) notFound();
  const n = instrument.observationCount;
  return (
    <>
      <PageHeader
        title={`Edit ${instrument.name}`}
        lead="Changes apply to this instrument from now on; your counts keep pointing at it."
      />
      <InstrumentForm
        instrumentId={instrument.id}
        initialUnitSystem={observer.unitSystem}
        initialValues={{
          surface: "second",
          ...toInstrumentFormValues({ record: instrument, unitSystem: observer.unitSystem }),
        }}
        kindLockedReason={
          n > 0
            ? `${n} ${n === 1 ? "observation was" : "observations were"} made with this instrument, so its kind stays as it is. For a different kind of set-up, add a new instrument.`
            : undefined
        }
        todayIso={new Date().toISOString()}
      />
    </>
  );
}
