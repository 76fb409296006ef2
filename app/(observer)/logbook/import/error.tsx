"use client";

import { Button } from "@/components/ui/button";

export default function ImportError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div className="flex flex-col items-start gap-3">
      <h1 className="text-xl font-semibold">The import page could not be opened</h1>
      <p className="text-sm text-ink-600">Nothing was imported. Try again in a moment.</p>
      <Button onClick={reset}>Try again</Button>
    </div>
  );
}
