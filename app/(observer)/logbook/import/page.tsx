import type { Metadata } from "next";
import Link from "next/link";

import { ImportHistory } from "@/components/import/import-history";
import { ImportWizard } from "@/components/import/import-wizard";
import { PageHeader } from "@/components/layout/app-shell";
import { ButtonLink } from "@/components/ui/button";
import { listImportBatches, listImportInstruments } from "@/db/queries/imports";
import { getCurrentKs, getObserverByUserId } from "@/db/queries/observers";
import { requirePageRole } from "@/lib/auth/page-guard";
import { MAX_IMPORT_BYTES } from "@/lib/validation/import";

export const metadata: Metadata = { title: "Import a logbook" };
export const dynamic = "force-dynamic";

export default async function ImportLogbookPage() {
  // Students' counts come through their classroom; importing is for observers.
  const user = await requirePageRole(["observer"]);
  const observer = await getObserverByUserId({ userId: user.id });
  if (!observer) {
    return (
      <p className="text-sm text-ink-600">
        Your account has no observer profile, so it has no Logbook to import into.
      </p>
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
        title="Import a logbook"
        lead="Bring in years of counts from a spreadsheet saved as CSV. Nothing is stored until the whole file reads cleanly, and importing the same file again adds nothing twice."
        actions={
          <ButtonLink href="/logbook/export" variant="secondary">
            Export your Logbook
          </ButtonLink>
        }
      />
      {instruments.length === 0 ? (
        <p className="rounded-lg border border-ink-100 bg-white p-6 text-sm text-ink-600">
          Every count belongs to an instrument.{" "}
          <Link href="/instruments" className="font-semibold text-corona-700 underline">
            Add the instrument you used
          </Link>{" "}
          first, then come back to import.
        </p>
      ) : (
        <div className="grid gap-8 xl:grid-cols-[1fr_18rem]">
          <ImportWizard
            instruments={instruments.map((i) => ({ id: i.id, name: i.name, k: kFor(i.id).k }))}
            defaultTimeZone={observer.timeZone}
            maxBytes={MAX_IMPORT_BYTES}
            logbookHref="/logbook"
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
