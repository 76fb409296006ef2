"use client";

import { signOut } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useEffect } from "react";

/** On a shared class device, whoever was still signed in is signed out as soon as the next student's page opens. */
export function SignOutPrevious() {
  const router = useRouter();
  useEffect(() => {
    void signOut({ redirect: false }).then(() => router.refresh());
  }, [router]);
  return (
    <p role="status" className="rounded-md border border-ink-200 bg-ink-50 px-4 py-3 text-sm text-ink-700">
      The previous student has been signed out of this device.
    </p>
  );
}
