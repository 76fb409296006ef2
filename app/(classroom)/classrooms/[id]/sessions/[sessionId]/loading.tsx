export default function Loading() {
  return <p className="animate-pulse text-sm text-ink-500">Putting the class&apos;s counts side by side…</p>;
}
