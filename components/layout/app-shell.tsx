import Link from "next/link";
import type { ReactNode } from "react";

import { DemoBanner } from "@/components/demo-banner";
import { SunMark } from "@/components/ui/sun-mark";
import { ROLE_LABELS, type Role } from "@/lib/auth/roles";
import type { SessionUser } from "@/lib/auth/session";

import { MainNav, type NavItem } from "./main-nav";
import { SignOutButton } from "./sign-out-button";

// Entries marked `more` are the occasional ones: they sit under "More" so the
// everyday ones fit one line on a 1280 px screen.
const NAV: Record<Role, NavItem[]> = {
  observer: [
    { href: "/logbook", label: "Logbook" },
    { href: "/logbook/new", label: "Log a count" },
    { href: "/instruments", label: "Instruments" },
    { href: "/my-k", label: "My k" },
    { href: "/archive", label: "Archive" },
    { href: "/planner", label: "Projection planner", more: true },
    { href: "/disk-template", label: "Disk template", more: true },
    { href: "/logbook/import", label: "Import & export", more: true },
  ],
  student: [
    { href: "/logbook", label: "My counts" },
    { href: "/class", label: "My class" },
    { href: "/logbook/new", label: "Log a count" },
    { href: "/instruments", label: "Instruments" },
    { href: "/archive", label: "Archive" },
    { href: "/planner", label: "Projection planner", more: true },
    { href: "/disk-template", label: "Disk template", more: true },
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
    { href: "/review", label: "Review desk" },
    { href: "/observers", label: "Observers" },
    { href: "/archive", label: "Archive" },
    { href: "/classrooms", label: "Classrooms" },
    { href: "/admin/mail", label: "Mail", more: true },
    { href: "/admin/backups", label: "Backups", more: true },
  ],
};

export function AppShell({ user, children }: { user: SessionUser; children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col">
      <DemoBanner />
      <header className="no-print bg-ink-950 text-white">
        <div className="relative mx-auto flex max-w-6xl items-center gap-4 px-4 py-3">
          <Link href="/" className="flex shrink-0 items-center gap-2 font-semibold tracking-tight">
            <SunMark />
            <span className="text-lg">Heliotally</span>
          </Link>
          <MainNav
            items={NAV[user.role]}
            account={
              <>
                {/* A long name gives way before the role does; between tablet and 1280 px the name yields its place to the links. */}
                <span className="flex min-w-0 items-baseline gap-1 whitespace-nowrap text-ink-200 lg:max-xl:hidden">
                  <span className="max-w-60 truncate" title={user.name ?? user.email ?? undefined}>
                    {user.name ?? user.email}
                  </span>
                  · <span className="text-corona-300">{ROLE_LABELS[user.role]}</span>
                </span>
                {user.role === "student" ? null : (
                  <Link
                    href="/account/tokens"
                    className="whitespace-nowrap text-ink-200 underline-offset-2 hover:text-white hover:underline"
                  >
                    API tokens
                  </Link>
                )}
                <SignOutButton />
              </>
            }
          />
        </div>
      </header>
      <main className="mx-auto w-full max-w-6xl flex-1 px-4 py-8">{children}</main>
    </div>
  );
}

export function PageHeader({
  title,
  lead,
  actions,
}: {
  title: string;
  lead?: ReactNode;
  actions?: ReactNode;
}) {
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
