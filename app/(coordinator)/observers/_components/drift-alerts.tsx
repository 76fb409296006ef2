import Link from "next/link";

import type { KDriftRow } from "@/db/queries/k";

/** k moves between consecutive periods larger than the coordinator's threshold. */
export function DriftAlerts({ alerts, driftFraction }: { alerts: KDriftRow[]; driftFraction: number }) {
  return (
    <section aria-labelledby="drift-heading" className="flex flex-col gap-3">
      <h2 id="drift-heading" className="text-lg font-semibold text-ink-900">
        Drift alerts
      </h2>
      {alerts.length === 0 ? (
        <p
          className="rounded-lg border border-meadow-200 bg-meadow-50 px-4 py-3 text-sm text-meadow-700"
          role="status"
        >
          No k moved by more than {Math.round(driftFraction * 100)} % between consecutive periods.
        </p>
      ) : (
        <ul className="flex flex-col gap-2" aria-label="Drift alerts">
          {alerts.map((a) => (
            <li
              key={`${a.observerId}-${a.instrumentName}-${a.current.periodStart}`}
              className="rounded-lg border border-caution-200 bg-caution-50 px-4 py-3 text-sm text-caution-800"
            >
              <Link href={`/observers/${a.observerId}`} className="font-semibold underline">
                {a.displayName}
              </Link>{" "}
              ({a.code}, {a.instrumentName}): k went from <strong>{a.previous.k.toFixed(3)}</strong> (
              {a.previous.periodStart} – {a.previous.periodEnd}) to <strong>{a.current.k.toFixed(3)}</strong>{" "}
              ({a.current.periodStart} – {a.current.periodEnd}), {a.relativeChange > 0 ? "+" : ""}
              {(a.relativeChange * 100).toFixed(1)} %
              {a.zScore !== null
                ? Math.abs(a.zScore) < 2
                  ? ` — within ${Math.abs(a.zScore).toFixed(1)} σ of the fits' own uncertainty, possibly noise from few days.`
                  : ` — ${Math.abs(a.zScore).toFixed(1)} σ: a real change (new instrument, site or counting habit?). Confirm with the observer.`
                : "."}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
