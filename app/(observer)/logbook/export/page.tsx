import type { Metadata } from "next";

import { PageHeader } from "@/components/layout/app-shell";
import { ButtonLink } from "@/components/ui/button";
import { requireObserver } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Export your Logbook" };

export default async function ExportLogbookPage() {
  const { user, observer } = await requireObserver();
  return (
    <>
      <PageHeader
        title="Export your Logbook"
        lead={`Everything you have logged as observer ${observer.code}, whatever its review status, oldest first.`}
        actions={
          user.role === "observer" ? (
            <ButtonLink href="/logbook/import" variant="secondary">
              Import a logbook
            </ButtonLink>
          ) : undefined
        }
      />
      <div className="grid gap-6 md:grid-cols-2">
        <section className="flex flex-col gap-3 rounded-lg border border-ink-100 bg-white p-5 shadow-sm">
          <h2 className="text-base font-semibold text-ink-900">Spreadsheet (CSV)</h2>
          <p className="text-sm text-ink-600">
            One line per count: time (UT), day, instrument, seeing, g, s, the hemisphere counts, k, the
            relative number, status and notes. It opens in any spreadsheet and imports straight back into
            Heliotally.
          </p>
          <div>
            <ButtonLink href="/api/v1/exports/logbook?format=csv" prefetch={false} download>
              Download CSV
            </ButtonLink>
          </div>
        </section>
        <section className="flex flex-col gap-3 rounded-lg border border-ink-100 bg-white p-5 shadow-sm">
          <h2 className="text-base font-semibold text-ink-900">Complete record (JSON)</h2>
          <p className="text-sm text-ink-600">
            The same counts with your instruments and, for counts drawn on the Disk tracer, every group: its
            number, spots, Zurich and McIntosh classes, heliographic latitude, central meridian distance,
            Carrington longitude and area.
          </p>
          <div>
            <ButtonLink
              href="/api/v1/exports/logbook?format=json"
              prefetch={false}
              download
              variant="secondary"
            >
              Download JSON
            </ButtonLink>
          </div>
        </section>
      </div>
    </>
  );
}
