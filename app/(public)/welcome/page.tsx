import type { Metadata } from "next";
import Link from "next/link";
import { WelcomeForm } from "@/components/auth/welcome-form";

export const metadata: Metadata = { title: "Set your password", robots: { index: false } };

// The page an invitation e-mail links to. The token is checked when the password is set (once).
export default async function WelcomePage({ searchParams }: { searchParams: Promise<{ token?: string }> }) {
  const { token } = await searchParams;
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-bold">Set your password</h1>
      <div className="card p-6">
        {token ? (
          <WelcomeForm token={token} />
        ) : (
          <p>
            This page needs the link from your invitation e-mail. Already have a password? <Link href="/sign-in">Sign in</Link>.
          </p>
        )}
      </div>
    </div>
  );
}
