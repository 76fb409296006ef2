import type { Metadata } from "next";
import Link from "next/link";

import { JoinForm } from "./_components/join-form";

export const metadata: Metadata = { title: "Join a class" };
export const dynamic = "force-dynamic";

export default async function JoinPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const params = await searchParams;
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-semibold text-ink-950">Join a class</h1>
        <p className="mt-2 text-sm text-ink-600">
          If your teacher has opened joining, type the classroom code and the name you want the class to see.
          You get a PIN to sign in with. We never ask for your e-mail address or where you live.
        </p>
      </div>
      <JoinForm initialCode={params.code ?? ""} />
      <p className="text-sm text-ink-600">
        Already have a card?{" "}
        <Link href="/sign-in" className="font-semibold text-corona-700 underline">
          Sign in
        </Link>
        .
      </p>
    </div>
  );
}
