import { AppShell } from "@/components/layout/app-shell";
import { requirePageRole } from "@/lib/auth/page-guard";

export default async function ClassroomLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageRole(["educator"]);
  return <AppShell user={user}>{children}</AppShell>;
}
