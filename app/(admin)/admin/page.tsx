import type { Metadata } from "next";

import { PageHeader } from "@/components/layout/app-shell";
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
      <PageHeader title="Users and roles" lead="Everyone with an account. Students have no e-mail address; they sign in with their classroom code." />
      <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white shadow-sm">
        <table className="min-w-full text-sm">
          <thead className="bg-ink-50 text-left text-xs tracking-wide text-ink-600 uppercase">
            <tr>
              {["Name", "E-mail", "Observer code", "Role"].map((h) => (
                <th key={h} scope="col" className="px-3 py-2 font-semibold">
                  {h}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {users.map((u) => (
              <tr key={u.id} className="border-t border-ink-100">
                <td className="px-3 py-2">
                  {u.name}
                  {u.isDemo ? <span className="ml-2 rounded bg-ink-100 px-1 text-xs text-ink-600">demo</span> : null}
                </td>
                <td className="px-3 py-2">{u.email ?? "—"}</td>
                <td className="px-3 py-2">{u.observerCode ?? "—"}</td>
                <td className="px-3 py-2">
                  <RoleForm userId={u.id} role={u.role} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </>
  );
}
