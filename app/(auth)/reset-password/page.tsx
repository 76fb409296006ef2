import { RequestResetForm } from "./_components/reset-forms";

export default function ResetPasswordPage() {
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-semibold text-ink-950">Choose a new password</h1>
      <p className="text-sm text-ink-600">We will e-mail you a link that works once, for one hour.</p>
      <RequestResetForm />
    </div>
  );
}
