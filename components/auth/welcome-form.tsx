"use client";

import "@/lib/client/zod-setup";

import { zodResolver } from "@/lib/client/zod-resolver";
import Link from "next/link";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { resetSchema } from "@/lib/validation/account";

// Sets the first password of someone the shop invited (to the staff, or a customer taken in at the counter), with the invitation's single-use token.
export function WelcomeForm({ token }: { token: string }) {
  const [done, setDone] = useState<null | "customer" | "staff">(null);
  const [problem, setProblem] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<z.infer<typeof resetSchema>>({ resolver: zodResolver(resetSchema) });
  const onSubmit = handleSubmit(async ({ password }) => {
    setProblem(null);
    let res: Response;
    try {
      res = await fetch("/api/staff-invitations/accept", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ token, password }),
      });
    } catch {
      setProblem("The shop could not be reached. Check your connection and try again.");
      return;
    }
    if (!res.ok) {
      const body = (await res.json().catch(() => null)) as { error?: { message?: string; fields?: Record<string, string> } } | null;
      setProblem(body?.error?.fields?.password ?? body?.error?.message ?? "That did not work. Please try again.");
      return;
    }
    const body = (await res.json().catch(() => null)) as { role?: string } | null;
    setDone(body?.role === "customer" ? "customer" : "staff");
  });
  if (done) {
    return (
      <Notice tone="success" title="Password set" live>
        <p>
          Your password is set. <Link href="/sign-in">Sign in</Link>{" "}
          {done === "customer" ? "to follow your job with the shop." : "to reach the bench."}
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
        Set my password
      </button>
    </form>
  );
}
