import Link from "next/link";

import { SunMark } from "@/components/ui/sun-mark";

export default function Forbidden() {
  return (
    <main className="mx-auto flex min-h-screen max-w-lg flex-col items-center justify-center gap-4 px-4 text-center">
      <SunMark className="size-12" />
      <p className="text-sm font-semibold tracking-widest text-corona-700">403 · NOT FOR THIS ACCOUNT</p>
      <h1 className="text-2xl font-semibold text-ink-950">This page belongs to another role</h1>
      <p className="text-ink-600">
        You are signed in, but your account does not have access here. If you think it should, ask your
        network&apos;s admin to change your role.
      </p>
      <Link href="/" className="font-semibold text-corona-700 underline">
        Go to your start page
      </Link>
    </main>
  );
}
