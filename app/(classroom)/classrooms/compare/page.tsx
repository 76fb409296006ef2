import type { Metadata } from "next";
import Link from "next/link";

import { formatNumber } from "@/components/classrooms/class-count-chart";
import { PageHeader } from "@/components/layout/app-shell";
import { StaticTable } from "@/components/ui/static-table";
import { requirePageRole } from "@/lib/auth/page-guard";
import { CLASS_MIN_SESSIONS } from "@/lib/classrooms/compare";
import { loadClassComparison } from "@/lib/classrooms/views";

export const metadata: Metadata = { title: "Compare classes" };
export const dynamic = "force-dynamic";

export default async function CompareClassesPage() {
  const user = await requirePageRole(["educator"]);
  const view = await loadClassComparison({ educatorUserId: user.id });
  return (
    <>
      <PageHeader
        title="Compare classes"
        lead="Classes that chose to be compared: each class's median count per session day and its k against the network. No student's name leaves their classroom."
      />
      {!view.optedIn ? (
        <p className="rounded-lg border border-ink-100 bg-white p-6 text-sm text-ink-600">
          {view.ownCount === 0 ? (
            <>Create a classroom first, then opt it in to comparing.</>
          ) : (
            <>
              None of your classrooms takes part yet. Open a classroom and tick “Compare this class with other
              classes” under Joining and comparing; you then see every class that opted in.{" "}
              <Link href="/classrooms" className="text-corona-700 underline">
                Your classrooms
              </Link>
            </>
          )}
        </p>
      ) : (
        <div className="flex flex-col gap-6">
          <section
            aria-labelledby="class-k-heading"
            className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
          >
            <h2 id="class-k-heading" className="text-lg font-semibold text-ink-950">
              Class k against the network
            </h2>
            <p className="mt-1 text-sm text-ink-600">
              The network&apos;s daily index ÷ the class median 10g + s, fitted over session days that have a
              network value (ratio of sums). A class k from fewer than {CLASS_MIN_SESSIONS} days is a first
              look.
            </p>
            <StaticTable
              caption="Classes"
              look="plain"
              className="mt-3"
              rows={view.classes}
              rowKey={(c) => c.id}
              rowClassName={(c) => (c.own ? "bg-corona-50" : undefined)}
              columns={[
                {
                  key: "class",
                  header: "Class",
                  className: "font-medium text-ink-900",
                  cell: (c) => (
                    <>
                      {c.label}
                      {c.own ? <span className="ml-1 text-xs text-ink-500">(yours)</span> : null}
                    </>
                  ),
                },
                { key: "sessions", header: "Sessions", align: "right", cell: (c) => c.sessions },
                { key: "counts", header: "Counts", align: "right", cell: (c) => c.counts },
                {
                  key: "k",
                  header: "Class k",
                  align: "right",
                  cell: (c) =>
                    c.classK.k === null ? (
                      <span className="text-ink-500">no network days yet</span>
                    ) : (
                      <>
                        <strong>{c.classK.k.toFixed(2)}</strong>
                        {c.classK.sigma !== null ? (
                          <span className="text-ink-500"> ± {c.classK.sigma.toFixed(2)}</span>
                        ) : null}
                        <span className="text-ink-500"> ({c.classK.n} days)</span>
                      </>
                    ),
                },
              ]}
            />
          </section>
          <section
            aria-labelledby="medians-heading"
            className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
          >
            <h2 id="medians-heading" className="text-lg font-semibold text-ink-950">
              Class median 10g + s per session day
            </h2>
            <StaticTable
              caption="Class medians by day"
              look="plain"
              density="compact"
              className="mt-3"
              rows={view.rows}
              rowKey={(row) => row.day}
              empty="No counts yet in the classes taking part."
              columns={[
                { key: "day", header: "Day (UT)", cell: (row) => row.day },
                ...view.classes.map((c, i) => ({
                  key: c.id,
                  header: c.label,
                  align: "right" as const,
                  cell: (row: (typeof view.rows)[number]) => {
                    const v = row.values[i];
                    return v == null ? "" : formatNumber(v);
                  },
                })),
                {
                  key: "network",
                  header: "Network",
                  align: "right",
                  className: "text-ink-600",
                  cell: (row) => (row.network === null ? "—" : formatNumber(row.network)),
                },
              ]}
            />
          </section>
        </div>
      )}
    </>
  );
}
