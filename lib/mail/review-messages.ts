/** What an observer is told when the coordinator queries or rejects a count. */
import { escapeHtml } from "./templates";

export type ReviewMessageKind = "query" | "reject";

const footer = "\n\n— Heliotally\nYou receive this because you log counts with your network on Heliotally.";

export function reviewNoticeText({
  kind,
  utDate,
  note,
}: {
  kind: ReviewMessageKind;
  utDate: string;
  note: string;
}): string {
  return kind === "query"
    ? `Your coordinator has a question about your count of ${utDate}: "${note}"`
    : `Your count of ${utDate} is not used in the network series: "${note}"`;
}

export function reviewDecisionMessage({
  kind,
  observerName,
  utDate,
  note,
  url,
}: {
  kind: ReviewMessageKind;
  observerName: string;
  utDate: string;
  note: string;
  url: string;
}) {
  const subject =
    kind === "query"
      ? `A question about your count of ${utDate}`
      : `Your count of ${utDate} is not used in the series`;
  const lead =
    kind === "query"
      ? `Your coordinator has a question about your count of ${utDate}.`
      : `Your coordinator decided not to use your count of ${utDate} in the network series.`;
  const next =
    kind === "query"
      ? "Open the count, correct it if needed, and send it back with the form on that page:"
      : "You can read the note and the count's history here:";
  const text = `Hello ${observerName},\n\n${lead}\n\nCoordinator's note:\n${note}\n\n${next}\n${url}${footer}`;
  const html =
    `<p>Hello ${escapeHtml(observerName)},</p><p>${escapeHtml(lead)}</p>` +
    `<blockquote style="border-left:3px solid #f59311;margin:0;padding-left:12px">${escapeHtml(note).replace(/\n/g, "<br>")}</blockquote>` +
    `<p>${escapeHtml(next)}</p><p><a href="${escapeHtml(url)}">Open your count of ${escapeHtml(utDate)}</a></p>`;
  return { subject, text, html };
}
