import type { Metadata } from "next";
import Link from "next/link";

import { PageHeader } from "@/components/layout/app-shell";
import { ButtonLink } from "@/components/ui/button";
import { listObserverChoices } from "@/db/queries/k";
import { getObserverByUserId } from "@/db/queries/observers";
import { findLatestSeriesMonth } from "@/db/queries/series-read";
import { requirePageRole } from "@/lib/auth/page-guard";
import { ROLES, roleSatisfies } from "@/lib/auth/roles";

import { ArchiveCharts } from "./_components/archive-charts";
import { LatitudeDiagram } from "./_components/latitude-diagram";
import { ObserverComparison } from "@/components/series/observer-comparison";
import { ReportPicker } from "./_components/report-picker";
import { SeriesTables } from "./_components/series-tables";

export const metadata: Metadata = { title: "Archive" };

export default async function ArchivePage() {
  const user = await requirePageRole(ROLES);
  const manages = roleSatisfies({ role: user.role, required: ["coordinator"] });
  const [latestMonth, choices, own] = await Promise.all([
    findLatestSeriesMonth(),
    manages ? listObserverChoices() : Promise.resolve([]),
    manages ? Promise.resolve(null) : getObserverByUserId({ userId: user.id }),
  ]);

  return (
    <>
      <PageHeader
        title="Archive"
        lead="The network's relative numbers from accepted counts: each day's mean of k(10g + s) over its observers, the monthly means, the 13-month smoothed values, and the same for each hemisphere."
        actions={
          manages ? (
            <ButtonLink href="/observers/k-settings" variant="secondary">
              k settings and recompute
            </ButtonLink>
          ) : undefined
        }
      />
      {latestMonth === null ? (
        <div className="rounded-lg border border-ink-100 bg-white px-6 py-10 text-center text-sm text-ink-700 shadow-sm">
          <p className="font-semibold text-ink-900">The Archive is empty.</p>
          <p className="mt-1">
            It fills as counts are accepted on the Review desk.{" "}
            {manages ? (
              <>
                Accept counts, or run a full recompute from{" "}
                <Link href="/observers/k-settings" className="font-semibold text-corona-700 underline">
                  k settings and recompute
                </Link>
                .
              </>
            ) : (
              "Ask your coordinator when the first counts will be reviewed."
            )}
          </p>
        </div>
      ) : (
        <div className="flex flex-col gap-10">
          <ArchiveCharts />
          <ObserverComparison
            choices={choices}
            fixedObserverId={own?.id ?? null}
            heading={own ? "Your counts against the network" : "An observer against the network"}
          />
          <LatitudeDiagram />
          <section aria-labelledby="tables-heading" className="flex flex-col gap-3">
            <div className="flex flex-wrap items-end justify-between gap-3">
              <h2 id="tables-heading" className="text-lg font-semibold text-ink-900">
                Tables
              </h2>
              <ReportPicker latestMonth={latestMonth} />
            </div>
            <SeriesTables />
          </section>
        </div>
      )}
    </>
  );
}
