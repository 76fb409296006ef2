import Link from "next/link";

export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-screen max-w-lg flex-col items-center justify-center gap-3 px-4 text-center">
      <p className="text-sm font-semibold tracking-widest text-corona-700">404</p>
      <h1 className="text-2xl font-semibold text-ink-950">Nothing here</h1>
      <p className="text-ink-600">The page may have moved, or it belongs to someone else.</p>
      <Link href="/" className="font-semibold text-corona-700 underline">
        Back to the start
      </Link>
    </main>
  );
}
