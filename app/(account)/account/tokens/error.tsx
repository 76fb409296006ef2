"use client";

import { Button } from "@/components/ui/button";

export default function TokensError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div className="flex flex-col items-start gap-3">
      <h1 className="text-xl font-semibold">Your API tokens could not be loaded</h1>
      <p className="text-sm text-ink-600">Your tokens still work as before. Try again in a moment.</p>
      <Button onClick={reset}>Try again</Button>
    </div>
  );
}
