export default function Loading() {
  return <p className="animate-pulse text-sm text-ink-500">Opening network data…</p>;
}
