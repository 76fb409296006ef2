import type { Metadata } from "next";
import Link from "next/link";

import { formatNumber } from "@/components/classrooms/class-count-chart";
import { PageHeader } from "@/components/layout/app-shell";
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
            <table className="mt-3 w-full text-left text-sm" aria-label="Classes">
              <thead className="border-b border-ink-200 text-xs text-ink-500">
                <tr>
                  <th className="py-2 pr-3 font-medium">Class</th>
                  <th className="py-2 pr-3 text-right font-medium">Sessions</th>
                  <th className="py-2 pr-3 text-right font-medium">Counts</th>
                  <th className="py-2 text-right font-medium">Class k</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {view.classes.map((c) => (
                  <tr key={c.id} className={c.own ? "bg-corona-50" : undefined}>
                    <td className="py-2 pr-3 font-medium text-ink-900">
                      {c.label}
                      {c.own ? <span className="ml-1 text-xs text-ink-500">(yours)</span> : null}
                    </td>
                    <td className="py-2 pr-3 text-right tabular-nums">{c.sessions}</td>
                    <td className="py-2 pr-3 text-right tabular-nums">{c.counts}</td>
                    <td className="py-2 text-right tabular-nums">
                      {c.classK.k === null ? (
                        <span className="text-ink-500">no network days yet</span>
                      ) : (
                        <>
                          <strong>{c.classK.k.toFixed(2)}</strong>
                          {c.classK.sigma !== null ? (
                            <span className="text-ink-500"> ± {c.classK.sigma.toFixed(2)}</span>
                          ) : null}
                          <span className="text-ink-500"> ({c.classK.n} days)</span>
                        </>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </section>
          <section
            aria-labelledby="medians-heading"
            className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
          >
            <h2 id="medians-heading" className="text-lg font-semibold text-ink-950">
              Class median 10g + s per session day
            </h2>
            {view.rows.length === 0 ? (
              <p className="mt-2 text-sm text-ink-600">No counts yet in the classes taking part.</p>
            ) : (
              <div className="mt-3 overflow-x-auto">
                <table className="w-full text-left text-sm" aria-label="Class medians by day">
                  <thead className="border-b border-ink-200 text-xs text-ink-500">
                    <tr>
                      <th className="py-2 pr-3 font-medium">Day (UT)</th>
                      {view.classes.map((c) => (
                        <th key={c.id} className="py-2 pr-3 text-right font-medium">
                          {c.label}
                        </th>
                      ))}
                      <th className="py-2 text-right font-medium">Network</th>
                    </tr>
                  </thead>
                  <tbody className="divide-y divide-ink-100">
                    {view.rows.map((row) => (
                      <tr key={row.day}>
                        <td className="py-1.5 pr-3 tabular-nums">{row.day}</td>
                        {row.values.map((v, i) => (
                          <td key={i} className="py-1.5 pr-3 text-right tabular-nums">
                            {v === null ? "" : formatNumber(v)}
                          </td>
                        ))}
                        <td className="py-1.5 text-right text-ink-600 tabular-nums">
                          {row.network === null ? "—" : formatNumber(row.network)}
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
          </section>
        </div>
      )}
    </>
  );
}
