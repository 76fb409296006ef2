import type { Metadata } from "next";

import { PageHeader } from "@/components/layout/app-shell";
import { ButtonLink } from "@/components/ui/button";
import { getCurrentKs } from "@/db/queries/observers";
import { requireObserver } from "@/lib/auth/session";

import { LogbookTable } from "./_components/logbook-table";

export const metadata: Metadata = { title: "Logbook" };

export default async function LogbookPage() {
  const { observer } = await requireObserver();
  const kFor = await getCurrentKs({ observerId: observer.id });
  const current = kFor("");
  return (
    <>
      <PageHeader
        title="Logbook"
        lead={
          <>
            Every count you have logged, newest first. Observer code <strong>{observer.code}</strong>.{" "}
            {current.computed
              ? `Your current k is ${current.k.toFixed(3)}.`
              : "Your k is 1.0 until your coordinator computes one from your counts."}
          </>
        }
        actions={<ButtonLink href="/logbook/new">Log a count</ButtonLink>}
      />
      <LogbookTable timeZone={observer.timeZone} />
    </>
  );
}
