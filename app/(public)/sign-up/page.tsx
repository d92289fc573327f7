import type { Metadata } from "next";
import Link from "next/link";
import { SignUpForm } from "@/components/auth/sign-up-form";

export const metadata: Metadata = { title: "Create an account" };

export default function SignUpPage() {
  return (
    <div className="mx-auto max-w-md space-y-6">
      <div className="space-y-2">
        <h1 className="text-3xl font-bold">Create an account</h1>
        <p className="text-bakelite-soft">
          With an account you can request a quote, send photos, approve the estimate and follow your set through the workshop.
        </p>
      </div>
      <div className="card p-6">
        <SignUpForm />
      </div>
      <p className="text-sm">
        Already have an account? <Link href="/sign-in">Sign in</Link>.
      </p>
    </div>
  );
}
