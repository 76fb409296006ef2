import type { Metadata } from "next";
import { headers } from "next/headers";
import Link from "next/link";
import { notFound } from "next/navigation";

import { getClassroomOfEducator, listMembersOfClassroom } from "@/db/queries/classrooms";
import { requirePageRole } from "@/lib/auth/page-guard";

import { SignInCards } from "./_components/sign-in-cards";

export const metadata: Metadata = { title: "Sign-in cards" };
export const dynamic = "force-dynamic";

export default async function CardsPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageRole(["educator"]);
  const classroom = await getClassroomOfEducator({ educatorUserId: user.id, classroomId: id });
  if (!classroom) notFound();
  const [members, h] = await Promise.all([listMembersOfClassroom({ classroomId: id }), headers()]);
  const host = h.get("x-forwarded-host") ?? h.get("host") ?? "localhost:3000";
  const protocol =
    h.get("x-forwarded-proto") ??
    (host.startsWith("localhost") || host.startsWith("127.") ? "http" : "https");
  return (
    <>
      <div className="no-print mb-6 flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight text-ink-950">Sign-in cards</h1>
          <p className="mt-1 max-w-2xl text-sm text-ink-600">
            {classroom.name} · {classroom.school}.{" "}
            <Link href={`/classrooms/${id}`} className="text-corona-700 underline">
              Back to the classroom
            </Link>
          </p>
        </div>
      </div>
      <SignInCards
        classroomId={id}
        classroom={{ name: classroom.name, school: classroom.school, joinCode: classroom.joinCode }}
        signInUrl={`${protocol}://${host}/sign-in`}
        students={members.map((m) => ({ userId: m.userId, displayName: m.displayName }))}
      />
    </>
  );
}
