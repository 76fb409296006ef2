import type { Metadata } from "next";

import { PageHeader } from "@/components/layout/app-shell";
import { ButtonLink } from "@/components/ui/button";
import { getCurrentKs, listInstrumentsByObserver } from "@/db/queries/observers";
import { requireObserver } from "@/lib/auth/session";

import { OpenSessionBanner } from "@/app/(observer)/class/_components/open-session-banner";
import { InboxPanel } from "./_components/inbox-panel";
import { LogbookTable } from "./_components/logbook-table";

export const metadata: Metadata = { title: "Logbook" };

export default async function LogbookPage() {
  const { user, observer } = await requireObserver();
  const [kFor, instruments] = await Promise.all([
    getCurrentKs({ observerId: observer.id }),
    listInstrumentsByObserver({ observerId: observer.id }),
  ]);
  // k is fitted per instrument: the lead names the one in use for each.
  const computed = instruments
    .map((instrument) => ({ name: instrument.name, current: kFor(instrument.id) }))
    .filter((entry) => entry.current.computed);
  return (
    <>
      <PageHeader
        title={user.role === "student" ? "My counts" : "Logbook"}
        lead={
          <>
            Every count you have logged, newest first. Observer code <strong>{observer.code}</strong>.{" "}
            {computed.length === 0
              ? "Your k is 1.0 until your coordinator computes one from your counts."
              : computed.length === 1
                ? `Your current k is ${computed[0]!.current.k.toFixed(3)}.`
                : `Your current k: ${computed.map((e) => `${e.current.k.toFixed(3)} (${e.name})`).join(", ")}.`}
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
