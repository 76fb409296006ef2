import type { Metadata } from "next";
import Link from "next/link";

import { PageHeader } from "@/components/layout/app-shell";
import { findLatestJob } from "@/db/queries/jobs";
import { describeStoredK, getKSettings, listObserverChoices } from "@/db/queries/k";
import { RECOMPUTE_JOB_KIND } from "@/db/queries/recompute";
import { listReferenceSeries } from "@/db/queries/reference-series";
import { whenKFitHelperReady } from "@/lib/series/k-fit-helper";

import { KSettingsForm } from "./_components/k-settings-form";
import { RecomputePanel } from "./_components/recompute-panel";
import { ReferenceImportForm } from "./_components/reference-import-form";

export const metadata: Metadata = { title: "k settings and recompute" };

export default async function KSettingsPage() {
  // A coordinator here is likely to recompute: start the helper thread now
  // (it takes a few seconds), so even the first recompute after the server
  // starts fits k on two threads and writes as it goes. Not waited for.
  void whenKFitHelperReady();
  const [settings, observers, references, latestJob, storedK] = await Promise.all([
    getKSettings(),
    listObserverChoices(),
    listReferenceSeries(),
    findLatestJob({ kind: RECOMPUTE_JOB_KIND }),
    describeStoredK(),
  ]);
  return (
    <>
      <PageHeader
        title="k settings and recompute"
        lead={
          <>
            How each observer&apos;s k is fitted, the reference it is fitted against, and a full recompute of
            every k and the whole Archive. Accepting a count on the Review desk updates its day at once; a
            full recompute is needed after changing these settings.{" "}
            <Link href="/observers" className="text-corona-700 underline">
              Back to Observers
            </Link>
          </>
        }
      />
      <div className="grid gap-8 lg:grid-cols-2">
        <div className="flex flex-col gap-8">
          <RecomputePanel
            latestJob={latestJob}
            storedK={{ count: storedK.count, fittedAt: storedK.fittedAt?.toISOString() ?? null }}
          />
          <KSettingsForm
            settings={settings}
            observers={observers}
            references={references.map((r) => ({ id: r.id, name: r.name, days: r.days }))}
          />
        </div>
        <div className="flex flex-col gap-8">
          <ReferenceImportForm />
          <section aria-labelledby="references-heading" className="flex flex-col gap-3">
            <h2 id="references-heading" className="text-lg font-semibold text-ink-900">
              Reference series
            </h2>
            {references.length === 0 ? (
              <p className="rounded-lg border border-dashed border-ink-200 px-4 py-6 text-sm text-ink-600">
                None imported. Without one, k is fitted against the network itself with the pilot held fixed.
                Import a CSV above to fit against an outside series instead.
              </p>
            ) : (
              <ul className="flex flex-col gap-2">
                {references.map((r) => (
                  <li
                    key={r.id}
                    className="rounded-lg border border-ink-100 bg-white px-4 py-3 text-sm shadow-sm"
                  >
                    <p className="font-semibold text-ink-900">
                      {r.name}
                      {settings.referenceSeriesId === r.id ? (
                        <span className="ml-2 rounded bg-corona-100 px-1.5 py-0.5 text-xs font-semibold text-corona-800">
                          in use
                        </span>
                      ) : null}
                    </p>
                    <p className="text-ink-600">
                      {r.days} days, {r.firstDay} – {r.lastDay}. Licence: {r.licence}.
                      {r.source ? ` Source: ${r.source}.` : ""}
                    </p>
                    <p className="text-xs text-ink-500">
                      Imported {r.importedAt.slice(0, 10)}
                      {r.importedBy ? ` by ${r.importedBy}` : ""}
                    </p>
                  </li>
                ))}
              </ul>
            )}
          </section>
        </div>
      </div>
    </>
  );
}
