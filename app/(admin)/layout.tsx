import { AppShell } from "@/components/layout/app-shell";
import { requirePageRole } from "@/lib/auth/page-guard";

export default async function AdminLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageRole(["admin"]);
  return <AppShell user={user}>{children}</AppShell>;
}
