import Link from "next/link";

export default function CheckEmailPage() {
  return (
    <div className="flex flex-col gap-3">
      <h1 className="text-2xl font-semibold text-ink-950">Check your e-mail</h1>
      <p className="text-ink-700">
        If the address has an account, a sign-in link is on its way. It works once and expires in 24 hours.
      </p>
      <Link href="/sign-in" className="font-semibold text-corona-700 underline">
        Back to sign-in
      </Link>
    </div>
  );
}
