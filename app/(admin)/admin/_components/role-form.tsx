"use client";

import { useActionState } from "react";

import { ROLE_LABELS, ROLES, type Role } from "@/lib/auth/roles";

import { changeRoleAction } from "../actions";

export function RoleForm({ userId, role }: { userId: string; role: Role }) {
  const [state, action, pending] = useActionState(changeRoleAction, { ok: false });
  return (
    <form action={action} className="flex items-center gap-2">
      <input type="hidden" name="userId" value={userId} />
      <select
        name="role"
        defaultValue={role}
        aria-label="Role"
        className="rounded border border-ink-200 px-2 py-1 text-sm"
      >
        {ROLES.map((r) => (
          <option key={r} value={r}>
            {ROLE_LABELS[r]}
          </option>
        ))}
      </select>
      <button
        type="submit"
        disabled={pending}
        className="rounded border border-ink-200 px-2 py-1 text-xs font-semibold hover:bg-ink-50"
      >
        Save
      </button>
      {state.message ? (
        <span
          role={state.ok ? "status" : "alert"}
          className={`text-xs ${state.ok ? "text-meadow-700" : "text-caution-700"}`}
        >
          {state.message}
        </span>
      ) : null}
    </form>
  );
}
