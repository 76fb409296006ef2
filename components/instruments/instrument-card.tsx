import Link from "next/link";

import type { InstrumentView } from "@/db/queries/instruments";
import { describeInstrumentDimensions } from "@/lib/instruments/describe";
import { INSTRUMENT_KIND_LABELS } from "@/lib/instruments/fields";
import { getProjectedDiskDiameterMm } from "@/lib/optics/disk-size";
import { formatLength, type UnitSystem } from "@/lib/optics/units";

/** One instrument at a glance: kind, sizes, today's disk, use and k. */
export function InstrumentCard({
  instrument,
  unitSystem,
  at,
  href,
  planHref,
}: {
  instrument: InstrumentView;
  unitSystem: UnitSystem;
  at: Date;
  /** Where the name links to; none for a read-only view. */
  href?: string;
  planHref?: string;
}) {
  const dimensions = describeInstrumentDimensions({
    kind: instrument.kind,
    params: instrument.params,
    unitSystem,
  });
  const diskMm = getProjectedDiskDiameterMm({ instrument, at });
  return (
    <article className="flex h-full flex-col gap-2 rounded-lg border border-ink-100 bg-white p-4 shadow-sm">
      <header>
        <h3 className="font-semibold text-ink-950">
          {href ? (
            <Link href={href} className="hover:underline">
              {instrument.name}
            </Link>
          ) : (
            instrument.name
          )}
        </h3>
        <p className="text-xs text-ink-500">{INSTRUMENT_KIND_LABELS[instrument.kind]}</p>
      </header>
      {dimensions.length > 0 ? (
        <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-sm">
          {dimensions.map((d) => (
            <div key={d.label} className="contents">
              <dt className="text-ink-500">{d.label}</dt>
              <dd className="text-ink-900">{d.value}</dd>
            </div>
          ))}
        </dl>
      ) : (
        <p className="text-sm text-caution-700">Its sizes have not been entered yet.</p>
      )}
      <div className="mt-auto flex flex-wrap gap-x-4 gap-y-1 border-t border-ink-100 pt-2 text-xs text-ink-600">
        {diskMm !== null ? <span>Disk today {formatLength({ valueMm: diskMm, unitSystem })}</span> : null}
        <span>
          {instrument.observationCount} {instrument.observationCount === 1 ? "observation" : "observations"}
        </span>
        {instrument.k ? <span>k for this instrument {instrument.k.k.toFixed(3)}</span> : null}
        {planHref ? (
          <Link href={planHref} className="text-corona-700 underline">
            Plan
          </Link>
        ) : null}
      </div>
    </article>
  );
}
