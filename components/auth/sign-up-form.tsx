"use client";

import "@/lib/client/zod-setup";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { authClient } from "@/lib/client/auth-client";
import { signUpSchema, type SignUpInput } from "@/lib/validation/account";

export function SignUpForm() {
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<SignUpInput>({ resolver: zodResolver(signUpSchema) });
  const { errors, isSubmitting } = formState;

  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    const { error } = await authClient.signUp.email({
      name: values.name,
      email: values.email,
      password: values.password,
      callbackURL: "/portal",
    });
    if (error) {
      if (error.status === 429) setProblem("Too many attempts. Please wait a minute and try again.");
      else if (error.code === "PASSWORD_TOO_COMMON") setProblem(error.message ?? "Please choose a less common password.");
      else if (error.code === "USER_ALREADY_EXISTS" || error.code === "USER_ALREADY_EXISTS_USE_ANOTHER_EMAIL") setSentTo(values.email);
      else setProblem(error.message ?? "We could not create the account. Please try again.");
      return;
    }
    setSentTo(values.email);
  });

  if (sentTo) {
    return (
      <Notice tone="success" title="Check your e-mail" live>
        <p>
          If <strong>{sentTo}</strong> can receive mail, a confirmation link is on its way. Open it to finish signing up; the link is valid
          for one hour.
        </p>
      </Notice>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {problem ? (
        <Notice tone="error" live>
          <p>{problem}</p>
        </Notice>
      ) : null}
      <Field id="name" label="Your name" error={errors.name?.message}>
        <input
          id="name"
          autoComplete="name"
          className="field-input"
          aria-invalid={!!errors.name}
          aria-describedby={describedBy("name", { error: errors.name })}
          {...register("name")}
        />
      </Field>
      <Field id="email" label="E-mail" error={errors.email?.message}>
        <input
          id="email"
          type="email"
          autoComplete="email"
          className="field-input"
          aria-invalid={!!errors.email}
          aria-describedby={describedBy("email", { error: errors.email })}
          {...register("email")}
        />
      </Field>
      <Field
        id="password"
        label="Password"
        error={errors.password?.message}
        hint="At least 8 characters. A short sentence is easier to remember than symbols."
      >
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
      <button type="submit" className="btn-primary" disabled={isSubmitting}>
        {isSubmitting ? "Creating account…" : "Create account"}
      </button>
    </form>
  );
}
