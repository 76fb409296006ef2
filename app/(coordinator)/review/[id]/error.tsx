"use client";

import Link from "next/link";

import { Button } from "@/components/ui/button";

export default function ReviewObservationError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div className="flex flex-col items-start gap-3">
      <h1 className="text-xl font-semibold">This observation could not be opened</h1>
      <p className="text-sm text-ink-600">Try again in a moment, or go back to the queue.</p>
      <div className="flex gap-3">
        <Button onClick={reset}>Try again</Button>
        <Link href="/review" className="self-center text-sm text-corona-700 underline">
          Back to the Review desk
        </Link>
      </div>
    </div>
  );
}
