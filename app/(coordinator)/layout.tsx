import { AppShell } from "@/components/layout/app-shell";
import { requirePageRole } from "@/lib/auth/page-guard";

export default async function CoordinatorLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageRole(["coordinator"]);
  return <AppShell user={user}>{children}</AppShell>;
}
