import type { Metadata } from "next";
import Link from "next/link";

import { getSessionUser } from "@/lib/auth/session";

import { ClassSignInForm } from "../_components/class-sign-in-form";
import { SignOutPrevious } from "../_components/sign-out-previous";

export const metadata: Metadata = { title: "Shared class device" };
export const dynamic = "force-dynamic";

/**
 * One device passed round the class: each student signs in with the code
 * (remembered on this device), their name and PIN, logs their count, and hands
 * over. Opening this page signs out whoever was signed in before.
 */
export default async function ClassDevicePage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const [user, params] = await Promise.all([getSessionUser(), searchParams]);
  return (
    <div className="flex flex-col gap-6">
      {user ? <SignOutPrevious /> : null}
      <div>
        <p className="text-sm font-semibold tracking-widest text-corona-700">SHARED CLASS DEVICE</p>
        <h1 className="mt-1 text-2xl font-semibold text-ink-950">Next student: sign in</h1>
        <p className="mt-2 text-sm text-ink-600">
          This device is shared by the class. Sign in with your name and PIN, log your count, then tap{" "}
          <strong>Done, next student</strong> so the next person can sign in. The classroom code is remembered
          on this device.
        </p>
      </div>
      <div className="rounded-lg border border-ink-100 bg-white p-6 shadow-sm">
        <ClassSignInForm sharedDevice initialCode={params.code ?? ""} />
      </div>
      <p className="text-sm text-ink-600">
        Not a shared device?{" "}
        <Link href="/sign-in" className="font-semibold text-corona-700 underline">
          Use the usual sign-in page
        </Link>
        .
      </p>
    </div>
  );
}
