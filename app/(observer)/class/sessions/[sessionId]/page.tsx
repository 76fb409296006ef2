import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";

import { SessionComparisonView } from "@/components/classrooms/session-comparison";
import { SessionStateBadge } from "@/components/classrooms/session-state-badge";
import { PageHeader } from "@/components/layout/app-shell";
import { SafetyNotice } from "@/components/safety-notice";
import { getCurrentKs, getObserverByUserId, listInstrumentsByObserver } from "@/db/queries/observers";
import { requirePageRole } from "@/lib/auth/page-guard";
import { formatSessionWindow } from "@/lib/classrooms/session-state";
import { loadSessionComparison } from "@/lib/classrooms/views";
import { computeRawCount } from "@/lib/counts/relative-number";
import { describeSafetyEmphasis, INSTRUMENT_KIND_LABELS } from "@/lib/instruments/fields";

import { ObservationForm } from "@/app/(observer)/logbook/new/_components/observation-form";
import { NextStudentButton } from "../../_components/next-student-button";

export const metadata: Metadata = { title: "Class session" };
export const dynamic = "force-dynamic";

const card = "rounded-lg border border-ink-100 bg-white p-5 shadow-sm";

export default async function StudentSessionPage({ params }: { params: Promise<{ sessionId: string }> }) {
  const { sessionId } = await params;
  const user = await requirePageRole(["student"]);
  const observer = await getObserverByUserId({ userId: user.id });
  if (!observer) notFound();
  // Another classroom's session is answered exactly like a missing one.
  const view = await loadSessionComparison({
    sessionId,
    viewer: { role: "student", userId: user.id, observerId: observer.id },
  });
  if (!view) notFound();
  const { session, own, comparison } = view;
  const canLog = view.state === "open" && !own && !view.classroom.archivedAt;

  let form = null;
  if (canLog) {
    const [instruments, kFor] = await Promise.all([
      listInstrumentsByObserver({ observerId: observer.id }),
      getCurrentKs({ observerId: observer.id }),
    ]);
    // The count is filed under the instrument set up for the session (the
    // server decides); the form shows that instrument's name.
    const match =
      instruments.find((i) => i.name === session.instrumentName && i.kind === session.instrumentKind) ??
      instruments[0];
    form = (
      <ObservationForm
        instruments={[
          { id: match?.id ?? "session-instrument", name: session.instrumentName, k: kFor(match?.id ?? "").k },
        ]}
        timeZone={observer.timeZone}
        nowIso={new Date().toISOString()}
        endpoint={`/api/v1/classroom-sessions/${session.id}/observations`}
        savedHref={`/class/sessions/${session.id}`}
      />
    );
  }

  return (
    <>
      <PageHeader
        title={session.title}
        lead={
          <>
            <Link href="/class" className="text-corona-700 underline">
              {view.classroom.name}
            </Link>{" "}
            · {formatSessionWindow(session)} · {session.instrumentName} (
            {INSTRUMENT_KIND_LABELS[session.instrumentKind].toLowerCase()})
          </>
        }
        actions={<SessionStateBadge state={view.state} />}
      />
      <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
        <div className="flex flex-col gap-6">
          {form ? (
            <section aria-labelledby="log-heading">
              <h2 id="log-heading" className="mb-3 text-lg font-semibold text-ink-950">
                Log my count
              </h2>
              {form}
            </section>
          ) : null}
          {own ? (
            <section
              aria-labelledby="own-heading"
              className="flex flex-wrap items-center justify-between gap-4 rounded-lg bg-umbra p-5 text-corona-100"
            >
              <div>
                <h2 id="own-heading" className="text-xs tracking-widest uppercase">
                  My count
                </h2>
                <p className="mt-1 text-3xl font-semibold text-corona-300" data-testid="own-count">
                  {own.groups} groups, {own.spots} spots · 10g + s = {computeRawCount(own)}
                </p>
              </div>
              <NextStudentButton />
            </section>
          ) : null}
          {!own && view.state === "upcoming" ? (
            <p className={`${card} text-sm text-ink-700`}>
              This session opens {formatSessionWindow(session)}. Come back then to log your count.
            </p>
          ) : null}
          {!own && view.state === "closed" ? (
            <p className={`${card} text-sm text-ink-700`}>
              This session has closed, and you did not log a count for it.
            </p>
          ) : null}
          <section aria-labelledby="class-heading" className={card}>
            <h2 id="class-heading" className="mb-4 text-lg font-semibold text-ink-950">
              The class side by side
            </h2>
            {comparison ? (
              <SessionComparisonView comparison={comparison} network={view.network} ownStudentId={user.id} />
            ) : (
              <p className="text-sm text-ink-600">
                {view.countsLogged} of the class {view.countsLogged === 1 ? "has" : "have"} counted so far.
                Everyone&apos;s counts appear here once you have logged yours: count on your own first!
              </p>
            )}
          </section>
        </div>
        <div className="self-start">
          <SafetyNotice classroom emphasis={describeSafetyEmphasis({ kind: session.instrumentKind })} />
        </div>
      </div>
    </>
  );
}
