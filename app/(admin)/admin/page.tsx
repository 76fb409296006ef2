import type { Metadata } from "next";

import { PageHeader } from "@/components/layout/app-shell";
import { StaticTable } from "@/components/ui/static-table";
import { listUsersWithProfiles } from "@/db/queries/users";
import { requireRole } from "@/lib/auth/session";

import { RoleForm } from "./_components/role-form";

export const metadata: Metadata = { title: "Users" };
export const dynamic = "force-dynamic";

export default async function AdminUsersPage() {
  await requireRole(["admin"]);
  const users = await listUsersWithProfiles();
  return (
    <>
      <PageHeader
        title="Users and roles"
        lead="Everyone with an account. Students have no e-mail address; they sign in with their classroom code."
      />
      <StaticTable
        caption="Users and their roles"
        rows={users}
        rowKey={(u) => u.id}
        columns={[
          {
            key: "name",
            header: "Name",
            cell: (u) => (
              <>
                {u.name}
                {u.isDemo ? (
                  <span className="ml-2 rounded bg-ink-100 px-1 text-xs text-ink-600">demo</span>
                ) : null}
              </>
            ),
          },
          { key: "email", header: "E-mail", cell: (u) => u.email ?? "—" },
          { key: "code", header: "Observer code", cell: (u) => u.observerCode ?? "—" },
          { key: "role", header: "Role", cell: (u) => <RoleForm userId={u.id} role={u.role} /> },
        ]}
      />
    </>
  );
}
