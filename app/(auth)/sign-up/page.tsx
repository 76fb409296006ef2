import type { Metadata } from "next";

import { SignUpForm } from "./_components/sign-up-form";

export const metadata: Metadata = { title: "Join as an observer" };

export default function SignUpPage() {
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-semibold text-ink-950">Join as an observer</h1>
        <p className="mt-1 text-sm text-ink-600">
          Your Logbook is private to you and your network&apos;s coordinators. You can add your instruments
          after signing up.
        </p>
      </div>
      <SignUpForm />
    </div>
  );
}
