import { formatUt } from "@/lib/format/time";

export type ImportBatchRow = {
  id: string;
  fileName: string;
  rowsImported: number;
  rowsSkipped: number;
  createdAt: Date;
  byName: string | null;
};

/** Earlier imports into one Logbook, newest first. */
export function ImportHistory({ batches }: { batches: ImportBatchRow[] }) {
  if (batches.length === 0) {
    return (
      <p className="text-sm text-ink-600">
        No imports yet. Imported counts appear in the Logbook marked as imported.
      </p>
    );
  }
  return (
    <ul className="flex flex-col gap-2 text-sm">
      {batches.map((b) => (
        <li key={b.id} className="rounded-md border border-ink-100 bg-white px-3 py-2">
          <span className="font-medium text-ink-900">{b.fileName}</span>
          <span className="block text-xs text-ink-600">
            {formatUt(b.createdAt)} · {b.rowsImported.toLocaleString("en-GB")} new
            {b.rowsSkipped > 0 ? `, ${b.rowsSkipped.toLocaleString("en-GB")} already there` : ""}
            {b.byName ? ` · by ${b.byName}` : ""}
          </span>
        </li>
      ))}
    </ul>
  );
}
