import { RequestResetForm } from "@/components/auth/password-reset-forms";

export const metadata = { title: "Reset password" };

export default function ForgotPasswordPage() {
  return (
    <>
      <h1 className="mb-6 text-2xl font-semibold">Reset your password</h1>
      <RequestResetForm />
    </>
  );
}
