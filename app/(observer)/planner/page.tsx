import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";

import { PageHeader } from "@/components/layout/app-shell";
import { listInstrumentsWithUsage } from "@/db/queries/instruments";
import { requireObserver } from "@/lib/auth/session";
import { fillWithExample, INSTRUMENT_KIND_LABELS, INSTRUMENT_KINDS } from "@/lib/instruments/fields";
import { toInstrumentFormValues } from "@/lib/instruments/profile";
import type { InstrumentKind } from "@/lib/optics/types";

import { PlannerWorkbench } from "./_components/planner-workbench";

export const metadata: Metadata = { title: "Projection planner" };

export default async function PlannerPage({
  searchParams,
}: {
  searchParams: Promise<{ instrument?: string; try?: string }>;
}) {
  const { observer } = await requireObserver();
  const query = await searchParams;
  const instruments = (await listInstrumentsWithUsage({ observerId: observer.id })).filter(
    (i) => i.archivedAt === null,
  );
  const trialKind: InstrumentKind | null =
    query.try === undefined
      ? null
      : (INSTRUMENT_KINDS as readonly string[]).includes(query.try)
        ? (query.try as InstrumentKind)
        : "mirror";
  let selected = null;
  if (query.instrument) {
    selected = instruments.find((i) => i.id === query.instrument) ?? null;
    // Someone else's (or a retired) instrument is simply not here.
    if (!selected) notFound();
  } else if (trialKind === null) {
    selected = instruments[0] ?? null;
  }
  const unitSystem = observer.unitSystem;
  const today = new Date().toISOString().slice(0, 10);

  return (
    <>
      <PageHeader
        title="Projection planner"
        lead="How large and how sharp the disk will be, which spots it can show, and what to change. Choose one of your instruments, or try a set-up without saving it."
      />
      <nav aria-label="Plan for" className="mb-6 flex flex-wrap gap-2">
        {instruments.map((instrument) => (
          <PlanTab
            key={instrument.id}
            href={`/planner?instrument=${instrument.id}`}
            active={selected?.id === instrument.id}
          >
            {instrument.name}
          </PlanTab>
        ))}
        <PlanTab href="/planner?try=mirror" active={selected === null}>
          Try a set-up
        </PlanTab>
      </nav>
      {selected ? (
        <PlannerWorkbench
          key={selected.id}
          source={{ kind: "instrument", id: selected.id, name: selected.name }}
          initialValues={toInstrumentFormValues({ record: selected, unitSystem })}
          initialUnitSystem={unitSystem}
          todayDate={today}
        />
      ) : (
        <>
          {instruments.length === 0 ? (
            <p className="mb-4 text-sm text-ink-600">
              You have no instruments yet. Try a set-up here, then{" "}
              <Link href="/instruments/new" className="text-corona-700 underline">
                add it as an instrument
              </Link>{" "}
              so your counts can name it.
            </p>
          ) : null}
          <PlannerWorkbench
            key={`trial-${trialKind}`}
            source={{ kind: "trial" }}
            initialValues={fillWithExample({ values: {}, kind: trialKind ?? "mirror", unitSystem })}
            initialUnitSystem={unitSystem}
            todayDate={today}
          />
          <p className="mt-4 text-xs text-ink-500">
            Kinds you can try:{" "}
            {INSTRUMENT_KINDS.map((k) => INSTRUMENT_KIND_LABELS[k].toLowerCase()).join(", ")}.
          </p>
        </>
      )}
    </>
  );
}

function PlanTab({ href, active, children }: { href: string; active: boolean; children: React.ReactNode }) {
  return (
    <Link
      href={href}
      aria-current={active ? "page" : undefined}
      className={`rounded-full border px-3 py-1 text-sm ${
        active
          ? "border-corona-500 bg-corona-100 font-semibold text-ink-950"
          : "border-ink-200 bg-white text-ink-700 hover:bg-ink-50"
      }`}
    >
      {children}
    </Link>
  );
}
