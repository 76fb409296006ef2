import type { Metadata } from "next";
import Link from "next/link";

import { PageHeader } from "@/components/layout/app-shell";
import { listApiTokensByUser } from "@/db/queries/api-tokens";
import { requireRole } from "@/lib/auth/session";
import { formatUt } from "@/lib/format/time";
import { API_TOKEN_SCOPE_LABELS } from "@/lib/validation/api-token";

import { CreateTokenForm } from "./_components/create-token-form";
import { RevokeTokenButton } from "./_components/revoke-token-button";

export const metadata: Metadata = { title: "API tokens" };
export const dynamic = "force-dynamic";

export default async function ApiTokensPage() {
  const user = await requireRole(["observer", "coordinator", "educator", "admin"]);
  const tokens = await listApiTokensByUser({ userId: user.id });
  return (
    <>
      <PageHeader
        title="API tokens"
        lead={
          <>
            A token lets your own scripts use the Heliotally API as you, with your role. Send it as{" "}
            <code className="rounded bg-ink-100 px-1">Authorization: Bearer &lt;token&gt;</code>. See the{" "}
            <Link href="/api-docs" className="font-semibold text-corona-700 underline">
              API reference
            </Link>
            .
          </>
        }
      />
      <div className="grid gap-8 lg:grid-cols-[22rem_1fr]">
        <section
          aria-labelledby="new-token"
          className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
        >
          <h2 id="new-token" className="mb-3 text-base font-semibold text-ink-900">
            New token
          </h2>
          <CreateTokenForm />
        </section>
        <section aria-labelledby="your-tokens">
          <h2 id="your-tokens" className="mb-3 text-base font-semibold text-ink-900">
            Your tokens
          </h2>
          {tokens.length === 0 ? (
            <p className="rounded-lg border border-ink-100 bg-white p-6 text-sm text-ink-600">
              You have no tokens yet. Create one on the left when a script needs to read your data or send
              counts.
            </p>
          ) : (
            <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white shadow-sm">
              <table className="min-w-full text-sm">
                <caption className="sr-only">Your API tokens</caption>
                <thead className="bg-ink-50 text-left text-xs tracking-wide text-ink-600 uppercase">
                  <tr>
                    {["Name", "Starts with", "May", "Created", "Last used", ""].map((h) => (
                      <th key={h || "actions"} scope="col" className="px-3 py-2 font-semibold">
                        {h}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {tokens.map((t) => (
                    <tr key={t.id} className={`border-t border-ink-100 ${t.revokedAt ? "text-ink-400" : ""}`}>
                      <td className="px-3 py-2 font-medium">{t.name}</td>
                      <td className="px-3 py-2 font-mono text-xs">{t.prefix}…</td>
                      <td className="px-3 py-2">{API_TOKEN_SCOPE_LABELS[t.scope]}</td>
                      <td className="px-3 py-2 whitespace-nowrap">{formatUt(t.createdAt)}</td>
                      <td className="px-3 py-2 whitespace-nowrap">
                        {t.lastUsedAt ? formatUt(t.lastUsedAt) : "never"}
                      </td>
                      <td className="px-3 py-2 text-right">
                        {t.revokedAt ? (
                          <span className="text-xs">revoked {formatUt(t.revokedAt)}</span>
                        ) : (
                          <RevokeTokenButton tokenId={t.id} name={t.name} />
                        )}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </section>
      </div>
    </>
  );
}
