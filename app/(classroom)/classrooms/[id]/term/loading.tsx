export default function Loading() {
  return (
    <p className="animate-pulse text-sm text-ink-500">Working out each student&apos;s k for the term…</p>
  );
}
