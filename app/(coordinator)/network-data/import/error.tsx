"use client";

import { Button } from "@/components/ui/button";

export default function NetworkDataError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div className="flex flex-col items-start gap-3">
      <h1 className="text-xl font-semibold">This page could not be opened</h1>
      <p className="text-sm text-ink-600">Nothing was changed. Try again in a moment.</p>
      <Button onClick={reset}>Try again</Button>
    </div>
  );
}
