import type { Metadata } from "next";
import { ResetPasswordForm, ResetRequestForm } from "@/components/auth/reset-forms";

export const metadata: Metadata = { title: "Reset your password" };

export default async function ResetPasswordPage({ searchParams }: { searchParams: Promise<{ token?: string; error?: string }> }) {
  const { token, error } = await searchParams;
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-bold">{token ? "Choose a new password" : "Reset your password"}</h1>
      <div className="card p-6">
        {error ? <p className="mb-4 text-fail">This link has expired or was already used. Ask for a new one below.</p> : null}
        {token && !error ? <ResetPasswordForm token={token} /> : <ResetRequestForm />}
      </div>
    </div>
  );
}
