import { FIELD_LABELS } from "@/lib/import/columns";

import type { ImportFailure } from "./use-import-upload";

/** Every bad line with its number, column, value and reason; nothing was stored. */
export function ImportReport({ failure }: { failure: ImportFailure }) {
  const shown = failure.problems.length;
  return (
    <div className="flex flex-col gap-3" data-testid="import-report">
      <div
        role="alert"
        className="rounded-md border border-caution-200 bg-caution-50 px-4 py-3 text-sm text-caution-800"
      >
        <p className="font-semibold">{failure.message}</p>
        {failure.issues.length > 0 ? (
          <ul className="mt-2 list-disc pl-5">
            {failure.issues.map((issue) => (
              <li key={`${issue.path}:${issue.message}`}>{issue.message}</li>
            ))}
          </ul>
        ) : null}
      </div>
      {shown > 0 ? (
        <>
          {failure.problemCount > shown ? (
            <p className="text-sm text-ink-600">
              Showing the first {shown.toLocaleString("en-GB")} of{" "}
              {failure.problemCount.toLocaleString("en-GB")} problems.
            </p>
          ) : null}
          <div className="max-h-[28rem] overflow-auto rounded-lg border border-ink-100 bg-white shadow-sm">
            <table className="min-w-full text-sm">
              <caption className="sr-only">Lines that need attention</caption>
              <thead className="sticky top-0 bg-ink-50 text-left text-xs tracking-wide text-ink-600 uppercase">
                <tr>
                  {["Line", "Column", "Value", "Reason"].map((h) => (
                    <th key={h} scope="col" className="px-3 py-2 font-semibold">
                      {h}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {failure.problems.map((p, i) => (
                  <tr key={`${p.line}-${i}`} className="border-t border-ink-100 align-top">
                    <td className="px-3 py-2 font-semibold tabular-nums">{p.line}</td>
                    <td className="px-3 py-2 whitespace-nowrap">{p.field ? FIELD_LABELS[p.field] : "—"}</td>
                    <td className="px-3 py-2 font-mono">{p.value ? p.value : "—"}</td>
                    <td className="px-3 py-2">{p.reason}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </>
      ) : null}
    </div>
  );
}
