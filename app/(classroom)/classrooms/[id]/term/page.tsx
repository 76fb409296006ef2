import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";

import { KSparkline } from "@/components/classrooms/k-sparkline";
import { TermCountChart } from "@/components/classrooms/term-count-chart";
import { PageHeader } from "@/components/layout/app-shell";
import { ButtonLink } from "@/components/ui/button";
import { StaticTable } from "@/components/ui/static-table";
import { requirePageRole } from "@/lib/auth/page-guard";
import {
  CLASS_MIN_SESSIONS,
  SETTLE_RUN,
  SETTLE_TOLERANCE,
  summariseSettling,
} from "@/lib/classrooms/compare";
import { loadTermComparison } from "@/lib/classrooms/views";
import { termExportQuerySchema } from "@/lib/validation/classroom";

import { PrintButton } from "./_components/print-button";

export const metadata: Metadata = { title: "Term comparison" };
export const dynamic = "force-dynamic";

const METHOD_LABELS = {
  "ratio-of-sums": "Ratio of sums",
  "mean-of-ratios": "Mean of ratios",
  "median-of-ratios": "Median of ratios",
} as const;

export default async function TermPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const [{ id }, query] = await Promise.all([params, searchParams]);
  const user = await requirePageRole(["educator"]);
  const parsed = termExportQuerySchema.safeParse({ method: query.method });
  const method = parsed.success ? parsed.data.method : "ratio-of-sums";
  const view = await loadTermComparison({ educatorUserId: user.id, classroomId: id, method });
  if (!view) notFound();
  const { classroom, term, table, classK } = view;
  const byStudent = new Map(term.students.map((s) => [s.studentId, s]));
  const settling = summariseSettling(term.students);
  const sessionsForChart = view.medians.map((m) => ({
    day: m.day,
    median: m.median,
    network: m.network?.mean ?? null,
    raws: m.raws,
  }));

  return (
    <>
      <PageHeader
        title={`Term comparison: ${classroom.name}`}
        lead={
          <>
            {classroom.school} · term {classroom.termStart} to {classroom.termEnd}
            <span className="no-print">
              {" "}
              ·{" "}
              <Link href={`/classrooms/${id}`} className="text-corona-700 underline">
                back to the classroom
              </Link>
            </span>
          </>
        }
        actions={
          <div className="no-print flex gap-2">
            <ButtonLink
              href={`/api/v1/classrooms/${id}/term?method=${method}`}
              variant="secondary"
              prefetch={false}
            >
              Download CSV
            </ButtonLink>
            <PrintButton />
          </div>
        }
      />
      {view.medians.length === 0 ? (
        <p className="rounded-lg border border-ink-100 bg-white p-6 text-sm text-ink-600">
          No counts this term yet. Once students log counts for a session, each student&apos;s k against the
          class median appears here.
        </p>
      ) : (
        <div className="flex flex-col gap-6">
          <nav aria-label="k method" className="no-print flex flex-wrap items-center gap-2 text-sm">
            <span className="text-ink-600">k by</span>
            {(Object.keys(METHOD_LABELS) as Array<keyof typeof METHOD_LABELS>).map((m) => (
              <Link
                key={m}
                href={`/classrooms/${id}/term?method=${m}`}
                aria-current={m === method ? "page" : undefined}
                className={`rounded-full px-3 py-1 ${m === method ? "bg-umbra text-corona-100" : "border border-ink-200 bg-white text-ink-700 hover:bg-ink-50"}`}
              >
                {METHOD_LABELS[m]}
              </Link>
            ))}
          </nav>

          <section className="grid gap-4 md:grid-cols-[1fr_2fr]">
            <div className="rounded-lg bg-umbra p-5 text-corona-100">
              <p className="text-xs tracking-widest uppercase">Class k against the network</p>
              <p className="mt-2 text-4xl font-semibold text-corona-300" data-testid="class-k">
                {classK.k === null ? "—" : classK.k.toFixed(2)}
              </p>
              <p className="mt-2 text-sm">
                {classK.k === null
                  ? "No session day has a network value yet."
                  : `From ${classK.n} session day${classK.n === 1 ? "" : "s"} with a network value${classK.sigma !== null ? `, ± ${classK.sigma.toFixed(2)}` : ""}${classK.meetsMinimum ? "" : ` (fewer than ${CLASS_MIN_SESSIONS}: a first look only)`}.`}
              </p>
            </div>
            <div className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm">
              <TermCountChart sessions={sessionsForChart} />
            </div>
          </section>

          <section
            aria-labelledby="k-heading"
            className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
          >
            <h2 id="k-heading" className="text-lg font-semibold text-ink-950">
              Each student&apos;s k against the class median
            </h2>
            <p className="mt-1 text-sm text-ink-600">
              k = class median ÷ the student&apos;s 10g + s, fitted over the sessions they counted (
              {METHOD_LABELS[method].toLowerCase()}, the same estimator the network uses). Above 1: the
              student sees fewer spots than the class; below 1: more. The class median includes the
              student&apos;s own count, which in a small class pulls k a little towards 1. A k from fewer than{" "}
              {CLASS_MIN_SESSIONS} sessions is a first look.
            </p>
            <StaticTable
              caption="k per student"
              look="plain"
              className="mt-4"
              rows={view.students}
              rowKey={(s) => s.studentId}
              columns={[
                {
                  key: "student",
                  header: "Student",
                  className: "font-medium text-ink-900",
                  cell: (s) => s.displayName,
                },
                {
                  key: "sessions",
                  header: "Sessions",
                  align: "right",
                  cell: (s) => byStudent.get(s.studentId)?.sessionsCounted ?? 0,
                },
                {
                  key: "k",
                  header: "k",
                  align: "right",
                  cell: (s) => {
                    const result = byStudent.get(s.studentId);
                    if (!result || result.estimate.k === null) return "—";
                    return (
                      <>
                        <strong>{result.estimate.k.toFixed(2)}</strong>
                        {result.estimate.sigma != null ? (
                          <span className="text-ink-500"> ± {result.estimate.sigma.toFixed(2)}</span>
                        ) : null}
                        {!result.estimate.meetsMinimum ? <span className="text-ink-400"> *</span> : null}
                      </>
                    );
                  },
                },
                {
                  key: "running",
                  header: "Running k, session by session",
                  cell: (s) => {
                    const result = byStudent.get(s.studentId);
                    return (
                      <KSparkline
                        steps={result?.settling.map((step) => step.k) ?? []}
                        finalK={result?.estimate.k ?? null}
                      />
                    );
                  },
                },
                {
                  key: "settled",
                  header: "Settled",
                  className: "text-ink-700",
                  cell: (s) => {
                    const after = byStudent.get(s.studentId)?.settledAfter;
                    return after ? `after ${after} session${after === 1 ? "" : "s"}` : "not yet";
                  },
                },
              ]}
            />
            <p className="mt-2 text-xs text-ink-500">
              * fewer than {CLASS_MIN_SESSIONS} sessions. “Settled”: from that session on, the running k
              stayed within {Math.round(SETTLE_TOLERANCE * 100)} % of the term&apos;s k for at least{" "}
              {SETTLE_RUN} sessions. The green band in each line is that ±{" "}
              {Math.round(SETTLE_TOLERANCE * 100)} %.
            </p>
          </section>

          {settling.length > 0 ? (
            <section
              aria-labelledby="settling-heading"
              className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
            >
              <h2 id="settling-heading" className="text-lg font-semibold text-ink-950">
                How k settles with experience
              </h2>
              <p className="mt-1 text-sm text-ink-600">
                After a student&apos;s first few sessions, how far is their running k from where it ends the
                term? The typical (median) distance across the class:
              </p>
              <StaticTable
                caption="k by session count"
                look="plain"
                density="compact"
                className="mt-3 w-fit"
                rows={settling}
                rowKey={(row) => String(row.sessionCount)}
                columns={[
                  { key: "after", header: "After session", cell: (row) => row.sessionCount },
                  { key: "students", header: "Students", align: "right", cell: (row) => row.students },
                  {
                    key: "distance",
                    header: "Typical distance from term k",
                    align: "right",
                    cell: (row) => `${Math.round(row.medianDeviation * 100)} %`,
                  },
                ]}
              />
            </section>
          ) : null}

          <section
            aria-labelledby="table-heading"
            className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
          >
            <h2 id="table-heading" className="text-lg font-semibold text-ink-950">
              The term in one table
            </h2>
            <p className="mt-1 text-sm text-ink-600">
              What the CSV download holds: each student&apos;s 10g + s per session and their k.
            </p>
            <div className="mt-3 overflow-x-auto print:overflow-visible">
              <table className="w-full text-left text-xs print:text-[7px]" aria-label="Term table">
                <thead className="border-b border-ink-200 text-ink-500">
                  <tr>
                    {table.header.map((h) => (
                      <th key={h} className="px-2 py-1 font-medium whitespace-nowrap print:px-0.5">
                        {h.replace(" 10g+s", "")}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody className="divide-y divide-ink-100">
                  {table.rows.map((row, i) => (
                    <tr key={i} className={i === table.rows.length - 1 ? "font-semibold" : undefined}>
                      {row.map((cell, j) => (
                        <td
                          key={j}
                          className={`px-2 py-1 whitespace-nowrap print:px-0.5 ${j > 0 ? "text-right tabular-nums" : ""}`}
                        >
                          {cell === null ? "" : String(cell)}
                        </td>
                      ))}
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </section>
        </div>
      )}
    </>
  );
}
