import type { Metadata } from "next";

import { PageHeader } from "@/components/layout/app-shell";
import { ButtonLink } from "@/components/ui/button";
import { getCurrentKs } from "@/db/queries/observers";
import { requireObserver } from "@/lib/auth/session";

import { OpenSessionBanner } from "@/app/(observer)/class/_components/open-session-banner";
import { InboxPanel } from "./_components/inbox-panel";
import { LogbookTable } from "./_components/logbook-table";

export const metadata: Metadata = { title: "Logbook" };

export default async function LogbookPage() {
  const { user, observer } = await requireObserver();
  const kFor = await getCurrentKs({ observerId: observer.id });
  const current = kFor("");
  return (
    <>
      <PageHeader
        title={user.role === "student" ? "My counts" : "Logbook"}
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
      {user.role === "student" ? <OpenSessionBanner userId={user.id} observerId={observer.id} /> : null}
      <InboxPanel userId={user.id} />
      <LogbookTable timeZone={observer.timeZone} />
    </>
  );
}
