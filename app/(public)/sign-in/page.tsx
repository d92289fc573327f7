import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { SignInForm } from "@/components/auth/sign-in-form";
import { homeFor } from "@/lib/engine/permissions";
import { env } from "@/lib/server/env";
import { getViewer } from "@/lib/server/session";
import { safeNextPath } from "@/lib/validation/next-path";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  const { next } = await searchParams;
  const viewer = await getViewer();
  if (viewer) redirect(homeFor(viewer.role));
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-bold">Sign in</h1>
      <div className="card p-6">
        {/* Checked here and again in the browser against the origin the page was served from. */}
        <SignInForm next={safeNextPath(next, new URL(env().APP_URL).origin, "")} />
      </div>
      <p className="text-sm">
        New here? <Link href="/sign-up">Create an account to request a quote</Link>.
      </p>
    </div>
  );
}
