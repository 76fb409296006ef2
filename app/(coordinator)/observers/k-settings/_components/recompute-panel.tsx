"use client";

import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";

import { Button } from "@/components/ui/button";
import type { JobView } from "@/db/queries/jobs";
import { formatUt } from "@/lib/format/time";

const POLL_MS = 500;

/** Starts a full recompute and follows its progress until it is done. */
export function RecomputePanel({
  latestJob,
  storedK,
}: {
  latestJob: JobView | null;
  /** The k coefficients in use, for when no recompute has been started here (the demo fits them at set-up). */
  storedK: { count: number; fittedAt: string | null };
}) {
  const router = useRouter();
  const [job, setJob] = useState<JobView | null>(latestJob);
  const [error, setError] = useState<string | null>(null);
  const [starting, setStarting] = useState(false);
  const active = job !== null && (job.status === "queued" || job.status === "running");

  const jobId = job?.id ?? null;

  useEffect(() => {
    if (!active || !jobId) return;
    let stopped = false;
    const timer = setInterval(async () => {
      try {
        const res = await fetch(`/api/v1/jobs/${jobId}`, { cache: "no-store" });
        const body = await res.json();
        if (!res.ok) throw new Error(body?.error?.message ?? "The recompute's progress could not be read.");
        if (stopped) return;
        setJob(body.job as JobView);
        if (body.job.status === "done" || body.job.status === "failed") router.refresh();
      } catch (e) {
        if (!stopped) setError((e as Error).message);
      }
    }, POLL_MS);
    return () => {
      stopped = true;
      clearInterval(timer);
    };
  }, [active, jobId, router]);

  async function start() {
    setStarting(true);
    setError(null);
    try {
      const res = await fetch("/api/v1/series/recompute", { method: "POST" });
      const body = await res.json();
      if (!res.ok) throw new Error(body?.error?.message ?? "The recompute could not be started.");
      setJob(body.job as JobView);
    } catch (e) {
      setError((e as Error).message);
    } finally {
      setStarting(false);
    }
  }

  const percent = job ? Math.round(job.progress * 100) : 0;
  return (
    <section
      aria-labelledby="recompute-heading"
      className="flex flex-col gap-3 rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
    >
      <h2 id="recompute-heading" className="text-lg font-semibold text-ink-900">
        Full recompute
      </h2>
      <p className="text-sm text-ink-600">
        Fits every observer&apos;s k for every period with the settings below, then rebuilds the daily,
        monthly, smoothed and yearly series. The Archive keeps showing the current series until the new one is
        complete.
      </p>
      <div>
        <Button type="button" onClick={start} disabled={starting || active}>
          {active ? "Recompute running…" : "Recompute every k and the series"}
        </Button>
      </div>
      {job ? (
        <div className="flex flex-col gap-1" aria-live="polite">
          <div className="flex justify-between text-sm">
            <span className="font-medium text-ink-800">
              {job.status === "queued"
                ? "Waiting to start"
                : job.status === "running"
                  ? "Running"
                  : job.status === "done"
                    ? "Done"
                    : "Failed"}
            </span>
            <span className="text-ink-600 tabular-nums">{percent} %</span>
          </div>
          <div
            role="progressbar"
            aria-label="Recompute progress"
            aria-valuemin={0}
            aria-valuemax={100}
            aria-valuenow={percent}
            className="h-2.5 overflow-hidden rounded-full bg-ink-100"
          >
            <div
              className={`h-full rounded-full transition-[width] ${job.status === "failed" ? "bg-caution-700" : job.status === "done" ? "bg-meadow-700" : "bg-corona-500"}`}
              style={{ width: `${percent}%` }}
            />
          </div>
          {job.message ? (
            <p
              className={`text-sm ${job.status === "failed" ? "text-caution-700" : "text-ink-600"}`}
              data-testid="recompute-message"
            >
              {job.message}
            </p>
          ) : null}
          <p className="text-xs text-ink-500">
            Started {formatUt(job.startedAt ?? job.createdAt)}
            {job.finishedAt ? `, finished ${job.finishedAt.slice(11, 19)} UT` : ""}
          </p>
        </div>
      ) : (
        <p className="text-sm text-ink-500" data-testid="stored-k">
          {storedK.fittedAt
            ? `No recompute has been started here yet. The ${storedK.count} k coefficients in use were fitted on ${formatUt(storedK.fittedAt)}.`
            : "No k has been fitted yet. Recompute once counts have been accepted."}
        </p>
      )}
      {error ? (
        <p role="alert" className="text-sm font-medium text-caution-700">
          {error}
        </p>
      ) : null}
    </section>
  );
}
