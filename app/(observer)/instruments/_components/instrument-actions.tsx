"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";

import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";

/** Archive, restore and (for an unused instrument) delete, through the JSON API. */
export function InstrumentActions({
  instrumentId,
  archived,
  observationCount,
}: {
  instrumentId: string;
  archived: boolean;
  observationCount: number;
}) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [confirmDelete, setConfirmDelete] = useState(false);
  const [message, setMessage] = useState<string | null>(null);

  async function call(method: "POST" | "DELETE", path: string, after: () => void) {
    setBusy(true);
    setMessage(null);
    try {
      const res = await fetch(path, { method });
      if (!res.ok) {
        const body = await res.json().catch(() => null);
        setMessage(body?.error?.message ?? "That did not work; nothing was changed.");
        return;
      }
      after();
    } catch {
      setMessage("No connection to Heliotally; nothing was changed. Try again.");
    } finally {
      setBusy(false);
    }
  }

  return (
    <section className="flex flex-col gap-3 rounded-lg border border-ink-100 bg-white p-5">
      <h2 className="text-sm font-semibold tracking-wide text-ink-600 uppercase">
        {archived ? "Bring it back" : "Retire this instrument"}
      </h2>
      {message ? <FormMessage tone="error">{message}</FormMessage> : null}
      {archived ? (
        <div>
          <Button
            variant="secondary"
            disabled={busy}
            onClick={() =>
              call("DELETE", `/api/v1/instruments/${instrumentId}/archive`, () => router.refresh())
            }
          >
            Restore to use
          </Button>
        </div>
      ) : (
        <div className="flex flex-col gap-1">
          <div>
            <Button
              variant="secondary"
              disabled={busy}
              onClick={() =>
                call("POST", `/api/v1/instruments/${instrumentId}/archive`, () => router.refresh())
              }
            >
              Archive
            </Button>
          </div>
          <p className="text-xs text-ink-500">
            Archiving hides it when you log a count; it stays on the observations made with it.
          </p>
        </div>
      )}
      {observationCount === 0 ? (
        <div className="flex flex-wrap items-center gap-2">
          {confirmDelete ? (
            <>
              <Button
                variant="danger"
                disabled={busy}
                onClick={() =>
                  call("DELETE", `/api/v1/instruments/${instrumentId}`, () => {
                    router.push("/instruments");
                    router.refresh();
                  })
                }
              >
                Delete for good
              </Button>
              <Button variant="quiet" disabled={busy} onClick={() => setConfirmDelete(false)}>
                Keep it
              </Button>
            </>
          ) : (
            <Button variant="quiet" disabled={busy} onClick={() => setConfirmDelete(true)}>
              Delete…
            </Button>
          )}
          <span className="text-xs text-ink-500">No observation uses it, so it can be deleted.</span>
        </div>
      ) : (
        <p className="text-xs text-ink-500">
          It cannot be deleted: {observationCount}{" "}
          {observationCount === 1 ? "observation uses" : "observations use"} it.
        </p>
      )}
    </section>
  );
}
