import type { UploadState } from "./use-import-upload";

const LABELS = {
  uploading: "Sending the file",
  reading: "Reading and checking rows",
  checking: "Looking for repeated days",
  storing: "Storing",
  flagging: "Marking counts for the Review desk",
} as const;

/** Sending counts for the first fifth of the bar; the server's reading for most of the rest. */
function overall(state: Extract<UploadState, { fraction: number }>): number {
  switch (state.phase) {
    case "uploading":
      return 0.2 * state.fraction;
    case "reading":
      return 0.2 + 0.7 * state.fraction;
    case "checking":
      return 0.92;
    case "storing":
      return 0.95;
    case "flagging":
      return 0.98;
  }
}

export function ImportProgress({ state }: { state: Extract<UploadState, { fraction: number }> }) {
  const percent = Math.round(overall(state) * 100);
  return (
    <div className="flex flex-col gap-2" aria-live="polite">
      <div className="flex justify-between text-sm text-ink-700">
        <span>
          {LABELS[state.phase]}
          {"rowsRead" in state && state.rowsRead > 0
            ? ` · ${state.rowsRead.toLocaleString("en-GB")} rows`
            : ""}
          …
        </span>
        <span className="tabular-nums">{percent}%</span>
      </div>
      <div
        role="progressbar"
        aria-label="Import progress"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={percent}
        className="h-3 w-full overflow-hidden rounded-full bg-ink-100"
      >
        <div
          className="h-full rounded-full bg-corona-500 transition-[width] duration-200"
          style={{ width: `${percent}%` }}
        />
      </div>
    </div>
  );
}
