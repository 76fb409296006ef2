import "server-only";

import {
  iterateObservationsForExport,
  type ExportObservationRow,
  listGroupsForObservations,
  listInstrumentsForExport,
  listObserversForExport,
} from "@/db/queries/exports";
import { getCurrentKs } from "@/db/queries/observers";
import { computeRelativeNumber } from "@/lib/counts/relative-number";

import { formatCsvLine } from "./csv";

/**
 * Our logbook file layout. The column names are ones the import recognises,
 * so an exported Logbook reads straight back in (k, R, status and source
 * are computed by Heliotally and ignored on the way in).
 */
const LOGBOOK_COLUMNS = [
  "observed_at_ut",
  "ut_date",
  "instrument",
  "seeing",
  "g",
  "s",
  "g_north",
  "s_north",
  "g_south",
  "s_south",
  "k",
  "relative_number",
  "status",
  "source",
  "notes",
  "id",
];
const NETWORK_COLUMNS = ["observer_code", "observer_name", ...LOGBOOK_COLUMNS];

type Row = ExportObservationRow;

/** Current k per observer, loaded once per observer while an export streams. */
function makeKLookup() {
  const cache = new Map<string, Awaited<ReturnType<typeof getCurrentKs>>>();
  return async (row: Row) => {
    let kFor = cache.get(row.observerId);
    if (!kFor) {
      kFor = await getCurrentKs({ observerId: row.observerId });
      cache.set(row.observerId, kFor);
    }
    const { k } = kFor(row.instrumentId);
    return { k, relativeNumber: computeRelativeNumber({ k, groups: row.groups, spots: row.spots }) };
  };
}

const round = (value: number, places: number) => Math.round(value * 10 ** places) / 10 ** places;

/** Text chunks as a byte stream that stops reading when the client goes away. */
export function toStream(chunks: AsyncGenerator<string>): ReadableStream<Uint8Array> {
  const encoder = new TextEncoder();
  return new ReadableStream<Uint8Array>({
    async pull(controller) {
      try {
        const { value, done } = await chunks.next();
        if (done) controller.close();
        else controller.enqueue(encoder.encode(value));
      } catch (error) {
        controller.error(error);
      }
    },
    async cancel() {
      await chunks.return(undefined);
    },
  });
}

/** A Logbook (one observer) or the whole network archive, as CSV. */
export function streamObservationsCsv({ observerId }: { observerId?: string }): ReadableStream<Uint8Array> {
  const network = observerId === undefined;
  const textColumns = new Set(network ? [1, 4, 16] : [2, 14]);
  async function* lines() {
    yield formatCsvLine(network ? NETWORK_COLUMNS : LOGBOOK_COLUMNS);
    const kOf = makeKLookup();
    for await (const page of iterateObservationsForExport({ observerId })) {
      let chunk = "";
      for (const r of page) {
        const { k, relativeNumber } = await kOf(r);
        const values = [
          r.observedAt,
          r.utDate,
          r.instrumentName,
          r.seeing,
          r.groups,
          r.spots,
          r.northGroups,
          r.northSpots,
          r.southGroups,
          r.southSpots,
          round(k, 4),
          round(relativeNumber, 2),
          r.status,
          r.source,
          r.notes,
          r.id,
        ];
        chunk += formatCsvLine(network ? [r.observerCode, r.observerName, ...values] : values, textColumns);
      }
      yield chunk;
    }
  }
  return toStream(lines());
}

/**
 * The same as JSON, with each observation's disk-tracer groups (number,
 * spots, classes, heliographic position, area) nested inside it.
 */
export function streamObservationsJson({
  observerId,
  observer,
}: {
  observerId?: string;
  observer?: { code: string; displayName: string; timeZone: string };
}): ReadableStream<Uint8Array> {
  async function* parts() {
    const header = {
      format: observerId ? "heliotally.logbook" : "heliotally.network-archive",
      version: 1,
      exportedAt: new Date().toISOString(),
      ...(observer ? { observer } : { observers: await listObserversForExport() }),
      instruments: await listInstrumentsForExport({ observerId }),
    };
    const opening = JSON.stringify(header);
    yield `${opening.slice(0, -1)},"observations":[`;
    const kOf = makeKLookup();
    let first = true;
    for await (const page of iterateObservationsForExport({ observerId })) {
      const groups = await listGroupsForObservations({ observationIds: page.map((r) => r.id) });
      let chunk = "";
      for (const r of page) {
        const { k, relativeNumber } = await kOf(r);
        const item = {
          id: r.id,
          ...(observerId ? {} : { observerCode: r.observerCode }),
          observedAt: r.observedAt.toISOString(),
          utDate: r.utDate,
          instrumentId: r.instrumentId,
          instrumentName: r.instrumentName,
          seeing: r.seeing,
          groups: r.groups,
          spots: r.spots,
          northGroups: r.northGroups,
          northSpots: r.northSpots,
          southGroups: r.southGroups,
          southSpots: r.southSpots,
          k,
          relativeNumber,
          status: r.status,
          source: r.source,
          notes: r.notes,
          sunspotGroups: (groups.get(r.id) ?? []).map((g) => ({
            number: g.number,
            spots: g.spots,
            zurichClass: g.zurichClass,
            mcintoshClass: g.mcintoshClass,
            hemisphere: g.hemisphere,
            latitudeDeg: g.latitudeDeg,
            cmdDeg: g.cmdDeg,
            carringtonLonDeg: g.carringtonLonDeg,
            areaMsh: g.areaMsh,
          })),
        };
        chunk += `${first ? "" : ","}${JSON.stringify(item)}`;
        first = false;
      }
      yield chunk;
    }
    yield "]}";
  }
  return toStream(parts());
}

export function attachmentHeaders({ fileName, type }: { fileName: string; type: string }): HeadersInit {
  return {
    "content-type": type,
    "content-disposition": `attachment; filename="${fileName}"`,
    "cache-control": "no-store",
  };
}
