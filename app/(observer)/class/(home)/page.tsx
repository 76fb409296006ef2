import type { Metadata } from "next";
import Link from "next/link";

import { SessionStateBadge } from "@/components/classrooms/session-state-badge";
import { PageHeader } from "@/components/layout/app-shell";
import { SafetyNotice } from "@/components/safety-notice";
import { ButtonLink } from "@/components/ui/button";
import { StaticTable } from "@/components/ui/static-table";
import { getObserverByUserId } from "@/db/queries/observers";
import { requirePageRole } from "@/lib/auth/page-guard";
import { formatSessionWindow } from "@/lib/classrooms/session-state";
import { computeRawCount } from "@/lib/counts/relative-number";
import { loadStudentClass } from "@/lib/classrooms/views";
import { INSTRUMENT_KIND_LABELS } from "@/lib/instruments/fields";

import { NextStudentButton } from "../_components/next-student-button";

export const metadata: Metadata = { title: "My class" };
export const dynamic = "force-dynamic";

const card = "rounded-lg border border-ink-100 bg-white p-5 shadow-sm";

export default async function MyClassPage() {
  const user = await requirePageRole(["student"]);
  const observer = await getObserverByUserId({ userId: user.id });
  const view = observer ? await loadStudentClass({ userId: user.id, observerId: observer.id }) : null;
  if (!view) {
    return (
      <>
        <PageHeader title="My class" />
        <p className={`${card} text-sm text-ink-600`}>
          You are not in a classroom at the moment. Ask your teacher for a sign-in card.
        </p>
      </>
    );
  }
  const { classroom } = view;
  return (
    <>
      <PageHeader
        title="My class"
        lead={`${classroom.name} · ${classroom.school}`}
        actions={<NextStudentButton />}
      />
      {classroom.archivedAt ? (
        <p
          role="status"
          className="mb-6 rounded-md border border-ink-200 bg-ink-50 px-4 py-3 text-sm text-ink-700"
        >
          This class has finished for the term. You can still look back at your counts.
        </p>
      ) : null}
      <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
        <div className="flex flex-col gap-6">
          <section aria-labelledby="open-heading" className={card}>
            <h2 id="open-heading" className="text-lg font-semibold text-ink-950">
              Open now
            </h2>
            {view.open.length === 0 ? (
              <p className="mt-2 text-sm text-ink-600">
                No session is open right now.{" "}
                {view.upcoming[0]
                  ? `The next one is “${view.upcoming[0].title}”, ${formatSessionWindow(view.upcoming[0])}.`
                  : "Your teacher will schedule the next one."}
              </p>
            ) : (
              <ul className="mt-3 flex flex-col gap-3">
                {view.open.map((s) => (
                  <li
                    key={s.id}
                    className="flex flex-wrap items-center justify-between gap-3 rounded-md bg-corona-50 p-4"
                  >
                    <div>
                      <p className="font-semibold text-ink-950">{s.title}</p>
                      <p className="text-sm text-ink-700">
                        {formatSessionWindow(s)} · {s.instrumentName} (
                        {INSTRUMENT_KIND_LABELS[s.instrumentKind].toLowerCase()})
                      </p>
                    </div>
                    {s.own ? (
                      <ButtonLink href={`/class/sessions/${s.id}`} variant="secondary">
                        Counted: see the class
                      </ButtonLink>
                    ) : (
                      <ButtonLink href={`/class/sessions/${s.id}`}>Log my count</ButtonLink>
                    )}
                  </li>
                ))}
              </ul>
            )}
          </section>

          {view.upcoming.length > 0 ? (
            <section aria-labelledby="upcoming-heading" className={card}>
              <h2 id="upcoming-heading" className="text-lg font-semibold text-ink-950">
                Coming up
              </h2>
              <ul className="mt-2 divide-y divide-ink-100 text-sm">
                {view.upcoming.map((s) => (
                  <li key={s.id} className="flex justify-between gap-2 py-2">
                    <span>{s.title}</span>
                    <span className="text-ink-600">{formatSessionWindow(s)}</span>
                  </li>
                ))}
              </ul>
            </section>
          ) : null}

          <section aria-labelledby="past-heading" className={card}>
            <h2 id="past-heading" className="text-lg font-semibold text-ink-950">
              Past sessions
            </h2>
            <StaticTable
              caption="Past sessions"
              look="plain"
              className="mt-3"
              rows={view.past}
              rowKey={(s) => s.id}
              empty="No past sessions yet. After each one you can compare your count with the class."
              columns={[
                {
                  key: "session",
                  header: "Session",
                  cell: (s) => (
                    <Link
                      href={`/class/sessions/${s.id}`}
                      className="font-medium text-ink-900 hover:underline"
                    >
                      {s.title}
                    </Link>
                  ),
                },
                { key: "day", header: "Day", className: "text-ink-600", cell: (s) => s.day },
                { key: "g", header: "My g", align: "right", cell: (s) => s.own?.groups ?? "—" },
                { key: "s", header: "My s", align: "right", cell: (s) => s.own?.spots ?? "—" },
                {
                  key: "raw",
                  header: "10g + s",
                  align: "right",
                  className: "font-semibold",
                  cell: (s) => (s.own ? computeRawCount(s.own) : "missed"),
                },
                {
                  key: "state",
                  header: <span className="sr-only">State</span>,
                  align: "right",
                  cell: (s) => <SessionStateBadge state={s.state} />,
                },
              ]}
            />
            <p className="mt-3 text-sm text-ink-600">
              All your counts, class or not, are in{" "}
              <Link href="/logbook" className="text-corona-700 underline">
                My counts
              </Link>
              .
            </p>
          </section>
        </div>
        <div className="self-start">
          <SafetyNotice classroom />
        </div>
      </div>
    </>
  );
}
