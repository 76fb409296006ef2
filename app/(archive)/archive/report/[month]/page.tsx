import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";

import { PageHeader } from "@/components/layout/app-shell";
import { StaticTable, type StaticColumn } from "@/components/ui/static-table";
import { getMonthReport } from "@/db/queries/series-read";
import { requirePageRole } from "@/lib/auth/page-guard";
import { ROLES } from "@/lib/auth/roles";
import { formatRelativeNumber } from "@/lib/format/time";
import { formatMonth, parseMonth } from "@/lib/series/periods";

import { PrintButton } from "./_components/print-button";
import { ReportChart } from "./_components/report-chart";

type Props = { params: Promise<{ month: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  return { title: `Monthly report ${(await params).month}` };
}

const value = (v: number | null | undefined) => (v == null ? "—" : formatRelativeNumber(v));

type Report = NonNullable<Awaited<ReturnType<typeof getMonthReport>>>;

const DAY_COLUMNS: Array<StaticColumn<Report["days"][number]>> = [
  { key: "day", header: "UT day", cell: (d) => d.day },
  { key: "mean", header: "Relative number", className: "font-semibold", cell: (d) => value(d.all?.mean) },
  { key: "observers", header: "Observers", cell: (d) => d.all?.observers ?? "—" },
  { key: "sd", header: "SD", cell: (d) => value(d.all?.sd) },
  { key: "north", header: "North", cell: (d) => value(d.north) },
  { key: "south", header: "South", cell: (d) => value(d.south) },
];

const OBSERVER_COLUMNS: Array<StaticColumn<Report["observers"][number]>> = [
  { key: "name", header: "Observer", cell: (o) => o.displayName },
  { key: "code", header: "Code", cell: (o) => o.code },
  { key: "instrument", header: "Instrument", cell: (o) => o.instrumentName },
  { key: "counts", header: "Counts", cell: (o) => o.counts },
  { key: "raw", header: "Mean 10g + s", cell: (o) => o.meanRaw.toFixed(1) },
  { key: "k", header: "k used", cell: (o) => o.k.toFixed(3) },
];

function monthTitle(month: string): string {
  return new Intl.DateTimeFormat("en-GB", { month: "long", year: "numeric", timeZone: "UTC" }).format(
    new Date(`${month}-01T00:00:00Z`),
  );
}

/** A printable summary of one month of the network series. */
export default async function MonthReportPage({ params }: Props) {
  await requirePageRole(ROLES);
  const { month } = await params;
  const report = await getMonthReport({ month });
  if (!report) notFound();
  const index = parseMonth(month)!;
  const hasData = report.days.length > 0;

  return (
    <article className="report flex flex-col gap-6 print:gap-4">
      <nav className="no-print flex flex-wrap items-center justify-between gap-3 text-sm">
        <Link href="/archive" className="text-corona-700 underline">
          ← Archive
        </Link>
        <div className="flex items-center gap-3">
          <Link href={`/archive/report/${formatMonth(index - 1)}`} className="text-corona-700 underline">
            ← {formatMonth(index - 1)}
          </Link>
          <Link href={`/archive/report/${formatMonth(index + 1)}`} className="text-corona-700 underline">
            {formatMonth(index + 1)} →
          </Link>
          <PrintButton />
        </div>
      </nav>
      <PageHeader
        title={`Monthly report · ${monthTitle(month)}`}
        lead="The network's relative numbers for the month from accepted counts: daily index, monthly means and the 13-month smoothed value, by hemisphere, and who observed."
      />
      {!hasData ? (
        <p className="rounded-lg border border-dashed border-ink-200 px-4 py-6 text-sm text-ink-600">
          No accepted counts in {monthTitle(month)}. Pick another month, or check the Review desk for counts
          still waiting.
        </p>
      ) : (
        <>
          <section aria-labelledby="means-heading">
            <h2 id="means-heading" className="mb-2 text-lg font-semibold text-ink-900">
              Means
            </h2>
            <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4 print:grid-cols-4">
              <Figure
                label="Monthly mean"
                value={value(report.means.all?.mean)}
                detail={`${report.means.all?.days ?? 0} days with data`}
              />
              <Figure
                label="13-month smoothed"
                value={value(report.means.all?.smoothed)}
                detail={
                  report.means.all?.smoothed == null
                    ? "needs six months on each side"
                    : "tapered 13-month mean"
                }
              />
              <Figure
                label="North"
                value={value(report.means.N?.mean)}
                detail={`smoothed ${value(report.means.N?.smoothed)}`}
              />
              <Figure
                label="South"
                value={value(report.means.S?.mean)}
                detail={`smoothed ${value(report.means.S?.smoothed)}`}
              />
            </dl>
          </section>
          <section aria-labelledby="chart-heading" className="break-inside-avoid">
            <h2 id="chart-heading" className="mb-2 text-lg font-semibold text-ink-900">
              Daily values
            </h2>
            <ReportChart
              days={report.days.map((d) => d.day)}
              all={report.days.map((d) => d.all?.mean ?? null)}
              north={report.days.map((d) => d.north)}
              south={report.days.map((d) => d.south)}
            />
          </section>
          <section aria-labelledby="days-heading">
            <h2 id="days-heading" className="mb-2 text-lg font-semibold text-ink-900">
              Daily table
            </h2>
            <StaticTable
              caption={`Daily relative numbers in ${monthTitle(month)}`}
              columns={DAY_COLUMNS}
              rows={report.days}
              rowKey={(d) => d.day}
              density="compact"
            />
          </section>
          <section aria-labelledby="observers-heading" className="break-inside-avoid">
            <h2 id="observers-heading" className="mb-2 text-lg font-semibold text-ink-900">
              Observers ({new Set(report.observers.map((o) => o.code)).size})
            </h2>
            <StaticTable
              caption={`Observers whose counts were accepted in ${monthTitle(month)}`}
              columns={OBSERVER_COLUMNS}
              rows={report.observers}
              rowKey={(o) => `${o.code}-${o.instrumentName}`}
              density="compact"
            />
          </section>
        </>
      )}
      <p className="text-xs text-ink-500">
        Relative number R = k(10g + s) per observer; the daily index is the mean over the day&apos;s
        observers; the monthly mean is over days with data; the smoothed value is the 13-month tapered mean
        [R(n−6) + 2(R(n−5) + … + R(n+5)) + R(n+6)] / 24. Printed from Heliotally.
      </p>
    </article>
  );
}

function Figure({ label, value, detail }: { label: string; value: string; detail: string }) {
  return (
    <div className="rounded-lg border border-ink-100 bg-white px-4 py-3 shadow-sm print:shadow-none">
      <dt className="text-xs font-semibold tracking-wide text-ink-500 uppercase">{label}</dt>
      <dd className="text-2xl font-semibold text-ink-950 tabular-nums">{value}</dd>
      <dd className="text-xs text-ink-500">{detail}</dd>
    </div>
  );
}
