import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";

import { PageHeader } from "@/components/layout/app-shell";
import { TracingSummary } from "@/components/tracer/tracing-summary";
import { getObservationOfObserver } from "@/db/queries/observations";
import { getTracingSummary } from "@/db/queries/tracings";
import { requireObserver } from "@/lib/auth/session";
import { findSessionCountLock } from "@/lib/classrooms/session-edit";
import { formatLocal, formatRelativeNumber, formatUt } from "@/lib/format/time";
import { SEEING_LABELS } from "@/lib/validation/observation";

import { StatusBadge } from "@/components/status-badge";

import { PhotoSection } from "./_components/photo-section";
import { ReviewState } from "./_components/review-state";

export const metadata: Metadata = { title: "Observation" };

export default async function ObservationPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { user, observer } = await requireObserver();
  const obs = await getObservationOfObserver({ observerId: observer.id, observationId: id });
  if (!obs) notFound();
  const [tracing, sessionLock] = await Promise.all([
    getTracingSummary({ observationId: obs.id }),
    findSessionCountLock({ observerId: observer.id, observationId: obs.id }),
  ]);
  const split = obs.northGroups !== null;
  const rows: Array<[string, React.ReactNode]> = [
    ["Observed", `${formatUt(obs.observedAt)} · ${formatLocal(obs.observedAt, observer.timeZone)} local`],
    ["Instrument", obs.instrumentName],
    ["Seeing", SEEING_LABELS[obs.seeing]],
    ["Groups (g)", obs.groups],
    ["Spots (s)", obs.spots],
    [
      "Hemispheres",
      split
        ? `North ${obs.northGroups} g / ${obs.northSpots} s · South ${obs.southGroups} g / ${obs.southSpots} s`
        : "Not split",
    ],
    ["k", obs.kComputed ? obs.k.toFixed(3) : "1.0 (not computed yet)"],
    ["Status", <StatusBadge key="status" status={obs.status} />],
    ["Notes", obs.notes ?? "—"],
  ];
  return (
    <>
      <PageHeader
        title={`Count of ${obs.utDate}`}
        lead={
          <Link href="/logbook" className="text-corona-700 underline">
            Back to the Logbook
          </Link>
        }
      />
      <div className="grid gap-6 md:grid-cols-[1fr_2fr]">
        <div className="rounded-lg bg-umbra p-6 text-corona-100">
          <p className="text-xs tracking-widest uppercase">Relative number</p>
          <p className="mt-2 text-5xl font-semibold text-corona-300">
            {formatRelativeNumber(obs.relativeNumber)}
          </p>
          <p className="mt-2 text-sm">
            {obs.k.toFixed(2)} × (10 × {obs.groups} + {obs.spots})
          </p>
        </div>
        <dl className="grid grid-cols-[10rem_1fr] gap-x-4 gap-y-2 rounded-lg border border-ink-100 bg-white p-6 text-sm">
          {rows.map(([label, value]) => (
            <div key={label} className="contents">
              <dt className="text-ink-500">{label}</dt>
              <dd className="text-ink-900">{value}</dd>
            </div>
          ))}
        </dl>
      </div>
      {sessionLock ? (
        <p className="mt-6 rounded-lg border border-ink-100 bg-paper p-4 text-sm text-ink-700" role="note">
          {sessionLock}
        </p>
      ) : null}
      <ReviewState observation={obs} observerId={observer.id} userId={user.id} />
      <TracingSummary observationId={obs.id} tracing={tracing} counts={obs} editable={!sessionLock} />
      <PhotoSection observationId={obs.id} />
    </>
  );
}
