import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";

import { PageHeader } from "@/components/layout/app-shell";
import { getInstrumentWithUsage } from "@/db/queries/instruments";
import { requireObserver } from "@/lib/auth/session";
import { toInstrumentFormValues } from "@/lib/instruments/profile";

import { PlannerWorkbench } from "../../../planner/_components/planner-workbench";

export const metadata: Metadata = { title: "Plan a projection" };

export default async function InstrumentPlanPage({ params }: { params: Promise<{ id: string }> }) {
  const { observer } = await requireObserver();
  const { id } = await params;
  const instrument = await getInstrumentWithUsage({ observerId: observer.id, instrumentId: id });
  if (!instrument) notFound();
  return (
    <>
      <PageHeader
        title={`Plan: ${instrument.name}`}
        lead={
          <>
            The Projection planner for this instrument. Change any value to see its effect; nothing is saved.{" "}
            <Link href={`/instruments/${instrument.id}`} className="text-corona-700 underline">
              Back to the instrument
            </Link>
          </>
        }
      />
      <PlannerWorkbench
        source={{ kind: "instrument", id: instrument.id, name: instrument.name }}
        initialValues={toInstrumentFormValues({ record: instrument, unitSystem: observer.unitSystem })}
        initialUnitSystem={observer.unitSystem}
        todayDate={new Date().toISOString().slice(0, 10)}
      />
    </>
  );
}
