import { NewPasswordForm } from "../_components/reset-forms";

export default async function NewPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-semibold text-ink-950">Choose a new password</h1>
      <NewPasswordForm token={token} />
    </div>
  );
}
