"use client";

import { Button } from "@/components/ui/button";

export default function ReviewDeskError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div className="flex flex-col items-start gap-3">
      <h1 className="text-xl font-semibold">The Review desk could not be opened</h1>
      <p className="text-sm text-ink-600">
        No decision was lost: every decision is saved as soon as it is taken. Try again in a moment.
      </p>
      <Button onClick={reset}>Try again</Button>
    </div>
  );
}
