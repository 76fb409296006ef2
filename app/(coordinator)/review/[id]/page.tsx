import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";

import { PageHeader } from "@/components/layout/app-shell";
import { AuditTrail } from "@/components/review/audit-trail";
import { StatusBadge } from "@/components/status-badge";
import { TracingSummary } from "@/components/tracer/tracing-summary";
import {
  findNextAwaitingReview,
  getObservationForReview,
  listDecisionsOfObservation,
  listObservationPhotos,
  listObserverRecentCounts,
} from "@/db/queries/review";
import { getTracingSummary } from "@/db/queries/tracings";
import { requireRole } from "@/lib/auth/session";
import { formatLocal, formatRelativeNumber, formatUt } from "@/lib/format/time";
import { FLAG_LABELS } from "@/lib/review/flag-labels";
import { listAvailableDecisions } from "@/lib/review/transitions";
import { SEEING_LABELS } from "@/lib/validation/observation";

import { DecisionForm } from "./_components/decision-form";

export const metadata: Metadata = { title: "Review an observation" };
export const dynamic = "force-dynamic";

const HISTORY_LIMIT = 15;

export default async function ReviewObservationPage({ params }: { params: Promise<{ id: string }> }) {
  await requireRole(["coordinator"]);
  const { id } = await params;
  const found = await getObservationForReview({ observationId: id });
  if (!found) notFound();
  const obs = found.observation;
  const [history, decisions, tracing, photos, nextId] = await Promise.all([
    listObserverRecentCounts({ observerId: obs.observerId, limit: HISTORY_LIMIT }),
    listDecisionsOfObservation({ observationId: obs.id }),
    getTracingSummary({ observationId: obs.id }),
    listObservationPhotos({ observationId: obs.id }),
    findNextAwaitingReview({ observationId: obs.id, receivedAt: obs.createdAt }),
  ]);
  const raw = 10 * obs.groups + obs.spots;
  const split = obs.northGroups !== null || obs.southGroups !== null;
  const rows: Array<[string, React.ReactNode]> = [
    [
      "Observed",
      `${formatUt(obs.observedAt)} · ${formatLocal(obs.observedAt, found.observerTimeZone)} observer's local time`,
    ],
    ["Received", formatUt(obs.createdAt)],
    ["Observer", `${found.observerName} (${found.observerCode})`],
    ["Instrument", `${found.instrumentName} · ${found.instrumentKind}`],
    ["Seeing", SEEING_LABELS[obs.seeing] ?? String(obs.seeing)],
    ["Groups (g)", obs.groups],
    ["Spots (s)", obs.spots],
    ["10g + s", raw],
    [
      "Hemispheres",
      split
        ? `North ${obs.northGroups ?? "?"} g / ${obs.northSpots ?? "?"} s · South ${obs.southGroups ?? "?"} g / ${obs.southSpots ?? "?"} s`
        : "Not split",
    ],
    ["Source", obs.source],
    ["Observer's notes", obs.notes ?? "—"],
  ];

  return (
    <>
      <PageHeader
        title={`Count of ${obs.utDate} by ${found.observerName}`}
        lead={
          <span className="flex flex-wrap gap-4">
            <Link href="/review" className="text-corona-700 underline">
              Back to the Review desk
            </Link>
            {nextId ? (
              <Link href={`/review/${nextId}`} className="text-corona-700 underline">
                Next waiting count →
              </Link>
            ) : null}
          </span>
        }
        actions={<StatusBadge status={obs.status} />}
      />
      <div className="grid gap-6 lg:grid-cols-[3fr_2fr]">
        <div className="flex flex-col gap-6">
          <section aria-labelledby="values" className="grid gap-4 md:grid-cols-[1fr_2fr]">
            <div className="rounded-lg bg-umbra p-5 text-corona-100">
              <h2 id="values" className="text-xs tracking-widest uppercase">
                Scaled value
              </h2>
              <p className="mt-2 text-4xl font-semibold text-corona-300" data-testid="scaled-value">
                {formatRelativeNumber(found.scaledValue)}
              </p>
              <p className="mt-1 text-sm">
                {found.k.toFixed(3)} × (10 × {obs.groups} + {obs.spots})
              </p>
              <p className="mt-4 text-xs tracking-widest uppercase">Day&apos;s network</p>
              <p className="mt-1 text-2xl font-semibold">
                {found.network ? formatRelativeNumber(found.network.median) : "—"}
              </p>
              <p className="text-xs">
                {found.network
                  ? `median of ${found.network.n} other ${found.network.n === 1 ? "count" : "counts"}, ${obs.utDate}`
                  : "no other counts that UT day yet"}
              </p>
            </div>
            <dl className="grid grid-cols-[9rem_1fr] gap-x-4 gap-y-1.5 rounded-lg border border-ink-100 bg-white p-5 text-sm">
              {rows.map(([label, value]) => (
                <div key={label} className="contents">
                  <dt className="text-ink-500">{label}</dt>
                  <dd className="text-ink-900">{value}</dd>
                </div>
              ))}
            </dl>
          </section>

          <section aria-labelledby="flags-heading" className="rounded-lg border border-ink-100 bg-white p-5">
            <h2 id="flags-heading" className="font-semibold text-ink-900">
              Automatic flags
            </h2>
            {found.flags.length === 0 ? (
              <p className="mt-2 text-sm text-ink-600">
                No automatic flags: the count agrees with the network and with this observer&apos;s history.
              </p>
            ) : (
              <ul className="mt-2 flex flex-col gap-2 text-sm">
                {found.flags.map((f) => (
                  <li key={f.reason} className="rounded-md border border-caution-200 bg-caution-50 px-3 py-2">
                    <span className="font-semibold text-caution-800">{FLAG_LABELS[f.reason]}.</span>{" "}
                    <span className="text-ink-800">{f.detail}</span>
                  </li>
                ))}
              </ul>
            )}
          </section>

          {tracing ? (
            // The drawing, its measured groups, and whether the logged counts agree with them.
            <TracingSummary
              observationId={obs.id}
              tracing={tracing}
              counts={obs}
              editable={false}
              spacing=""
            />
          ) : null}

          {photos.length > 0 ? (
            <section
              aria-labelledby="photos-heading"
              className="rounded-lg border border-ink-100 bg-white p-5"
            >
              <h2 id="photos-heading" className="font-semibold text-ink-900">
                Photos of the disk
              </h2>
              <div className="mt-3 grid gap-4 sm:grid-cols-2">
                {photos.map((photo) => (
                  <figure key={photo.id}>
                    {/* eslint-disable-next-line @next/next/no-img-element -- served by the upload host, sizes vary */}
                    <img
                      // Photos are private at the store: the app's route checks access and redirects to a signed link.
                      src={`/api/v1/photos/${photo.id}/image?variant=view`}
                      alt={`Photo of the projected disk: ${photo.name}`}
                      className="w-full rounded border border-ink-100"
                    />
                    <figcaption className="mt-1 text-xs text-ink-500">{photo.name}</figcaption>
                  </figure>
                ))}
              </div>
            </section>
          ) : null}

          <section
            aria-labelledby="history-heading"
            className="rounded-lg border border-ink-100 bg-white p-5"
          >
            <h2 id="history-heading" className="font-semibold text-ink-900">
              {found.observerName}&apos;s recent counts
            </h2>
            <div className="mt-2 overflow-x-auto">
              <table className="min-w-full text-sm">
                <caption className="sr-only">The observer&apos;s latest {HISTORY_LIMIT} counts</caption>
                <thead className="text-left text-xs text-ink-500">
                  <tr>
                    {["UT date", "Instrument", "g", "s", "k(10g + s)", "Status"].map((h) => (
                      <th key={h} scope="col" className="py-1 pr-3 font-semibold">
                        {h}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {history.map((h) => (
                    <tr
                      key={h.id}
                      className={`border-t border-ink-100 ${h.id === obs.id ? "bg-corona-50 font-semibold" : ""}`}
                    >
                      <td className="py-1 pr-3 whitespace-nowrap">
                        {h.id === obs.id ? (
                          h.utDate
                        ) : (
                          <Link href={`/review/${h.id}`} className="underline underline-offset-2">
                            {h.utDate}
                          </Link>
                        )}
                      </td>
                      <td className="max-w-48 truncate py-1 pr-3">{h.instrumentName}</td>
                      <td className="py-1 pr-3 tabular-nums">{h.groups}</td>
                      <td className="py-1 pr-3 tabular-nums">{h.spots}</td>
                      <td className="py-1 pr-3 tabular-nums">{formatRelativeNumber(h.scaledValue)}</td>
                      <td className="py-1 pr-3">
                        <StatusBadge status={h.status} />
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </section>
        </div>

        <div className="flex flex-col gap-6">
          <DecisionForm
            observationId={obs.id}
            available={listAvailableDecisions({ status: obs.status })}
            observerHasEmail={Boolean(found.observerEmail)}
            nextId={nextId}
          />
          <AuditTrail decisions={decisions} receivedAt={obs.createdAt} />
        </div>
      </div>
    </>
  );
}
