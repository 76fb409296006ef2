export default function Loading() {
  return <p className="animate-pulse text-sm text-ink-500">Drawing the disk template…</p>;
}
