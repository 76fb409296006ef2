import type { Metadata } from "next";
import Link from "next/link";

import { getEnv } from "@/lib/env";
import { DEMO_PASSWORD, DEMO_STAFF } from "@/lib/demo/scenario";

import { SignInForm } from "./_components/sign-in-form";
import { StudentSignInSection } from "./_components/student-sign-in-section";

export const metadata: Metadata = { title: "Sign in" };
export const dynamic = "force-dynamic";

const NEXT_AUTH_ERRORS: Record<string, string> = {
  Verification: "That sign-in link has expired or was already used. Ask for a new one.",
  AccessDenied: "That sign-in link cannot be used. Ask for a new one, or sign in with your password.",
  SessionRequired: "Sign in to continue.",
};

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const params = await searchParams;
  const demo = getEnv().HELIOTALLY_DEMO;
  const accounts = [
    { email: "observer@example.test", role: "Observer" },
    { email: DEMO_STAFF.coordinator.email, role: "Coordinator" },
    { email: DEMO_STAFF.educator.email, role: "Educator" },
    { email: DEMO_STAFF.admin.email, role: "Admin" },
  ];
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-semibold text-ink-950">Sign in to Heliotally</h1>
      <SignInForm
        callbackUrl={params.callbackUrl}
        initialError={
          params.error ? (NEXT_AUTH_ERRORS[params.error] ?? "Sign-in failed. Try again.") : undefined
        }
      />
      <p className="text-sm text-ink-600">
        New here?{" "}
        <Link href="/sign-up" className="font-semibold text-corona-700 underline">
          Join as an observer
        </Link>
        . Forgot your password?{" "}
        <Link href="/reset-password" className="font-semibold text-corona-700 underline">
          Choose a new one
        </Link>
        .
      </p>
      <StudentSignInSection />
      {demo ? (
        <section
          aria-label="Demo accounts"
          className="rounded-lg border border-dashed border-ink-300 bg-white p-4 text-sm"
        >
          <h2 className="font-semibold text-ink-900">Demo accounts (invented network)</h2>
          <p className="mt-1 text-ink-600">
            Every demo account uses the password{" "}
            <code className="rounded bg-ink-100 px-1">{DEMO_PASSWORD}</code>.
          </p>
          <ul className="mt-2 grid gap-1">
            {accounts.map((a) => (
              <li key={a.email} className="flex justify-between gap-2">
                <code>{a.email}</code>
                <span className="text-ink-500">{a.role}</span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </div>
  );
}
