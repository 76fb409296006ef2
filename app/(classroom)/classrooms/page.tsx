import type { Metadata } from "next";

import { PageHeader } from "@/components/layout/app-shell";
import { SafetyNotice } from "@/components/safety-notice";
import { listClassroomsOfEducator } from "@/db/queries/classrooms";
import { requireRole } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Classrooms" };
export const dynamic = "force-dynamic";

export default async function ClassroomsPage() {
  const user = await requireRole(["educator"]);
  const rooms = await listClassroomsOfEducator({ educatorUserId: user.id });
  return (
    <>
      <PageHeader title="Classrooms" lead="Your classes, their students and their observing sessions." />
      <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
        {rooms.length === 0 ? (
          <p className="rounded-lg border border-ink-100 bg-white p-6 text-sm text-ink-600">
            You have no classrooms yet.
          </p>
        ) : (
          <ul className="grid gap-4">
            {rooms.map((room) => (
              <li key={room.id} className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm">
                <h2 className="text-lg font-semibold text-ink-950">{room.name}</h2>
                <p className="text-sm text-ink-600">
                  {room.school} · term {room.termStart} to {room.termEnd}
                </p>
                <p className="mt-2 text-sm">
                  {room.students} students · classroom code <code className="rounded bg-ink-100 px-1">{room.joinCode}</code>
                  {room.archivedAt ? " · archived" : ""}
                </p>
              </li>
            ))}
          </ul>
        )}
        <SafetyNotice classroom />
      </div>
    </>
  );
}
