import type { Metadata } from "next";

import { PageHeader } from "@/components/layout/app-shell";
import { listCapturedMail } from "@/db/queries/mail";
import { requireRole } from "@/lib/auth/session";
import { getEnv } from "@/lib/env";
import { formatUt } from "@/lib/format/time";

export const metadata: Metadata = { title: "Captured mail" };
export const dynamic = "force-dynamic";

export default async function CapturedMailPage() {
  await requireRole(["admin"]);
  const env = getEnv();
  const messages = await listCapturedMail({ limit: 100 });
  return (
    <>
      <PageHeader
        title="Captured mail"
        lead={`Messages caught by the local mail sink on ${env.SMTP_HOST}:${env.SMTP_PORT}. Nothing here left this machine.`}
      />
      {!env.MAIL_SINK ? (
        <p className="text-sm text-ink-600">
          The local mail sink is off (MAIL_SINK=false): mail goes to the configured SMTP server.
        </p>
      ) : messages.length === 0 ? (
        <p className="rounded-lg border border-ink-100 bg-white p-6 text-sm text-ink-600">
          No mail yet. Ask for a sign-in link or a password reset to see one arrive.
        </p>
      ) : (
        <ul className="grid gap-3">
          {messages.map((m) => (
            <li key={m.id} className="rounded-lg border border-ink-100 bg-white p-4 text-sm shadow-sm">
              <p className="font-semibold text-ink-950">{m.subject}</p>
              <p className="text-xs text-ink-500">
                to {m.toAddress} · {formatUt(m.receivedAt)}
              </p>
              <pre className="mt-2 font-sans text-sm break-words whitespace-pre-wrap text-ink-800">
                {m.textBody}
              </pre>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
