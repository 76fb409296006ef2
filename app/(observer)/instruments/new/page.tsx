import type { Metadata } from "next";

import { PageHeader } from "@/components/layout/app-shell";
import { requireObserver } from "@/lib/auth/session";

import { InstrumentForm } from "../_components/instrument-form";

export const metadata: Metadata = { title: "Add an instrument" };

export default async function NewInstrumentPage() {
  const { observer } = await requireObserver();
  return (
    <>
      <PageHeader
        title="Add an instrument"
        lead="Describe the set-up you count with. The sizes let the Projection planner tell you how large and sharp the disk will be."
      />
      <InstrumentForm
        initialUnitSystem={observer.unitSystem}
        initialValues={{ kind: "pinhole", name: "", notes: "", surface: "second" }}
        todayIso={new Date().toISOString()}
      />
    </>
  );
}
