import type { Metadata } from "next";
import Link from "next/link";

import { ImportHistory } from "@/components/import/import-history";
import { ImportWizard } from "@/components/import/import-wizard";
import { PageHeader } from "@/components/layout/app-shell";
import { ButtonLink } from "@/components/ui/button";
import { getObserverById, listImportBatches, listImportInstruments } from "@/db/queries/imports";
import { getCurrentKs } from "@/db/queries/observers";
import { requireRole } from "@/lib/auth/session";
import { MAX_IMPORT_BYTES } from "@/lib/validation/import";

export const metadata: Metadata = { title: "Import for an observer" };
export const dynamic = "force-dynamic";

export default async function CoordinatorImportPage({
  searchParams,
}: {
  searchParams: Promise<{ observer?: string }>;
}) {
  await requireRole(["coordinator"]);
  const { observer: observerId } = await searchParams;
  const observer = observerId ? await getObserverById({ observerId: String(observerId).slice(0, 64) }) : null;
  if (!observer) {
    return (
      <>
        <PageHeader title="Import for an observer" />
        <p className="rounded-lg border border-ink-100 bg-white p-6 text-sm text-ink-600">
          That observer was not found.{" "}
          <Link href="/network-data" className="font-semibold text-corona-700 underline">
            Choose one from the list
          </Link>
          .
        </p>
      </>
    );
  }
  const [instruments, kFor, batches] = await Promise.all([
    listImportInstruments({ observerId: observer.id }),
    getCurrentKs({ observerId: observer.id }),
    listImportBatches({ observerId: observer.id, limit: 10 }),
  ]);
  return (
    <>
      <PageHeader
        title={`Import for ${observer.displayName}`}
        lead={`Observer ${observer.code}. The counts go into their Logbook, recorded as imported by you, and wait on the Review desk.`}
        actions={
          <ButtonLink
            href={`/api/v1/exports/logbook?format=csv&observerId=${observer.id}`}
            prefetch={false}
            download
            variant="secondary"
          >
            Their Logbook as CSV
          </ButtonLink>
        }
      />
      {instruments.length === 0 ? (
        <p className="rounded-lg border border-ink-100 bg-white p-6 text-sm text-ink-600">
          {observer.displayName} has no instruments yet. Every count belongs to an instrument: ask them to add
          the one they used.
        </p>
      ) : (
        <div className="grid gap-8 xl:grid-cols-[1fr_18rem]">
          <ImportWizard
            observerId={observer.id}
            instruments={instruments.map((i) => ({ id: i.id, name: i.name, k: kFor(i.id).k }))}
            defaultTimeZone={observer.timeZone}
            maxBytes={MAX_IMPORT_BYTES}
            logbookHref="/review"
          />
          <aside aria-labelledby="earlier-imports">
            <h2 id="earlier-imports" className="mb-2 text-sm font-semibold text-ink-900">
              Earlier imports
            </h2>
            <ImportHistory batches={batches} />
          </aside>
        </div>
      )}
    </>
  );
}
