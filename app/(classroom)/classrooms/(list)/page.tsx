import type { Metadata } from "next";
import Link from "next/link";

import { PageHeader } from "@/components/layout/app-shell";
import { SafetyNotice } from "@/components/safety-notice";
import { ButtonLink } from "@/components/ui/button";
import { listClassroomsOfEducator } from "@/db/queries/classrooms";
import { requirePageRole } from "@/lib/auth/page-guard";

import { CreateClassroomForm } from "./_components/create-classroom-form";

export const metadata: Metadata = { title: "Classrooms" };
export const dynamic = "force-dynamic";

export default async function ClassroomsPage() {
  const user = await requirePageRole(["educator"]);
  const rooms = await listClassroomsOfEducator({ educatorUserId: user.id });
  const active = rooms.filter((r) => !r.archivedAt);
  const archived = rooms.filter((r) => r.archivedAt);
  return (
    <>
      <PageHeader
        title="Classrooms"
        lead="Your classes, their students and their observing sessions. Only you see your classrooms."
        actions={
          <ButtonLink href="/classrooms/compare" variant="secondary">
            Compare classes
          </ButtonLink>
        }
      />
      <div className="grid gap-6 lg:grid-cols-[3fr_2fr]">
        <div className="flex flex-col gap-6">
          {active.length === 0 ? (
            <p className="rounded-lg border border-ink-100 bg-white p-6 text-sm text-ink-600">
              You have no classrooms yet. Create one with the form: give it a name, the school and the term
              dates, then enrol your students and schedule the first observing session.
            </p>
          ) : (
            <ul className="grid gap-4" aria-label="Your classrooms">
              {active.map((room) => (
                <RoomCard key={room.id} room={room} />
              ))}
            </ul>
          )}
          {archived.length > 0 ? (
            <section>
              <h2 className="mb-2 text-sm font-semibold tracking-wide text-ink-500 uppercase">
                Archived (end of term, read only)
              </h2>
              <ul className="grid gap-3" aria-label="Archived classrooms">
                {archived.map((room) => (
                  <RoomCard key={room.id} room={room} />
                ))}
              </ul>
            </section>
          ) : null}
        </div>
        <div className="flex flex-col gap-4">
          <CreateClassroomForm today={new Date().toISOString().slice(0, 10)} />
          <SafetyNotice classroom compact />
        </div>
      </div>
    </>
  );
}

function RoomCard({ room }: { room: Awaited<ReturnType<typeof listClassroomsOfEducator>>[number] }) {
  return (
    <li
      className={`rounded-lg border border-ink-100 p-5 shadow-sm ${room.archivedAt ? "bg-ink-50" : "bg-white"}`}
    >
      <h3 className="text-lg font-semibold text-ink-950">
        <Link href={`/classrooms/${room.id}`} className="hover:underline">
          {room.name}
        </Link>
      </h3>
      <p className="text-sm text-ink-600">
        {room.school} · term {room.termStart} to {room.termEnd}
      </p>
      <p className="mt-2 text-sm text-ink-700">
        {room.students} of {room.capacity} students · classroom code{" "}
        <code className="rounded bg-ink-100 px-1 font-mono">{room.joinCode}</code>
        {room.joinOpen ? " · joining open" : ""}
        {room.compareWithOthers ? " · compared with other classes" : ""}
        {room.archivedAt ? ` · archived ${room.archivedAt.toISOString().slice(0, 10)}` : ""}
      </p>
    </li>
  );
}
