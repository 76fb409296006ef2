import type { Metadata } from "next";

import { PageHeader } from "@/components/layout/app-shell";
import { listRecentSubmissions } from "@/db/queries/observations";
import { requireRole } from "@/lib/auth/session";
import { formatUt } from "@/lib/format/time";

import { StatusBadge } from "@/components/status-badge";

export const metadata: Metadata = { title: "Review desk" };
export const dynamic = "force-dynamic";

export default async function ReviewDeskPage() {
  await requireRole(["coordinator"]);
  const rows = await listRecentSubmissions({ limit: 50 });
  return (
    <>
      <PageHeader title="Review desk" lead="The newest submissions from every observer in the network, newest first." />
      {rows.length === 0 ? (
        <p className="rounded-lg border border-ink-100 bg-white p-6 text-sm text-ink-600">
          No submissions yet. They appear here as soon as observers log their counts.
        </p>
      ) : (
        <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white shadow-sm">
          <table className="min-w-full text-sm">
            <caption className="sr-only">Newest submissions</caption>
            <thead className="bg-ink-50 text-left text-xs tracking-wide text-ink-600 uppercase">
              <tr>
                {["Received", "Observer", "Observed (UT)", "Instrument", "g", "s", "10g + s", "Seeing", "Status"].map((h) => (
                  <th key={h} scope="col" className="px-3 py-2 font-semibold">
                    {h}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id} className="border-t border-ink-100">
                  <td className="px-3 py-2 whitespace-nowrap">{formatUt(r.createdAt)}</td>
                  <td className="px-3 py-2 whitespace-nowrap">
                    {r.observerName} <span className="text-xs text-ink-500">{r.observerCode}</span>
                  </td>
                  <td className="px-3 py-2 whitespace-nowrap">{formatUt(r.observedAt)}</td>
                  <td className="px-3 py-2">{r.instrumentName}</td>
                  <td className="px-3 py-2 tabular-nums">{r.groups}</td>
                  <td className="px-3 py-2 tabular-nums">{r.spots}</td>
                  <td className="px-3 py-2 font-semibold tabular-nums">{10 * r.groups + r.spots}</td>
                  <td className="px-3 py-2 tabular-nums">{r.seeing}</td>
                  <td className="px-3 py-2">
                    <StatusBadge status={r.status} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </>
  );
}
