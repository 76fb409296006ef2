import Link from "next/link";

import { listUnreadNotifications } from "@/db/queries/notifications";
import { formatUt } from "@/lib/format/time";

import { markAllNotificationsReadAction } from "../actions";

const SHOWN = 5;

/**
 * Unread messages from the coordinator at the top of the Logbook. Opening a
 * message's count marks it read; nothing is shown when there is nothing new.
 */
export async function InboxPanel({ userId }: { userId: string }) {
  const { rows, total } = await listUnreadNotifications({ userId, limit: SHOWN });
  if (total === 0) return null;
  return (
    <section
      aria-labelledby="inbox-heading"
      className="mb-6 rounded-lg border-2 border-corona-300 bg-corona-50 p-4"
    >
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="inbox-heading" className="font-semibold text-ink-950">
          From your coordinator{" "}
          <span className="ml-1 rounded-full bg-corona-500 px-2 py-0.5 text-xs text-umbra">{total} new</span>
        </h2>
        <form action={markAllNotificationsReadAction}>
          <button type="submit" className="text-sm text-corona-800 underline">
            Mark all as read
          </button>
        </form>
      </div>
      <ul className="mt-3 flex flex-col gap-2">
        {rows.map((n) => (
          <li
            key={n.id}
            className="flex flex-wrap items-baseline justify-between gap-2 rounded-md bg-white px-3 py-2 text-sm shadow-sm"
          >
            <span className="text-ink-900">{n.message}</span>
            <span className="flex items-baseline gap-3 text-xs text-ink-500">
              {formatUt(n.createdAt)}
              {n.link ? (
                <Link href={n.link} className="font-semibold text-corona-700 underline">
                  Open the count
                </Link>
              ) : null}
            </span>
          </li>
        ))}
      </ul>
      {total > SHOWN ? (
        <p className="mt-2 text-xs text-ink-600">
          And {total - SHOWN} more; they appear here as you read these.
        </p>
      ) : null}
    </section>
  );
}
