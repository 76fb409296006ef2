import "server-only";

import { iterateDecisionLog } from "@/db/queries/review";
import type { DecisionLogQueryInput } from "@/lib/validation/review";

import { formatCsvLine } from "./csv";
import { toStream } from "./observations";

const COLUMNS = [
  "decided_at_ut",
  "decision",
  "from_status",
  "to_status",
  "decided_by",
  "decided_by_role",
  "count_ut_date",
  "observer_code",
  "observer_name",
  "why",
  "status_now",
  "observation_id",
];
// Free text from people: kept from ever being read as a spreadsheet formula.
const TEXT_COLUMNS = new Set([4, 8, 9]);

/** The Decision log's matching lines as CSV, streamed a batch at a time. */
export function streamDecisionLogCsv(query: DecisionLogQueryInput): ReadableStream<Uint8Array> {
  const lines = (async function* () {
    yield formatCsvLine(COLUMNS);
    for await (const batch of iterateDecisionLog(query)) {
      let chunk = "";
      for (const d of batch) {
        chunk += formatCsvLine(
          [
            d.decidedAt,
            d.action,
            d.fromStatus,
            d.toStatus,
            d.actorName,
            d.actorRole,
            d.utDate,
            d.observerCode,
            d.observerName,
            d.note,
            d.currentStatus,
            d.observationId,
          ],
          TEXT_COLUMNS,
        );
      }
      yield chunk;
    }
  })();
  return toStream(lines);
}
