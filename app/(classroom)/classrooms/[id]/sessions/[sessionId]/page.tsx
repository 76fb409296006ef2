import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";

import { SessionComparisonView } from "@/components/classrooms/session-comparison";
import { SessionStateBadge } from "@/components/classrooms/session-state-badge";
import { PageHeader } from "@/components/layout/app-shell";
import { SafetyNotice } from "@/components/safety-notice";
import { requirePageRole } from "@/lib/auth/page-guard";
import { formatSessionWindow } from "@/lib/classrooms/session-state";
import { loadSessionComparison } from "@/lib/classrooms/views";
import { describeSafetyEmphasis, INSTRUMENT_KIND_LABELS } from "@/lib/instruments/fields";

export const metadata: Metadata = { title: "Session comparison" };
export const dynamic = "force-dynamic";

export default async function SessionPage({
  params,
}: {
  params: Promise<{ id: string; sessionId: string }>;
}) {
  const { id, sessionId } = await params;
  const user = await requirePageRole(["educator"]);
  const view = await loadSessionComparison({ sessionId, viewer: { role: "educator", userId: user.id } });
  if (!view || view.classroom.id !== id) notFound();
  const { session, comparison } = view;
  return (
    <>
      <PageHeader
        title={session.title}
        lead={
          <>
            <Link href={`/classrooms/${id}`} className="text-corona-700 underline">
              {view.classroom.name}
            </Link>{" "}
            · {formatSessionWindow(session)} · {session.instrumentName} (
            {INSTRUMENT_KIND_LABELS[session.instrumentKind].toLowerCase()})
          </>
        }
        actions={<SessionStateBadge state={view.state} />}
      />
      <div className="grid gap-6 lg:grid-cols-[3fr_1fr]">
        <section
          aria-labelledby="comparison-heading"
          className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
        >
          <h2 id="comparison-heading" className="mb-4 text-lg font-semibold text-ink-950">
            The class side by side
          </h2>
          {comparison ? <SessionComparisonView comparison={comparison} network={view.network} /> : null}
        </section>
        <div className="self-start">
          <SafetyNotice classroom emphasis={describeSafetyEmphasis({ kind: session.instrumentKind })} />
        </div>
      </div>
    </>
  );
}
