import { PublicShell } from "@/components/layout/public-shell";

export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <PublicShell>
      <div className="mx-auto max-w-md">{children}</div>
    </PublicShell>
  );
}
