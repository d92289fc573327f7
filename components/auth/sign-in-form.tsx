"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { safeNextPath } from "@/lib/validation/next-path";
import { checkSignIn, type SignInErrors } from "@/lib/validation/sign-in";

// Two fields and no form library: the sign-in page stays the lightest page a visitor loads.
export function SignInForm({ next }: { next?: string }) {
  const router = useRouter();
  const [problem, setProblem] = useState<string | null>(null);
  const [errors, setErrors] = useState<SignInErrors>({});
  const [submitting, setSubmitting] = useState(false);

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const { values, errors: found } = checkSignIn({ email: String(form.get("email") ?? ""), password: String(form.get("password") ?? "") });
    setErrors(found);
    setProblem(null);
    if (found.email || found.password) {
      document.getElementById(found.email ? "email" : "password")?.focus();
      return;
    }
    setSubmitting(true);
    try {
      // The sign-in service's own endpoint, called directly: its browser client is not needed for one request.
      let res: Response;
      try {
        res = await fetch("/api/auth/sign-in/email", {
          method: "POST",
          headers: { "content-type": "application/json" },
          body: JSON.stringify(values),
        });
      } catch {
        setProblem("The shop could not be reached. Check your connection and try again.");
        return;
      }
      if (!res.ok) {
        const code = ((await res.json().catch(() => null)) as { code?: string } | null)?.code;
        if (res.status === 429) setProblem("Too many attempts. Please wait a minute and try again.");
        else if (res.status >= 500) setProblem("Signing in failed on the shop's side. Please try again in a moment.");
        else if (code === "EMAIL_NOT_VERIFIED")
          setProblem("Please confirm your e-mail address first: we sent you a link when you signed up.");
        else setProblem("That e-mail and password do not match an account.");
        return;
      }
      router.push(safeNextPath(next, window.location.origin));
      router.refresh();
    } finally {
      setSubmitting(false);
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-describedby={problem ? "sign-in-problem" : undefined}>
      {problem ? (
        <div id="sign-in-problem">
          <Notice tone="error" live>
            <p>{problem}</p>
          </Notice>
        </div>
      ) : null}
      <Field id="email" label="E-mail" error={errors.email}>
        <input
          id="email"
          name="email"
          type="email"
          autoComplete="email"
          className="field-input"
          aria-invalid={!!errors.email}
          aria-describedby={describedBy("email", { error: errors.email })}
        />
      </Field>
      <Field id="password" label="Password" error={errors.password}>
        <input
          id="password"
          name="password"
          type="password"
          autoComplete="current-password"
          className="field-input"
          aria-invalid={!!errors.password}
          aria-describedby={describedBy("password", { error: errors.password })}
        />
      </Field>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <button type="submit" className="btn-primary" disabled={submitting}>
          {submitting ? "Signing in…" : "Sign in"}
        </button>
        <Link href="/reset-password">Forgot your password?</Link>
      </div>
    </form>
  );
}
