"use client";

import { Button } from "@/components/ui/button";

export default function DiskTemplateError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div className="flex flex-col items-start gap-3">
      <h1 className="text-xl font-semibold">The disk template could not be drawn</h1>
      <p className="text-sm text-ink-600">Try again in a moment, or choose another date.</p>
      <Button onClick={reset}>Try again</Button>
    </div>
  );
}
