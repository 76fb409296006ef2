const STYLES = {
  submitted: { label: "Awaiting review", className: "bg-corona-100 text-corona-800" },
  accepted: { label: "In the series", className: "bg-meadow-50 text-meadow-700" },
  queried: { label: "Question from coordinator", className: "bg-ink-100 text-ink-800" },
  rejected: { label: "Not used", className: "bg-caution-50 text-caution-800" },
} as const;

export function StatusBadge({ status }: { status: keyof typeof STYLES }) {
  const style = STYLES[status];
  return (
    <span className={`rounded-full px-2 py-0.5 text-xs font-medium ${style.className}`}>{style.label}</span>
  );
}
