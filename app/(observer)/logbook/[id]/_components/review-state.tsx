import { AuditTrail } from "@/components/review/audit-trail";
import { markNotificationsReadByLink } from "@/db/queries/notifications";
import { listInstrumentsByObserver } from "@/db/queries/observers";
import { listDecisionsOfObservation } from "@/db/queries/review";
import type { ObservationView } from "@/db/queries/observations";
import { formatUt } from "@/lib/format/time";

import { ResubmitForm } from "./resubmit-form";

/**
 * What the coordinator decided about this count: the note of a query or a
 * rejection, the form to correct and send back a queried count, and the
 * review history. Opening the page marks its Logbook messages as read.
 */
export async function ReviewState({
  observation,
  observerId,
  userId,
}: {
  observation: ObservationView;
  observerId: string;
  userId: string;
}) {
  const [decisions] = await Promise.all([
    listDecisionsOfObservation({ observationId: observation.id }),
    markNotificationsReadByLink({ userId, link: `/logbook/${observation.id}` }),
  ]);
  // The decision that put the count in its present state, whose note the observer needs.
  const latest = [...decisions].reverse().find((d) => d.toStatus === observation.status);
  const instruments = observation.status === "queried" ? await listInstrumentsByObserver({ observerId }) : [];

  return (
    <div className="mt-6 grid gap-6 md:grid-cols-[2fr_1fr]">
      <div className="flex flex-col gap-4">
        {observation.status === "queried" ? (
          <section
            aria-labelledby="query-heading"
            className="rounded-lg border-2 border-corona-300 bg-corona-50 p-5"
          >
            <h2 id="query-heading" className="font-semibold text-ink-950">
              Your coordinator has a question
            </h2>
            {latest ? (
              <>
                <blockquote
                  className="mt-2 border-l-4 border-corona-400 pl-3 whitespace-pre-line text-ink-900"
                  data-testid="coordinator-note"
                >
                  {latest.note}
                </blockquote>
                <p className="mt-1 text-xs text-ink-500">{formatUt(latest.createdAt)}</p>
              </>
            ) : null}
            <p className="mt-3 text-sm text-ink-700">
              Correct the count if something was wrong, or send it back as it is with a note saying why it
              stands. It returns to the Review desk either way.
            </p>
            <div className="mt-4 rounded-lg border border-ink-100 bg-white p-4">
              <h3 className="mb-3 text-sm font-semibold text-ink-900">Edit and send back</h3>
              {instruments.length === 0 ? (
                <p className="text-sm text-ink-600">
                  You have no active instrument to log this count against. Ask your coordinator to add one.
                </p>
              ) : (
                <ResubmitForm
                  observationId={observation.id}
                  instruments={instruments}
                  initial={{
                    observedAt: new Date(observation.observedAt).toISOString(),
                    instrumentId: observation.instrumentId,
                    seeing: observation.seeing,
                    groups: observation.groups,
                    spots: observation.spots,
                    northGroups: observation.northGroups,
                    northSpots: observation.northSpots,
                    southGroups: observation.southGroups,
                    southSpots: observation.southSpots,
                    notes: observation.notes,
                  }}
                />
              )}
            </div>
          </section>
        ) : null}
        {observation.status === "rejected" ? (
          <section
            aria-labelledby="rejected-heading"
            className="rounded-lg border border-caution-200 bg-caution-50 p-5"
          >
            <h2 id="rejected-heading" className="font-semibold text-caution-800">
              Not used in the network series
            </h2>
            {latest?.note ? (
              <blockquote
                className="mt-2 border-l-4 border-caution-200 pl-3 whitespace-pre-line text-ink-900"
                data-testid="coordinator-note"
              >
                {latest.note}
              </blockquote>
            ) : null}
            <p className="mt-3 text-sm text-ink-700">
              The count stays in your Logbook. If you think it should count, reply to your coordinator; they
              can reopen it.
            </p>
          </section>
        ) : null}
        {observation.status === "submitted" && latest?.action === "resubmitted" ? (
          <p
            role="status"
            className="rounded-md border border-meadow-200 bg-meadow-50 px-4 py-3 text-sm text-meadow-700"
          >
            Sent back: the count is on the Review desk again.
          </p>
        ) : null}
      </div>
      {decisions.length > 0 ? (
        <AuditTrail decisions={decisions} receivedAt={new Date(observation.createdAt)} viewer="observer" />
      ) : null}
    </div>
  );
}
