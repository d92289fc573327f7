"use client";

import "@/lib/client/zod-setup";

import { zodResolver } from "@/lib/client/zod-resolver";
import Link from "next/link";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { authClient } from "@/lib/client/auth-client";
import { resetRequestSchema, resetSchema } from "@/lib/validation/account";

export function ResetRequestForm() {
  const [sent, setSent] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<z.infer<typeof resetRequestSchema>>({ resolver: zodResolver(resetRequestSchema) });
  const onSubmit = handleSubmit(async ({ email }) => {
    setProblem(null);
    const { error } = await authClient.requestPasswordReset({ email, redirectTo: "/reset-password" });
    if (error?.status === 429) {
      setProblem("Too many attempts. Please wait a minute and try again.");
      return;
    }
    // The same answer whether or not the address has an account.
    setSent(true);
  });
  if (sent) {
    return (
      <Notice tone="success" title="Check your e-mail" live>
        <p>If that address has an account, a link to choose a new password is on its way. It is valid for one hour.</p>
      </Notice>
    );
  }
  const err = formState.errors.email;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {problem ? (
        <Notice tone="error" live>
          <p>{problem}</p>
        </Notice>
      ) : null}
      <Field id="email" label="E-mail of your account" error={err?.message}>
        <input
          id="email"
          type="email"
          autoComplete="email"
          className="field-input"
          aria-invalid={!!err}
          aria-describedby={describedBy("email", { error: err })}
          {...register("email")}
        />
      </Field>
      <button type="submit" className="btn-primary" disabled={formState.isSubmitting}>
        Send me a link
      </button>
    </form>
  );
}

export function ResetPasswordForm({ token }: { token: string }) {
  const [done, setDone] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<z.infer<typeof resetSchema>>({ resolver: zodResolver(resetSchema) });
  const onSubmit = handleSubmit(async ({ password }) => {
    setProblem(null);
    const { error } = await authClient.resetPassword({ newPassword: password, token });
    if (error) {
      if (error.code === "PASSWORD_TOO_COMMON") setProblem(error.message ?? "Please choose a less common password.");
      else if (error.status === 429) setProblem("Too many attempts. Please wait a minute and try again.");
      else setProblem("This link has expired or was already used. Ask for a new one.");
      return;
    }
    setDone(true);
  });
  if (done) {
    return (
      <Notice tone="success" title="Password changed" live>
        <p>
          Your new password is set and other sessions were signed out. <Link href="/sign-in">Sign in</Link>.
        </p>
      </Notice>
    );
  }
  const { errors } = formState;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {problem ? (
        <Notice tone="error" live>
          <p>{problem}</p>
        </Notice>
      ) : null}
      <Field id="password" label="New password" error={errors.password?.message} hint="At least 8 characters.">
        <input
          id="password"
          type="password"
          autoComplete="new-password"
          className="field-input"
          aria-invalid={!!errors.password}
          aria-describedby={describedBy("password", { error: errors.password, hint: true })}
          {...register("password")}
        />
      </Field>
      <Field id="confirm" label="Type it again" error={errors.confirm?.message}>
        <input
          id="confirm"
          type="password"
          autoComplete="new-password"
          className="field-input"
          aria-invalid={!!errors.confirm}
          aria-describedby={describedBy("confirm", { error: errors.confirm })}
          {...register("confirm")}
        />
      </Field>
      <button type="submit" className="btn-primary" disabled={formState.isSubmitting}>
        Set new password
      </button>
    </form>
  );
}
