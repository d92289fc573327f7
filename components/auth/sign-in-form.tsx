"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { signInSchema, type SignInInput } from "@/lib/validation/sign-in";

export function SignInForm({ next }: { next?: string }) {
  const router = useRouter();
  const [problem, setProblem] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<SignInInput>({ resolver: zodResolver(signInSchema) });
  const { errors, isSubmitting } = formState;

  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    // The sign-in service's own endpoint, called directly: its browser client is not needed for one request.
    let res: Response;
    try {
      res = await fetch("/api/auth/sign-in/email", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ email: values.email, password: values.password }),
      });
    } catch {
      setProblem("The shop could not be reached. Check your connection and try again.");
      return;
    }
    if (!res.ok) {
      const code = ((await res.json().catch(() => null)) as { code?: string } | null)?.code;
      if (res.status === 429) setProblem("Too many attempts. Please wait a minute and try again.");
      else if (res.status >= 500) setProblem("Signing in failed on the shop's side. Please try again in a moment.");
      else if (code === "EMAIL_NOT_VERIFIED") setProblem("Please confirm your e-mail address first: we sent you a link when you signed up.");
      else setProblem("That e-mail and password do not match an account.");
      return;
    }
    router.push(next && next.startsWith("/") && !next.startsWith("//") ? next : "/after-sign-in");
    router.refresh();
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-describedby={problem ? "sign-in-problem" : undefined}>
      {problem ? (
        <div id="sign-in-problem">
          <Notice tone="error" live>
            <p>{problem}</p>
          </Notice>
        </div>
      ) : null}
      <Field id="email" label="E-mail" error={errors.email?.message}>
        <input id="email" type="email" autoComplete="email" className="field-input" aria-invalid={!!errors.email} aria-describedby={describedBy("email", { error: errors.email })} {...register("email")} />
      </Field>
      <Field id="password" label="Password" error={errors.password?.message}>
        <input id="password" type="password" autoComplete="current-password" className="field-input" aria-invalid={!!errors.password} aria-describedby={describedBy("password", { error: errors.password })} {...register("password")} />
      </Field>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <button type="submit" className="btn-primary" disabled={isSubmitting}>
          {isSubmitting ? "Signing in…" : "Sign in"}
        </button>
        <Link href="/reset-password">Forgot your password?</Link>
      </div>
    </form>
  );
}
