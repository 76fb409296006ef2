import { AppShell } from "@/components/layout/app-shell";
import { requirePageRole } from "@/lib/auth/page-guard";

/** Account settings: everyone but students, whose accounts their educator manages. */
export default async function AccountLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageRole(["observer", "coordinator", "educator", "admin"]);
  return <AppShell user={user}>{children}</AppShell>;
}
