import { AppShell } from "@/components/layout/app-shell";
import { requirePageRole } from "@/lib/auth/page-guard";
import { ROLES } from "@/lib/auth/roles";

/** The Archive is the network's published series: every signed-in role may read it. */
export default async function ArchiveLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageRole(ROLES);
  return <AppShell user={user}>{children}</AppShell>;
}
