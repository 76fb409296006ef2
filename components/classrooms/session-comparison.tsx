import { StaticTable } from "@/components/ui/static-table";
import type { SessionComparison } from "@/lib/classrooms/compare";

import { ClassCountChart, formatNumber } from "./class-count-chart";

const signed = (v: number) => (v > 0 ? `+${formatNumber(v)}` : formatNumber(v));
const percent = (v: number | null) => (v === null ? "—" : `${v > 0 ? "+" : ""}${Math.round(v * 100)} %`);

/**
 * One session side by side: every student's g, s and 10g + s, the class
 * median and spread, each student's difference from the median, the
 * network's value for the day, and a chart. Display names only: this is
 * shown inside the classroom and nowhere else.
 */
export function SessionComparisonView({
  comparison,
  network,
  ownStudentId,
}: {
  comparison: SessionComparison;
  network: { mean: number; observers: number } | null;
  ownStudentId?: string;
}) {
  const { median, spread } = comparison;
  if (comparison.n === 0 || !median || !spread) {
    return <p className="text-sm text-ink-600">No counts yet. They appear here as students log them.</p>;
  }
  return (
    <div className="flex flex-col gap-6">
      <dl className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <Stat
          label="Class median 10g + s"
          value={formatNumber(median.raw)}
          note={`g ${formatNumber(median.groups)} · s ${formatNumber(median.spots)} (medians)`}
          testId="class-median"
        />
        <Stat
          label="Spread (lowest to highest)"
          value={`${spread.min}–${spread.max}`}
          note={`middle half ${formatNumber(spread.lowerQuartile)}–${formatNumber(spread.upperQuartile)}`}
        />
        <Stat
          label="Typical difference (scaled MAD)"
          value={formatNumber(spread.mad)}
          note={`${comparison.n} count${comparison.n === 1 ? "" : "s"}`}
        />
        {comparison.network && network ? (
          <Stat
            label="Network's value that day"
            value={formatNumber(comparison.network.value)}
            note={`${network.observers} observer${network.observers === 1 ? "" : "s"}${comparison.network.ratioToClassMedian !== null ? ` · network ÷ class median = ${comparison.network.ratioToClassMedian.toFixed(2)}` : ""}`}
            testId="network-value"
          />
        ) : (
          <Stat
            label="Network's value that day"
            value="—"
            note="No network value yet for this day."
            testId="network-value"
          />
        )}
      </dl>

      <ClassCountChart
        rows={comparison.rows.map((r) => ({
          label: r.displayName,
          raw: r.raw,
          highlight: r.studentId === ownStudentId,
        }))}
        median={median.raw}
        quartiles={{ lower: spread.lowerQuartile, upper: spread.upperQuartile }}
        networkValue={comparison.network?.value ?? null}
      />

      <StaticTable
        caption="Counts side by side"
        look="plain"
        rows={comparison.rows}
        rowKey={(r) => r.studentId}
        rowClassName={(r) => (r.studentId === ownStudentId ? "bg-corona-50 font-semibold" : undefined)}
        columns={[
          {
            key: "student",
            header: "Student",
            cell: (r) => `${r.displayName}${r.studentId === ownStudentId ? " (you)" : ""}`,
          },
          { key: "g", header: "g", align: "right", cell: (r) => r.groups },
          { key: "s", header: "s", align: "right", cell: (r) => r.spots },
          { key: "raw", header: "10g + s", align: "right", className: "font-semibold", cell: (r) => r.raw },
          {
            key: "difference",
            header: "From the median",
            align: "right",
            cell: (r) => signed(r.differenceFromMedian),
          },
          {
            key: "percent",
            header: "In per cent",
            align: "right",
            cell: (r) => percent(r.relativeDifference),
          },
        ]}
        footer={
          <tr>
            <td className="py-2 pr-3 font-semibold">Class median</td>
            <td className="py-2 pr-3 text-right tabular-nums">{formatNumber(median.groups)}</td>
            <td className="py-2 pr-3 text-right tabular-nums">{formatNumber(median.spots)}</td>
            <td className="py-2 pr-3 text-right font-semibold tabular-nums">{formatNumber(median.raw)}</td>
            <td colSpan={2} />
          </tr>
        }
      />
      <p className="text-xs text-ink-500">
        Everyone counted the same projected disk. Differences come from eyesight, experience, seeing and how
        each of us splits groups: exactly what a personal k corrects for. The network&apos;s value is already
        corrected by its observers&apos; k, so “network ÷ class median” is roughly the k this class would need
        that day.
      </p>
    </div>
  );
}

function Stat({
  label,
  value,
  note,
  testId,
}: {
  label: string;
  value: string;
  note?: string;
  testId?: string;
}) {
  return (
    <div className="rounded-lg border border-ink-100 bg-white p-4">
      <dt className="text-xs text-ink-500">{label}</dt>
      <dd className="mt-1 text-2xl font-semibold text-ink-950" data-testid={testId}>
        {value}
      </dd>
      {note ? <dd className="mt-1 text-xs text-ink-600">{note}</dd> : null}
    </div>
  );
}
