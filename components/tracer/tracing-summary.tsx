import Link from "next/link";

import type { StoredGroup, TracingSummaryData } from "@/db/queries/tracings";
import { formatUt } from "@/lib/format/time";

import { TracingDrawing } from "./tracing-drawing";
import type { ObservationCounts } from "@/lib/tracer/measure";

function signed(value: number): string {
  return `${value >= 0 ? "+" : "−"}${Math.abs(value).toFixed(1)}°`;
}

function countGroups(groups: StoredGroup[]): ObservationCounts {
  const north = groups.filter((g) => g.hemisphere === "N");
  const south = groups.filter((g) => g.hemisphere === "S");
  const spots = (list: StoredGroup[]) => list.reduce((sum, g) => sum + g.spots, 0);
  return {
    groups: groups.length,
    spots: spots(groups),
    northGroups: north.length,
    northSpots: spots(north),
    southGroups: south.length,
    southSpots: spots(south),
  };
}

/** The tracing on the observation's page: the drawing, its groups, and whether the logged counts agree. */
export function TracingSummary({
  observationId,
  tracing,
  counts,
  editable,
  spacing = "mt-6",
}: {
  observationId: string;
  tracing: TracingSummaryData | null;
  counts: ObservationCounts;
  editable: boolean;
  /** The section's outer spacing: its own top margin by default, none inside a spaced column. */
  spacing?: string;
}) {
  const traceLink = editable ? (
    <Link
      href={`/logbook/${observationId}/trace`}
      className="text-sm font-semibold text-corona-700 underline"
    >
      {tracing ? "Open in the Disk tracer" : "Trace the disk"}
    </Link>
  ) : null;
  if (!tracing) {
    return (
      <section
        className={`${spacing} rounded-lg border border-ink-100 bg-white p-6 text-sm`}
        aria-labelledby="tracing-heading"
      >
        <h2 id="tracing-heading" className="text-lg font-semibold text-ink-950">
          Disk tracing
        </h2>
        <p className="mt-1 text-ink-600">
          No tracing yet. A tracing keeps each group&apos;s position and class, so your count can be checked
          later and groups followed from day to day.
        </p>
        {traceLink ? <p className="mt-3">{traceLink}</p> : null}
      </section>
    );
  }
  const fromTracing = countGroups(tracing.groups);
  const keys = ["groups", "spots", "northGroups", "northSpots", "southGroups", "southSpots"] as const;
  const differs = keys.some((k) => fromTracing[k] !== counts[k]);
  return (
    <section
      className={`@container ${spacing} rounded-lg border border-ink-100 bg-white p-6 text-sm`}
      aria-labelledby="tracing-heading"
    >
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 id="tracing-heading" className="text-lg font-semibold text-ink-950">
          Disk tracing
        </h2>
        <span className="text-xs text-ink-500">
          Revision {tracing.revision}, saved {formatUt(tracing.updatedAt)}
        </span>
      </div>
      <div className="mt-3 grid gap-6 @3xl:grid-cols-[18rem_1fr]">
        {tracing.hasPng ? (
          // A plain img: the picture comes from our own API with the reader's cookie and changes per revision.
          // eslint-disable-next-line @next/next/no-img-element
          <img
            src={`/api/v1/observations/${observationId}/tracing/png?revision=${tracing.revision}`}
            alt={`Tracing of the disk with ${fromTracing.groups} groups and ${fromTracing.spots} spots`}
            className="w-full max-w-80 rounded-md border border-ink-100"
            width={288}
            height={288}
          />
        ) : tracing.document ? (
          <TracingDrawing
            document={tracing.document}
            label={`Tracing of the disk with ${fromTracing.groups} groups and ${fromTracing.spots} spots, drawn from its saved positions`}
            className="w-full max-w-80 rounded-md border border-ink-100"
          />
        ) : (
          <p className="text-ink-500">No picture was saved with this tracing.</p>
        )}
        <div className="flex flex-col gap-3">
          {differs ? (
            <p
              className="rounded-md border border-corona-200 bg-corona-50 px-3 py-2 text-corona-900"
              data-testid="tracing-differs"
            >
              The logged counts differ from the tracing: the tracing has g {fromTracing.groups}, s{" "}
              {fromTracing.spots} (north {fromTracing.northGroups}/{fromTracing.northSpots}, south{" "}
              {fromTracing.southGroups}/{fromTracing.southSpots}).
            </p>
          ) : (
            <p className="text-meadow-700">The logged counts match the tracing.</p>
          )}
          {tracing.groups.length === 0 ? (
            <p className="text-ink-600">No groups on this tracing: a spotless disk.</p>
          ) : (
            <div className="overflow-x-auto">
              <table className="w-full text-left text-xs" data-testid="tracing-groups">
                <thead className="text-ink-500">
                  <tr>
                    <th className="py-1 pr-3 font-medium">Group</th>
                    <th className="py-1 pr-3 font-medium">Spots</th>
                    <th className="py-1 pr-3 font-medium">Zurich</th>
                    <th className="py-1 pr-3 font-medium">McIntosh</th>
                    <th className="py-1 pr-3 font-medium">Latitude</th>
                    <th className="py-1 pr-3 font-medium">CMD</th>
                    <th className="py-1 pr-3 font-medium">Carrington</th>
                    <th className="py-1 pr-3 font-medium">Hem.</th>
                    <th className="py-1 font-medium">Area (MSH)</th>
                  </tr>
                </thead>
                <tbody className="text-ink-900">
                  {tracing.groups.map((g) => (
                    <tr key={g.number} className="border-t border-ink-100">
                      <td className="py-1 pr-3 font-semibold">{g.number}</td>
                      <td className="py-1 pr-3">{g.spots}</td>
                      <td className="py-1 pr-3">{g.zurichClass ?? "—"}</td>
                      <td className="py-1 pr-3">{g.mcintoshClass ?? "—"}</td>
                      <td className="py-1 pr-3">{signed(g.latitudeDeg)}</td>
                      <td className="py-1 pr-3">{signed(g.cmdDeg)}</td>
                      <td className="py-1 pr-3">{g.carringtonLonDeg.toFixed(1)}°</td>
                      <td className="py-1 pr-3">{g.hemisphere}</td>
                      <td className="py-1">{g.areaMsh === null ? "—" : Math.round(g.areaMsh)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
          {traceLink}
        </div>
      </div>
    </section>
  );
}
