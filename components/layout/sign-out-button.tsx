"use client";

import { signOut } from "next-auth/react";

export function SignOutButton() {
  return (
    <button
      type="button"
      onClick={() => void signOut({ callbackUrl: "/sign-in" })}
      className="rounded-md px-3 py-1.5 text-sm text-ink-200 hover:bg-ink-800 hover:text-white"
    >
      Sign out
    </button>
  );
}
