import type { FlagReason } from "@/db/schema";
import { FLAG_LABELS } from "@/lib/review/flag-labels";

/** Small chips naming each automatic flag; the detail shows on hover and to screen readers. */
export function FlagChips({ flags }: { flags: Array<{ reason: FlagReason; detail: string }> }) {
  if (flags.length === 0) return <span className="text-xs text-ink-400">—</span>;
  return (
    <ul className="flex flex-wrap gap-1" aria-label="Automatic flags">
      {flags.map((flag) => (
        <li
          key={flag.reason}
          title={flag.detail}
          className="rounded-full border border-caution-200 bg-caution-50 px-2 py-0.5 text-xs font-medium whitespace-nowrap text-caution-800"
        >
          {FLAG_LABELS[flag.reason]}
          <span className="sr-only">: {flag.detail}</span>
        </li>
      ))}
    </ul>
  );
}
