import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";

import { SessionStateBadge } from "@/components/classrooms/session-state-badge";
import { PageHeader } from "@/components/layout/app-shell";
import { SafetyNotice } from "@/components/safety-notice";
import { ButtonLink } from "@/components/ui/button";
import { StaticTable } from "@/components/ui/static-table";
import {
  getClassroomOfEducator,
  listClassroomsOfEducator,
  listMembersOfClassroom,
  listSessionsOfClassroom,
} from "@/db/queries/classrooms";
import { requirePageRole } from "@/lib/auth/page-guard";
import { DEFAULT_CLASS_INSTRUMENT } from "@/lib/classrooms/manage";
import { describeSessionState, formatSessionWindow } from "@/lib/classrooms/session-state";
import { INSTRUMENT_KIND_LABELS } from "@/lib/instruments/fields";

import { ArchiveForm } from "./_components/archive-form";
import { EnrolForm } from "./_components/enrol-form";
import { SessionForm } from "./_components/session-form";
import { SettingsForm } from "./_components/settings-form";
import { StudentActions } from "./_components/student-actions";

export const metadata: Metadata = { title: "Classroom" };
export const dynamic = "force-dynamic";

const section = "rounded-lg border border-ink-100 bg-white p-5 shadow-sm";

export default async function ClassroomPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageRole(["educator"]);
  const classroom = await getClassroomOfEducator({ educatorUserId: user.id, classroomId: id });
  // Another educator's classroom is answered exactly like a missing one.
  if (!classroom) notFound();
  const [members, sessions, rooms] = await Promise.all([
    listMembersOfClassroom({ classroomId: id }),
    listSessionsOfClassroom({ classroomId: id }),
    listClassroomsOfEducator({ educatorUserId: user.id }),
  ]);
  const archived = Boolean(classroom.archivedAt);
  const now = new Date();
  const otherClassrooms = rooms
    .filter((r) => r.id !== id && !r.archivedAt)
    .map((r) => ({ id: r.id, name: r.name }));
  const latest = sessions[0];
  const today = now.toISOString().slice(0, 10);
  const opens = new Date(Math.floor(now.getTime() / 900_000) * 900_000);
  const closes = new Date(Math.min(opens.getTime() + 3_600_000, Date.parse(`${today}T23:59:00Z`)));

  return (
    <>
      <PageHeader
        title={classroom.name}
        lead={
          <>
            {classroom.school} · term {classroom.termStart} to {classroom.termEnd} · classroom code{" "}
            <code className="rounded bg-ink-100 px-1 font-mono text-ink-900" data-testid="classroom-code">
              {classroom.joinCode}
            </code>
          </>
        }
        actions={
          <>
            <ButtonLink href={`/classrooms/${id}/term`} variant="secondary">
              Term comparison
            </ButtonLink>
            <ButtonLink href={`/classrooms/${id}/cards`} variant="secondary">
              Sign-in cards
            </ButtonLink>
          </>
        }
      />
      {archived ? (
        <p
          role="status"
          className="mb-6 rounded-md border border-ink-200 bg-ink-50 px-4 py-3 text-sm text-ink-700"
        >
          Archived on {classroom.archivedAt?.toISOString().slice(0, 10)}. Everything here stays readable;
          students can no longer sign in, and nothing can be added.
        </p>
      ) : null}
      <div className="grid gap-6 lg:grid-cols-[3fr_2fr]">
        <div className="flex flex-col gap-6">
          <section className={section} aria-labelledby="sessions-heading">
            <h2 id="sessions-heading" className="text-lg font-semibold text-ink-950">
              Observing sessions
            </h2>
            {sessions.length === 0 ? (
              <p className="mt-2 text-sm text-ink-600">
                No sessions yet. Schedule the first one below: pick the day, the window in which students log
                their counts, and the instrument you will set up.
              </p>
            ) : (
              <ul className="mt-3 divide-y divide-ink-100">
                {sessions.map((s) => {
                  const state = describeSessionState({ opensAt: s.opensAt, closesAt: s.closesAt, now });
                  return (
                    <li key={s.id} className="flex flex-wrap items-center justify-between gap-2 py-2 text-sm">
                      <div>
                        <Link
                          href={`/classrooms/${id}/sessions/${s.id}`}
                          className="font-semibold text-ink-900 hover:underline"
                        >
                          {s.title}
                        </Link>
                        <p className="text-ink-600">
                          {formatSessionWindow(s)} · {s.instrumentName} (
                          {INSTRUMENT_KIND_LABELS[s.instrumentKind].toLowerCase()})
                        </p>
                      </div>
                      <div className="flex items-center gap-3">
                        <span className="text-ink-600">
                          {s.counts} of {members.length} counted
                        </span>
                        <SessionStateBadge state={state} />
                      </div>
                    </li>
                  );
                })}
              </ul>
            )}
            {!archived ? (
              <div className="mt-5 border-t border-ink-100 pt-4">
                <h3 className="mb-3 font-semibold text-ink-900">Schedule a session</h3>
                <SessionForm
                  classroomId={id}
                  defaults={{
                    day: today,
                    opensAt: opens.toISOString().slice(11, 16),
                    closesAt: closes.toISOString().slice(11, 16),
                    instrumentName: latest?.instrumentName ?? DEFAULT_CLASS_INSTRUMENT.name,
                    instrumentKind: latest?.instrumentKind ?? DEFAULT_CLASS_INSTRUMENT.kind,
                  }}
                />
              </div>
            ) : null}
          </section>

          <section className={section} aria-labelledby="students-heading">
            <h2 id="students-heading" className="text-lg font-semibold text-ink-950">
              Students ({members.length} of {classroom.capacity})
            </h2>
            <StaticTable
              caption="Students"
              look="plain"
              className="mt-3"
              rows={members}
              rowKey={(m) => m.userId}
              empty="No students yet. Enrol them below (you will get a printable sign-in card for each), or open joining in the settings."
              columns={[
                {
                  key: "name",
                  header: "Display name",
                  className: "font-medium text-ink-900",
                  cell: (m) => m.displayName,
                },
                { key: "counts", header: "Session counts", cell: (m) => m.sessionCounts },
                {
                  key: "joined",
                  header: "Enrolled",
                  className: "text-ink-600",
                  cell: (m) => m.joinedAt.toISOString().slice(0, 10),
                },
                {
                  key: "actions",
                  header: <span className="sr-only">Actions</span>,
                  cell: (m) => (
                    <StudentActions
                      classroomId={id}
                      student={{ userId: m.userId, displayName: m.displayName }}
                      otherClassrooms={otherClassrooms}
                      archived={archived}
                    />
                  ),
                },
              ]}
            />
            {!archived ? (
              <div className="mt-5 border-t border-ink-100 pt-4">
                <EnrolForm classroomId={id} free={Math.max(0, classroom.capacity - members.length)} />
              </div>
            ) : null}
          </section>
        </div>

        <div className="flex flex-col gap-6">
          <SafetyNotice classroom />
          {!archived ? (
            <section className={section} aria-labelledby="settings-heading">
              <h2 id="settings-heading" className="mb-3 text-lg font-semibold text-ink-950">
                Joining and comparing
              </h2>
              <SettingsForm classroom={classroom} />
            </section>
          ) : null}
          {!archived ? (
            <section className={section} aria-labelledby="archive-heading">
              <h2 id="archive-heading" className="mb-3 text-lg font-semibold text-ink-950">
                End of term
              </h2>
              <ArchiveForm classroomId={id} />
            </section>
          ) : null}
        </div>
      </div>
    </>
  );
}
