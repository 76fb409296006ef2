"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";

import { Button } from "@/components/ui/button";
import { Field, FormMessage, TextArea } from "@/components/ui/field";
import { MAX_NOTE_LENGTH, reviewDecisionSchema, type ReviewDecisionAction } from "@/lib/validation/review";

const BUTTONS: Record<
  ReviewDecisionAction,
  { label: string; variant: "primary" | "secondary" | "danger"; done: string }
> = {
  accept: { label: "Accept", variant: "primary", done: "Accepted: the count is now in the series." },
  query: {
    label: "Send a query",
    variant: "secondary",
    done: "Queried: the observer has been told and the count waits in the Queried tab.",
  },
  reject: {
    label: "Reject",
    variant: "danger",
    done: "Rejected: the count is kept but not used, and the observer has been told.",
  },
  reopen: { label: "Reopen", variant: "secondary", done: "Reopened: the count is back in the queue." },
};

function noteHint({
  available,
  observerHasEmail,
}: {
  available: ReviewDecisionAction[];
  observerHasEmail: boolean;
}): string {
  const needing = available.filter((a) => a !== "accept").map((a) => BUTTONS[a].label.toLowerCase());
  const readers = observerHasEmail
    ? "the observer reads it in an e-mail and in their Logbook"
    : "the observer reads it in their Logbook";
  if (needing.length === 0) return "Optional. It stays in the decision history.";
  const tellsObserver = available.includes("query") || available.includes("reject");
  return `Required to ${needing.join(" or ")}${tellsObserver ? `: ${readers}.` : ". It stays in the decision history."}`;
}

/** Accept, query, reject (or reopen) this one observation, with a note. */
export function DecisionForm({
  observationId,
  available,
  observerHasEmail,
  nextId,
}: {
  observationId: string;
  available: ReviewDecisionAction[];
  observerHasEmail: boolean;
  /** The count to review after this one, if any waits. */
  nextId: string | null;
}) {
  const router = useRouter();
  const [note, setNote] = useState("");
  const [noteError, setNoteError] = useState<string | null>(null);
  const [busy, setBusy] = useState<ReviewDecisionAction | null>(null);
  const [outcome, setOutcome] = useState<{ tone: "success" | "error"; text: string } | null>(null);

  async function decide(action: ReviewDecisionAction) {
    setOutcome(null);
    const parsed = reviewDecisionSchema.safeParse({ action, observationIds: [observationId], note });
    if (!parsed.success) {
      setNoteError(parsed.error.issues.find((i) => i.path[0] === "note")?.message ?? null);
      if (!parsed.error.issues.some((i) => i.path[0] === "note")) {
        setOutcome({
          tone: "error",
          text: parsed.error.issues[0]?.message ?? "The decision could not be sent.",
        });
      }
      return;
    }
    setNoteError(null);
    setBusy(action);
    try {
      const res = await fetch("/api/v1/review/decisions", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify(parsed.data),
      });
      const body = await res.json();
      if (!res.ok) {
        const noteIssue = (body?.error?.issues ?? []).find((i: { path: string }) => i.path === "note");
        if (noteIssue) setNoteError(noteIssue.message);
        setOutcome({ tone: "error", text: body?.error?.message ?? "The decision was not saved." });
        return;
      }
      const mailWarning =
        body?.mail?.failed > 0
          ? " The e-mail could not be sent; the observer will still see it in their Logbook."
          : "";
      setOutcome({ tone: "success", text: `${BUTTONS[action].done}${mailWarning}` });
      setNote("");
      router.refresh();
    } catch {
      setOutcome({ tone: "error", text: "No connection to Heliotally; nothing was changed. Try again." });
    } finally {
      setBusy(null);
    }
  }

  return (
    <section
      aria-labelledby="decide-heading"
      className="flex flex-col gap-4 rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
    >
      <h2 id="decide-heading" className="font-semibold text-ink-900">
        Decision
      </h2>
      {available.length === 0 ? (
        <p className="text-sm text-ink-600">No decision can be taken on this count in its present state.</p>
      ) : (
        <>
          <Field
            id="note"
            label="Note"
            hint={noteHint({ available, observerHasEmail })}
            error={noteError ?? undefined}
          >
            <TextArea
              id="note"
              rows={4}
              maxLength={MAX_NOTE_LENGTH}
              value={note}
              onChange={(e) => setNote(e.target.value)}
              aria-invalid={Boolean(noteError)}
              aria-describedby={noteError ? "note-error" : "note-hint"}
            />
          </Field>
          <div className="flex flex-wrap gap-2">
            {available.map((action) => (
              <Button
                key={action}
                type="button"
                variant={BUTTONS[action].variant}
                disabled={busy !== null}
                onClick={() => decide(action)}
              >
                {busy === action ? "Saving…" : BUTTONS[action].label}
              </Button>
            ))}
          </div>
        </>
      )}
      {outcome ? (
        <FormMessage tone={outcome.tone}>
          {outcome.text}{" "}
          {outcome.tone === "success" ? (
            nextId ? (
              <Link href={`/review/${nextId}`} className="font-semibold underline">
                Next waiting count
              </Link>
            ) : (
              <Link href="/review" className="font-semibold underline">
                Back to the queue
              </Link>
            )
          ) : null}
        </FormMessage>
      ) : null}
    </section>
  );
}
