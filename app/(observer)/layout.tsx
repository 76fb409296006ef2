import { AppShell } from "@/components/layout/app-shell";
import { requirePageRole } from "@/lib/auth/page-guard";

export default async function ObserverLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageRole(["observer", "student"]);
  return <AppShell user={user}>{children}</AppShell>;
}
