import type { Metadata } from "next";

import { PageHeader } from "@/components/layout/app-shell";
import { ButtonLink } from "@/components/ui/button";
import { requireRole } from "@/lib/auth/session";
import { getEnv } from "@/lib/env";

export const metadata: Metadata = { title: "Backups" };
export const dynamic = "force-dynamic";

export default async function BackupsPage() {
  await requireRole(["admin"]);
  const embedded = getEnv().DATABASE_URL.startsWith("file:");
  return (
    <>
      <PageHeader
        title="Backups"
        lead="A snapshot is a complete copy of the database at one moment: every account, Logbook, review decision and series."
      />
      <section className="flex max-w-2xl flex-col gap-3 rounded-lg border border-ink-100 bg-white p-5 shadow-sm">
        {embedded ? (
          <>
            <p className="text-sm text-ink-600">
              The copy is taken while Heliotally keeps running (people can go on logging counts) and is
              consistent: it shows the database exactly as it was when the copy began. It is a SQLite file; to
              restore, stop the app and put it in place of the database file.
            </p>
            <p className="text-sm font-medium text-caution-700">
              It holds password and token hashes and everyone&apos;s e-mail address. Keep it somewhere only
              admins can reach.
            </p>
            <div>
              <ButtonLink href="/api/v1/admin/snapshot" prefetch={false} download>
                Download a snapshot
              </ButtonLink>
            </div>
          </>
        ) : (
          <p className="text-sm text-ink-600">
            This installation uses a libSQL server, which keeps its own backups. Snapshots from here are only
            for the embedded database.
          </p>
        )}
      </section>
    </>
  );
}
