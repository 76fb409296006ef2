import Link from "next/link";

import { getEnv } from "@/lib/env";
import { DEMO_CLASSROOM, buildDemoScenario } from "@/lib/demo/scenario";

import { ClassSignInForm } from "./class-sign-in-form";

/** The students' way in, on the sign-in page: no e-mail address needed. */
export function StudentSignInSection() {
  const demoStudent = getEnv().HELIOTALLY_DEMO ? demoStudentCard() : null;
  return (
    <section
      aria-labelledby="students-sign-in"
      className="flex flex-col gap-4 rounded-lg border border-ink-100 bg-white p-6 shadow-sm"
    >
      <div>
        <h2 id="students-sign-in" className="text-lg font-semibold text-ink-950">
          Students: sign in with your class code
        </h2>
        <p className="mt-1 text-sm text-ink-600">
          Use the classroom code, your name and the PIN from the card your teacher gave you.
        </p>
      </div>
      <ClassSignInForm />
      <p className="text-sm text-ink-600">
        No card yet?{" "}
        <Link href="/join" className="font-semibold text-corona-700 underline">
          Join a class with its code
        </Link>{" "}
        if your teacher has opened joining. Taking turns on one computer?{" "}
        <Link href="/sign-in/class-device" className="font-semibold text-corona-700 underline">
          Use shared class device mode
        </Link>
        .
      </p>
      {demoStudent ? (
        <p className="rounded-md border border-dashed border-ink-300 px-3 py-2 text-xs text-ink-600">
          Demo student (invented): code{" "}
          <code className="rounded bg-ink-100 px-1">{DEMO_CLASSROOM.joinCode}</code>, name{" "}
          <code className="rounded bg-ink-100 px-1">{demoStudent.displayName}</code>, PIN{" "}
          <code className="rounded bg-ink-100 px-1">{demoStudent.pin}</code>.
        </p>
      ) : null}
    </section>
  );
}

let cached: { displayName: string; pin: string } | null | undefined;

function demoStudentCard() {
  // The scenario is deterministic; building it once per server process is enough.
  if (cached === undefined) {
    const first = buildDemoScenario().students[0];
    cached = first ? { displayName: first.displayName, pin: first.pin } : null;
  }
  return cached;
}
