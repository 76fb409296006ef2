import Link from "next/link";
import type { ReactNode } from "react";

import { DemoBanner } from "@/components/demo-banner";
import { SunMark } from "@/components/ui/sun-mark";

export function PublicShell({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col">
      <DemoBanner />
      <header className="border-b border-ink-100 bg-white">
        <div className="mx-auto flex max-w-5xl items-center justify-between px-4 py-3">
          <Link href="/" className="flex items-center gap-2 font-semibold tracking-tight text-ink-950">
            <SunMark />
            <span className="text-lg">Heliotally</span>
          </Link>
          <nav className="flex gap-4 text-sm">
            <Link href="/sign-in" className="text-ink-700 hover:text-ink-950">
              Sign in
            </Link>
            <Link href="/sign-up" className="font-semibold text-corona-700 hover:text-corona-800">
              Join as an observer
            </Link>
          </nav>
        </div>
      </header>
      <main className="mx-auto w-full max-w-5xl flex-1 px-4 py-10">{children}</main>
      <footer className="border-t border-ink-100 py-6 text-center text-xs text-ink-500">
        Heliotally — sunspot counts, kept well.
      </footer>
    </div>
  );
}
