import type { Metadata } from "next";
import Link from "next/link";

import { PageHeader } from "@/components/layout/app-shell";
import { StaticTable } from "@/components/ui/static-table";
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
          <StaticTable
            caption="Your API tokens"
            rows={tokens}
            rowKey={(t) => t.id}
            rowClassName={(t) => (t.revokedAt ? "text-ink-400" : undefined)}
            empty="You have no tokens yet. Create one on the left when a script needs to read your data or send counts."
            columns={[
              { key: "name", header: "Name", className: "font-medium", cell: (t) => t.name },
              {
                key: "prefix",
                header: "Starts with",
                className: "font-mono text-xs",
                cell: (t) => `${t.prefix}…`,
              },
              { key: "scope", header: "May", cell: (t) => API_TOKEN_SCOPE_LABELS[t.scope] },
              {
                key: "created",
                header: "Created",
                className: "whitespace-nowrap",
                cell: (t) => formatUt(t.createdAt),
              },
              {
                key: "used",
                header: "Last used",
                className: "whitespace-nowrap",
                cell: (t) => (t.lastUsedAt ? formatUt(t.lastUsedAt) : "never"),
              },
              {
                key: "actions",
                header: <span className="sr-only">Actions</span>,
                align: "right",
                cell: (t) =>
                  t.revokedAt ? (
                    <span className="text-xs">revoked {formatUt(t.revokedAt)}</span>
                  ) : (
                    <RevokeTokenButton tokenId={t.id} name={t.name} />
                  ),
              },
            ]}
          />
        </section>
      </div>
    </>
  );
}
