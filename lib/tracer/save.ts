import "server-only";

import {
  findOwnTracing,
  RevisionConflict,
  saveTracing,
  toGroupFields,
  type ObservationCounts,
} from "@/db/queries/tracings";
import { assertSessionCountChangeable } from "@/lib/classrooms/session-edit";
import { AppError, issuesFromZod } from "@/lib/http/errors";
import { solarOrientation } from "@/lib/solar/ephemeris";
import { observationInputSchema } from "@/lib/validation/observation";
import {
  checkTracingDocument,
  MAX_TRACING_PNG_BYTES,
  type TracingCountsInput,
} from "@/lib/validation/tracing";

import { measureTracing, type TracingCounts } from "./measure";

const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

const notFound = () => new AppError("not_found", "No such observation in your Logbook.");

function decodePng(dataUrl: string | null | undefined): Buffer | null {
  if (!dataUrl) return null;
  const bytes = Buffer.from(dataUrl.slice(dataUrl.indexOf(",") + 1), "base64");
  if (bytes.byteLength > MAX_TRACING_PNG_BYTES) {
    throw new AppError(
      "payload_too_large",
      "The rendered picture is larger than 4 MB; zoom out or simplify the drawing.",
    );
  }
  if (bytes.byteLength < PNG_SIGNATURE.byteLength || !bytes.subarray(0, 8).equals(PNG_SIGNATURE)) {
    throw new AppError("invalid_input", "The rendered picture is not a PNG image.", {
      issues: [{ path: "png", message: "Send the drawing as a PNG data URL." }],
    });
  }
  return bytes;
}

function countsFromTracing(counts: TracingCounts): ObservationCounts {
  return { ...counts };
}

function sameCounts(a: ObservationCounts, b: ObservationCounts): boolean {
  return (
    a.groups === b.groups &&
    a.spots === b.spots &&
    a.northGroups === b.northGroups &&
    a.northSpots === b.northSpots &&
    a.southGroups === b.southGroups &&
    a.southSpots === b.southSpots
  );
}

/**
 * Checks and stores a tracing for the observer's own observation: the
 * document, its measured groups and the observation's counts, all or nothing.
 * Positions and counts are measured here from the vector data, never taken
 * from the client; the observer may still override the counts, which are
 * then checked by the observation's own schema.
 */
export async function saveObservationTracing({
  observerId,
  observationId,
  document: input,
  png: pngDataUrl,
  baseRevision,
  counts: countsInput,
}: {
  observerId: string;
  observationId: string;
  document: unknown;
  png?: string | null;
  baseRevision: number;
  counts?: TracingCountsInput;
}) {
  const own = await findOwnTracing({ observerId, observationId });
  if (!own) throw notFound();
  const { observation } = own;
  // A tracing carries the count's groups and may change its counts: a class
  // session's count is traced only while the session is open.
  await assertSessionCountChangeable({ observerId, observationId });

  const checked = checkTracingDocument(input);
  if (!checked.ok) {
    if (checked.tooLarge) throw new AppError("payload_too_large", checked.message);
    throw new AppError("invalid_input", checked.message, {
      issues: checked.issues.map((i) => ({ path: `document.${i.path}`, message: i.message })),
    });
  }
  const document = checked.document;

  const measurement = measureTracing({ document, orientation: solarOrientation(observation.observedAt) });
  if (measurement.problems.length > 0) {
    const [first] = measurement.problems;
    throw new AppError("invalid_input", `The tracing is not ready to save: ${first!.message}`, {
      issues: measurement.problems.map((p) => ({ path: `document.${p.path}`, message: p.message })),
    });
  }

  const fromTracing = countsFromTracing(measurement.counts);
  const counts: ObservationCounts = countsInput ?? fromTracing;
  // The observation's own schema decides whether the counts hang together
  // (spots ≥ groups, north + south = total), with the same messages as the form.
  const revised = observationInputSchema.safeParse({
    observedAt: observation.observedAt.toISOString(),
    seeing: observation.seeing,
    instrumentId: observation.instrumentId,
    notes: observation.notes ?? undefined,
    groups: counts.groups,
    spots: counts.spots,
    northGroups: counts.northGroups ?? undefined,
    northSpots: counts.northSpots ?? undefined,
    southGroups: counts.southGroups ?? undefined,
    southSpots: counts.southSpots ?? undefined,
  });
  if (!revised.success) {
    throw new AppError("invalid_input", "The counts need attention.", {
      issues: issuesFromZod(revised.error).map((i) => ({ path: `counts.${i.path}`, message: i.message })),
    });
  }

  const png = decodePng(pngDataUrl);
  const current: ObservationCounts = {
    groups: observation.groups,
    spots: observation.spots,
    northGroups: observation.northGroups,
    northSpots: observation.northSpots,
    southGroups: observation.southGroups,
    southSpots: observation.southSpots,
  };

  try {
    const { revision } = await saveTracing({
      observerId,
      observationId,
      document,
      png,
      baseRevision,
      groups: measurement.groups,
      counts,
      countsChanged: !sameCounts(current, counts),
    });
    return {
      observationId,
      revision,
      counts,
      tracingCounts: fromTracing,
      differsFromTracing: !sameCounts(counts, fromTracing),
      groups: measurement.groups.map(toGroupFields),
    };
  } catch (error) {
    if (error instanceof RevisionConflict) {
      throw new AppError(
        "conflict",
        `This tracing was saved from somewhere else since you opened it (it is now at revision ${error.currentRevision}). Reload the page to see that version.`,
      );
    }
    throw error;
  }
}
