import type { Metadata } from "next";

import { PageHeader } from "@/components/layout/app-shell";
import { Button, ButtonLink } from "@/components/ui/button";
import { Field, Select } from "@/components/ui/field";
import { listObserversForImport } from "@/db/queries/imports";
import { requireRole } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Network data" };
export const dynamic = "force-dynamic";

const SERIES = [
  { kind: "daily", label: "Daily index" },
  { kind: "monthly", label: "Monthly means and 13-month smoothed" },
  { kind: "yearly", label: "Yearly means" },
] as const;
const HEMISPHERES = [
  { value: "all", label: "All" },
  { value: "N", label: "North" },
  { value: "S", label: "South" },
] as const;

export default async function NetworkDataPage() {
  await requireRole(["coordinator"]);
  const observers = await listObserversForImport();
  return (
    <>
      <PageHeader
        title="Network data"
        lead="Bring an observer's old logbook in on their behalf, and take the network's archive and published series out."
      />
      <div className="grid gap-6 lg:grid-cols-2">
        <section
          aria-labelledby="import-for"
          className="flex flex-col gap-3 rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
        >
          <h2 id="import-for" className="text-base font-semibold text-ink-900">
            Import a logbook for an observer
          </h2>
          <p className="text-sm text-ink-600">
            For observers who send their history as a spreadsheet. The counts go into their Logbook, marked as
            imported by you, and arrive on the Review desk like any other.
          </p>
          {observers.length === 0 ? (
            <p className="text-sm text-ink-600">
              No observers have joined yet. Once they have, choose one here.
            </p>
          ) : (
            <form action="/network-data/import" method="get" className="flex flex-wrap items-end gap-3">
              <Field id="import-observer" label="Observer">
                <Select id="import-observer" name="observer" required defaultValue="">
                  <option value="" disabled>
                    Choose an observer…
                  </option>
                  {observers.map((o) => (
                    <option key={o.id} value={o.id}>
                      {o.displayName} ({o.code})
                    </option>
                  ))}
                </Select>
              </Field>
              <Button type="submit">Continue</Button>
            </form>
          )}
        </section>

        <section
          aria-labelledby="archive"
          className="flex flex-col gap-3 rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
        >
          <h2 id="archive" className="text-base font-semibold text-ink-900">
            The whole network archive
          </h2>
          <p className="text-sm text-ink-600">
            Every observer&apos;s every count, whatever its review status, with observer codes. JSON adds
            instruments and the groups drawn on the Disk tracer.
          </p>
          <div className="flex flex-wrap gap-3">
            <ButtonLink href="/api/v1/exports/network?format=csv" prefetch={false} download>
              Archive as CSV
            </ButtonLink>
            <ButtonLink
              href="/api/v1/exports/network?format=json"
              prefetch={false}
              download
              variant="secondary"
            >
              Archive as JSON
            </ButtonLink>
          </div>
        </section>

        <section
          aria-labelledby="series"
          className="flex flex-col gap-3 rounded-lg border border-ink-100 bg-white p-5 shadow-sm lg:col-span-2"
        >
          <h2 id="series" className="text-base font-semibold text-ink-900">
            Published series
          </h2>
          <p className="text-sm text-ink-600">
            The stored series as CSV, from the first day to the last, for all groups or one hemisphere.
          </p>
          <table className="w-full max-w-2xl text-sm">
            <tbody>
              {SERIES.map((s) => (
                <tr key={s.kind} className="border-t border-ink-100">
                  <th scope="row" className="py-2 pr-4 text-left font-medium text-ink-800">
                    {s.label}
                  </th>
                  {HEMISPHERES.map((h) => (
                    <td key={h.value} className="py-2 pr-3">
                      <a
                        href={`/api/v1/series/${s.kind}.csv?hemisphere=${h.value}`}
                        download
                        className="font-semibold text-corona-700 underline underline-offset-2"
                      >
                        {h.label}
                      </a>
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      </div>
    </>
  );
}
