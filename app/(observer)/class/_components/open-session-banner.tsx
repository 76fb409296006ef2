import { ButtonLink } from "@/components/ui/button";
import { formatSessionWindow } from "@/lib/classrooms/session-state";
import { loadStudentClass } from "@/lib/classrooms/views";

/** On a student's start page: their classroom's open session, with the way in to log a count. */
export async function OpenSessionBanner({ userId, observerId }: { userId: string; observerId: string }) {
  const view = await loadStudentClass({ userId, observerId });
  if (!view) return null;
  const open = view.open[0];
  if (!open) {
    const next = view.upcoming[0];
    return (
      <p className="mb-6 rounded-lg border border-ink-100 bg-white px-5 py-3 text-sm text-ink-700">
        {view.classroom.name}: no session is open right now.
        {next ? ` Next: “${next.title}”, ${formatSessionWindow(next)}.` : ""}
      </p>
    );
  }
  return (
    <section
      aria-label="Open class session"
      className="mb-6 flex flex-wrap items-center justify-between gap-4 rounded-lg border-2 border-corona-300 bg-corona-50 p-5"
    >
      <div>
        <p className="text-xs font-semibold tracking-widest text-corona-800 uppercase">
          Class session open now
        </p>
        <p className="mt-1 text-lg font-semibold text-ink-950">{open.title}</p>
        <p className="text-sm text-ink-700">
          {view.classroom.name} · {formatSessionWindow(open)} · {open.instrumentName}
        </p>
      </div>
      <ButtonLink href={`/class/sessions/${open.id}`} variant={open.own ? "secondary" : "primary"}>
        {open.own ? "Counted: see the class" : "Log my count"}
      </ButtonLink>
    </section>
  );
}
