"use client";

import { useEffect, useState } from "react";

import { Button } from "@/components/ui/button";
import { SunMark } from "@/components/ui/sun-mark";

import { forgetIssuedPins, readIssuedPins } from "../../_components/card-store";

type Student = { userId: string; displayName: string };

/**
 * One card per student with the classroom code and, for PINs issued on this
 * device in the last hours, the PIN itself. Other PINs are not known to
 * anyone (only their hashes are stored): reset one to print a new card.
 */
export function SignInCards({
  classroomId,
  classroom,
  signInUrl,
  students,
}: {
  classroomId: string;
  classroom: { name: string; school: string; joinCode: string };
  signInUrl: string;
  students: Student[];
}) {
  const [pins, setPins] = useState<Record<string, string> | null>(null);
  const [onlyFresh, setOnlyFresh] = useState(true);

  useEffect(() => {
    // sessionStorage exists only in the browser, after hydration.
    // eslint-disable-next-line react-hooks/set-state-in-effect
    setPins(readIssuedPins(classroomId));
  }, [classroomId]);

  if (pins === null) return <p className="animate-pulse text-sm text-ink-500">Preparing the cards…</p>;
  const fresh = students.filter((s) => pins[s.userId]);
  const shown = onlyFresh && fresh.length > 0 ? fresh : students;

  return (
    <div className="flex flex-col gap-6">
      <div className="no-print flex flex-col gap-3 rounded-lg border border-ink-100 bg-white p-4 text-sm text-ink-700 shadow-sm">
        {fresh.length > 0 ? (
          <p>
            <strong>{fresh.length}</strong> new PIN{fresh.length === 1 ? "" : "s"} on these cards. Print them
            now: once you close this tab or forget them below, the PINs cannot be shown again (only a reset
            makes a new one).
          </p>
        ) : (
          <p>
            No new PINs on this device. The cards below show the classroom code and names; reset a
            student&apos;s PIN on the classroom page to print a card with a PIN.
          </p>
        )}
        <div className="flex flex-wrap gap-2">
          <Button type="button" onClick={() => window.print()}>
            Print cards
          </Button>
          {fresh.length > 0 && fresh.length < students.length ? (
            <Button type="button" variant="secondary" onClick={() => setOnlyFresh((v) => !v)}>
              {onlyFresh ? "Show every student" : "Show only new PINs"}
            </Button>
          ) : null}
          {fresh.length > 0 ? (
            <Button
              type="button"
              variant="quiet"
              onClick={() => {
                forgetIssuedPins(classroomId);
                setPins({});
              }}
            >
              Forget these PINs on this computer
            </Button>
          ) : null}
        </div>
      </div>
      {students.length === 0 ? (
        <p className="text-sm text-ink-600">No students yet: enrol them on the classroom page first.</p>
      ) : (
        <ul className="grid gap-4 sm:grid-cols-2 print:grid-cols-2" aria-label="Sign-in cards">
          {shown.map((s) => (
            <li
              key={s.userId}
              data-testid="sign-in-card"
              className="flex break-inside-avoid flex-col gap-2 rounded-lg border-2 border-dashed border-ink-300 bg-white p-5"
            >
              <div className="flex items-center gap-2 text-sm font-semibold text-ink-700">
                <SunMark className="size-5" /> Heliotally · class sign-in card
              </div>
              <p className="text-xs text-ink-500">
                {classroom.name} · {classroom.school}
              </p>
              <dl className="grid grid-cols-[7rem_1fr] gap-y-1">
                <dt className="text-sm text-ink-600">Name</dt>
                <dd className="text-lg font-semibold text-ink-950" data-testid="card-name">
                  {s.displayName}
                </dd>
                <dt className="text-sm text-ink-600">Classroom code</dt>
                <dd className="font-mono text-lg font-semibold text-ink-950">{classroom.joinCode}</dd>
                <dt className="text-sm text-ink-600">PIN</dt>
                <dd
                  className="font-mono text-2xl font-semibold tracking-widest text-ink-950"
                  data-testid="card-pin"
                >
                  {pins[s.userId] ?? (
                    <span className="text-sm font-normal tracking-normal text-ink-500">ask your teacher</span>
                  )}
                </dd>
              </dl>
              <p className="text-xs text-ink-600">
                Sign in at <span className="font-mono">{signInUrl}</span> under “Students”. Keep your PIN to
                yourself. Never look at the Sun: count on the projected image only.
              </p>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
