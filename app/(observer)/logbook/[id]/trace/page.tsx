import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";

import { PageHeader } from "@/components/layout/app-shell";
import { SafetyNotice } from "@/components/safety-notice";
import { TracerWithPhoto } from "@/components/photo/tracer-with-photo";
import { listPhotosOfObservation } from "@/db/queries/photos";
import { findOwnTracing } from "@/db/queries/tracings";
import { requireObserver } from "@/lib/auth/session";
import { findSessionCountLock } from "@/lib/classrooms/session-edit";
import { formatUt } from "@/lib/format/time";

export const metadata: Metadata = { title: "Disk tracer" };

/** Creates or opens the tracing of one of the caller's own observations. */
export default async function TracePage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { observer } = await requireObserver();
  const own = await findOwnTracing({ observerId: observer.id, observationId: id });
  if (!own) notFound();
  const { observation, tracing } = own;
  const sessionLock = await findSessionCountLock({ observerId: observer.id, observationId: observation.id });
  if (sessionLock) {
    return (
      <>
        <PageHeader title={`Disk tracer · ${observation.utDate}`} />
        <p className="rounded-lg border border-ink-100 bg-white p-6 text-sm text-ink-700">
          {sessionLock}{" "}
          <Link href={`/logbook/${observation.id}`} className="text-corona-700 underline">
            Back to the count
          </Link>
        </p>
      </>
    );
  }
  // The observation's newest photo opens as the background of a tracing that has none yet.
  const [photo] = await listPhotosOfObservation({ observationId: observation.id });
  return (
    <>
      <PageHeader
        title={`Disk tracer · ${observation.utDate}`}
        lead={
          <>
            Trace the disk as you projected it at {formatUt(observation.observedAt)} with{" "}
            {observation.instrumentName}: fit the disk, orient it, place the spots, group and classify them,
            then save. The counts go into{" "}
            <Link href={`/logbook/${observation.id}`} className="text-corona-700 underline">
              this observation
            </Link>
            .
          </>
        }
      />
      <div className="mb-4">
        <SafetyNotice compact />
      </div>
      {/* The tracer itself, started from marks accepted on the photo when the observer comes from the photo assist. */}
      <TracerWithPhoto
        observationId={observation.id}
        observedAtIso={observation.observedAt.toISOString()}
        utDate={observation.utDate}
        observationCounts={{
          groups: observation.groups,
          spots: observation.spots,
          northGroups: observation.northGroups,
          northSpots: observation.northSpots,
          southGroups: observation.southGroups,
          southSpots: observation.southSpots,
        }}
        initialDocument={tracing?.vector ?? null}
        initialRevision={tracing?.revision ?? 0}
        backgroundImageUrl={photo ? `/api/v1/photos/${photo.id}/image?variant=view` : null}
      />
    </>
  );
}
