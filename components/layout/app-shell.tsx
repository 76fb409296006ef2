import Link from "next/link";
import type { ReactNode } from "react";

import { DemoBanner } from "@/components/demo-banner";
import { SunMark } from "@/components/ui/sun-mark";
import { ROLE_LABELS, type Role } from "@/lib/auth/roles";
import type { SessionUser } from "@/lib/auth/session";

import { SignOutButton } from "./sign-out-button";

const NAV: Record<Role, Array<{ href: string; label: string }>> = {
  observer: [
    { href: "/logbook", label: "Logbook" },
    { href: "/logbook/new", label: "Log a count" },
    { href: "/instruments", label: "Instruments" },
    { href: "/planner", label: "Projection planner" },
    { href: "/disk-template", label: "Disk template" },
    { href: "/my-k", label: "My k" },
    { href: "/archive", label: "Archive" },
    { href: "/logbook/import", label: "Import & export" },
  ],
  student: [
    { href: "/logbook", label: "My counts" },
    { href: "/class", label: "My class" },
    { href: "/logbook/new", label: "Log a count" },
    { href: "/instruments", label: "Instruments" },
    { href: "/planner", label: "Projection planner" },
    { href: "/disk-template", label: "Disk template" },
    { href: "/archive", label: "Archive" },
  ],
  coordinator: [
    { href: "/review", label: "Review desk" },
    { href: "/observers", label: "Observers" },
    { href: "/archive", label: "Archive" },
    { href: "/network-data", label: "Network data" },
  ],
  educator: [
    { href: "/classrooms", label: "Classrooms" },
    { href: "/archive", label: "Archive" },
  ],
  admin: [
    { href: "/admin", label: "Users" },
    { href: "/admin/mail", label: "Mail" },
    { href: "/admin/backups", label: "Backups" },
    { href: "/review", label: "Review desk" },
    { href: "/observers", label: "Observers" },
    { href: "/archive", label: "Archive" },
    { href: "/classrooms", label: "Classrooms" },
  ],
};

export function AppShell({ user, children }: { user: SessionUser; children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col">
      <DemoBanner />
      <header className="no-print bg-ink-950 text-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-4 px-4 py-3">
          <Link href="/" className="flex items-center gap-2 font-semibold tracking-tight">
            <SunMark />
            <span className="text-lg">Heliotally</span>
          </Link>
          <nav aria-label="Main" className="flex flex-1 flex-wrap gap-1">
            {NAV[user.role].map((item) => (
              <Link
                key={item.href}
                href={item.href}
                className="rounded-md px-3 py-1.5 text-sm text-ink-100 hover:bg-ink-800 hover:text-white"
              >
                {item.label}
              </Link>
            ))}
          </nav>
          <div className="flex items-center gap-3 text-sm">
            <span className="text-ink-200">
              {user.name ?? user.email} · <span className="text-corona-300">{ROLE_LABELS[user.role]}</span>
            </span>
            {user.role === "student" ? null : (
              <Link
                href="/account/tokens"
                className="text-ink-200 underline-offset-2 hover:text-white hover:underline"
              >
                API tokens
              </Link>
            )}
            <SignOutButton />
          </div>
        </div>
      </header>
      <main className="mx-auto w-full max-w-6xl flex-1 px-4 py-8">{children}</main>
    </div>
  );
}

export function PageHeader({ title, lead, actions }: { title: string; lead?: ReactNode; actions?: ReactNode }) {
  return (
    <div className="mb-6 flex flex-wrap items-end justify-between gap-4">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight text-ink-950">{title}</h1>
        {lead ? <p className="mt-1 max-w-2xl text-sm text-ink-600">{lead}</p> : null}
      </div>
      {actions ? <div className="flex gap-2">{actions}</div> : null}
    </div>
  );
}
