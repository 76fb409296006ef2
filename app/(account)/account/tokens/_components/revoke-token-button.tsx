"use client";

import { useActionState } from "react";

import { revokeApiTokenAction } from "../actions";

export function RevokeTokenButton({ tokenId, name }: { tokenId: string; name: string }) {
  const [state, action, pending] = useActionState(revokeApiTokenAction, { ok: false });
  return (
    <form
      action={action}
      onSubmit={(e) => {
        if (!window.confirm(`Revoke “${name}”? Scripts using it will stop working at once.`))
          e.preventDefault();
      }}
      className="inline-flex items-center gap-2"
    >
      <input type="hidden" name="tokenId" value={tokenId} />
      <button
        type="submit"
        disabled={pending}
        className="rounded border border-caution-200 px-2 py-1 text-xs font-semibold text-caution-700 hover:bg-caution-50"
      >
        Revoke
      </button>
      {state.message && !state.ok ? (
        <span role="alert" className="text-xs text-caution-700">
          {state.message}
        </span>
      ) : null}
    </form>
  );
}
