"use client";

import { Button } from "@/components/ui/button";

export default function MyClassError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div className="flex flex-col items-start gap-3">
      <h1 className="text-xl font-semibold">Your class page could not be opened</h1>
      <p className="text-sm text-ink-600">Your counts are safe. Try again in a moment.</p>
      <Button onClick={reset}>Try again</Button>
    </div>
  );
}
