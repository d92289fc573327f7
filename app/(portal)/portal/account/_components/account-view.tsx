"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { authClient } from "@/lib/client/auth-client";
import type { OwnerAccountView } from "@/lib/server/services/owner-account";
import {
  changeEmailSchema,
  changePasswordSchema,
  closeAccountSchema,
  profileSchema,
  type ProfileInput,
  type ProfileValues,
} from "@/lib/validation/owner-account";
import type { z } from "zod";
import { api, ApiError } from "../../_lib/api";
import { portalKeys } from "../../_lib/query-keys";
import { AddressForm } from "./address-form";

const accountKey = [...portalKeys.all, "account"] as const;

function Section({ id, title, children }: { id: string; title: string; children: React.ReactNode }) {
  return (
    <section className="card space-y-4 p-5" aria-labelledby={`${id}-title`}>
      <h2 id={`${id}-title`} className="text-xl font-bold">
        {title}
      </h2>
      {children}
    </section>
  );
}

function ProfileSection({ profile }: { profile: OwnerAccountView["profile"] }) {
  const qc = useQueryClient();
  const form = useForm<ProfileInput, unknown, ProfileValues>({
    resolver: zodResolver(profileSchema),
    defaultValues: { name: profile.name, phone: profile.phone, contactPreference: profile.contactPreference },
  });
  const contact = useWatch({ control: form.control, name: "contactPreference" });
  const save = useMutation({
    mutationFn: (body: ProfileValues) => api<OwnerAccountView>("/api/portal/account", { method: "PATCH", body }),
    onSuccess: (data) => {
      qc.setQueryData(accountKey, data);
      form.reset({ name: data.profile.name, phone: data.profile.phone, contactPreference: data.profile.contactPreference });
    },
    onError: (e) => {
      if (e instanceof ApiError)
        for (const k of ["name", "phone", "contactPreference"] as const) if (e.fields[k]) form.setError(k, { message: e.fields[k] });
    },
  });
  const errs = form.formState.errors;
  return (
    <Section id="profile" title="Name and how to reach you">
      <form noValidate className="space-y-3" onSubmit={form.handleSubmit((v) => save.mutate(v))}>
        <Field id="profile-name" label="Name" error={errs.name?.message}>
          <input
            id="profile-name"
            className="field-input"
            autoComplete="name"
            aria-invalid={errs.name ? true : undefined}
            aria-describedby={describedBy("profile-name", { error: errs.name })}
            {...form.register("name")}
          />
        </Field>
        <fieldset>
          <legend className="field-label">How should we reach you about your sets?</legend>
          <div className="mt-1 flex flex-wrap gap-4">
            <label className="inline-flex items-center gap-2">
              <input type="radio" value="email" {...form.register("contactPreference")} /> By e-mail
            </label>
            <label className="inline-flex items-center gap-2">
              <input type="radio" value="phone" {...form.register("contactPreference")} /> By phone
            </label>
          </div>
        </fieldset>
        <Field
          id="profile-phone"
          label={contact === "phone" ? "Phone number" : "Phone number (optional)"}
          hint="Digits, spaces and + ( ) . -, with the country code if you live outside the shop's country."
          error={errs.phone?.message}
        >
          <input
            id="profile-phone"
            type="tel"
            className="field-input"
            autoComplete="tel"
            aria-invalid={errs.phone ? true : undefined}
            aria-describedby={describedBy("profile-phone", { error: errs.phone, hint: true })}
            {...form.register("phone")}
          />
        </Field>
        <button type="submit" className="btn-primary" disabled={save.isPending}>
          {save.isPending ? "Saving…" : "Save"}
        </button>
        {save.isSuccess && !form.formState.isDirty ? (
          <Notice tone="success" live>
            <p>Saved.</p>
          </Notice>
        ) : null}
      </form>
    </Section>
  );
}

function AddressesSection({ addresses, defaultName }: { addresses: OwnerAccountView["addresses"]; defaultName: string }) {
  const qc = useQueryClient();
  const [editing, setEditing] = useState<string | null>(null);
  const [adding, setAdding] = useState(addresses.length === 0);
  const refresh = () => void qc.invalidateQueries({ queryKey: accountKey });
  const remove = useMutation({
    mutationFn: (id: string) => api(`/api/portal/account/addresses/${id}`, { method: "DELETE" }),
    onSuccess: refresh,
  });
  const makeDefault = useMutation({
    mutationFn: (a: OwnerAccountView["addresses"][number]) =>
      api(`/api/portal/account/addresses/${a.id}`, {
        method: "PATCH",
        body: {
          recipient: a.recipient,
          line1: a.line1,
          line2: a.line2 ?? "",
          city: a.city,
          region: a.region ?? "",
          postalCode: a.postalCode ?? "",
          country: a.country,
          isDefault: true,
        },
      }),
    onSuccess: refresh,
  });
  return (
    <Section id="addresses" title="Postal addresses">
      <p>
        We ship restored sets back to the address you choose on each job; your default address is offered first. A job keeps the address it
        was given, so changes here do not move a set already on its way.
      </p>
      {addresses.length === 0 ? <p className="text-bakelite-soft">No addresses yet.</p> : null}
      <ul className="space-y-3">
        {addresses.map((a) => (
          <li key={a.id} className="rounded-card border border-dial-rule p-3" data-testid="address">
            {editing === a.id ? (
              <AddressForm
                address={a}
                defaultName={defaultName}
                onSaved={() => {
                  setEditing(null);
                  refresh();
                }}
                onCancel={() => setEditing(null)}
              />
            ) : (
              <div className="flex flex-wrap items-start justify-between gap-3">
                <address className="min-w-0 break-words not-italic">
                  {a.lines.map((l, i) => (
                    <span key={i} className="block">
                      {l}
                    </span>
                  ))}
                </address>
                <div className="flex flex-wrap items-center gap-2 text-sm">
                  {a.isDefault ? (
                    <span className="rounded-full border border-pass bg-pass-light px-2 py-0.5 font-semibold">
                      <span aria-hidden="true">★ </span>Default
                    </span>
                  ) : (
                    <button type="button" className="btn-quiet" onClick={() => makeDefault.mutate(a)} disabled={makeDefault.isPending}>
                      Make default
                    </button>
                  )}
                  <button type="button" className="btn-secondary" onClick={() => setEditing(a.id)}>
                    Edit<span className="sr-only"> the address in {a.city}</span>
                  </button>
                  <button
                    type="button"
                    className="btn-secondary"
                    onClick={() => {
                      if (window.confirm("Remove this address? Jobs keep the address they were given.")) remove.mutate(a.id);
                    }}
                    disabled={remove.isPending}
                  >
                    Remove<span className="sr-only"> the address in {a.city}</span>
                  </button>
                </div>
              </div>
            )}
          </li>
        ))}
      </ul>
      {remove.isError ? (
        <Notice tone="error" live>
          <p>{remove.error.message}</p>
        </Notice>
      ) : null}
      {adding ? (
        <div className="rounded-card border border-dial-rule p-3">
          <h3 className="mb-2 font-semibold">New address</h3>
          <AddressForm
            defaultName={defaultName}
            onSaved={() => {
              setAdding(false);
              refresh();
            }}
            onCancel={addresses.length > 0 ? () => setAdding(false) : undefined}
          />
        </div>
      ) : (
        <button type="button" className="btn-secondary" onClick={() => setAdding(true)}>
          Add an address
        </button>
      )}
    </Section>
  );
}

function authMessage(error: { message?: string; code?: string } | null | undefined, fallback: string): string {
  if (!error) return fallback;
  if (error.code === "INVALID_PASSWORD") return "Current password: that is not your current password.";
  return error.message || fallback;
}

function EmailSection({ email, emailChanged }: { email: string; emailChanged: boolean }) {
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const form = useForm<z.input<typeof changeEmailSchema>, unknown, z.output<typeof changeEmailSchema>>({
    resolver: zodResolver(changeEmailSchema),
    defaultValues: { newEmail: "" },
  });
  const errs = form.formState.errors;
  return (
    <Section id="email" title="E-mail address">
      <p>
        You sign in with <strong className="break-all">{email}</strong>, and the shop writes to it.
      </p>
      {emailChanged ? (
        <Notice tone="success" live title="E-mail address changed">
          <p>Your new address is confirmed; it is the one you sign in with from now on.</p>
        </Notice>
      ) : null}
      <form
        noValidate
        className="space-y-3"
        onSubmit={form.handleSubmit(async (v) => {
          setProblem(null);
          const { error } = await authClient.changeEmail({ newEmail: v.newEmail, callbackURL: "/portal/account?email=changed" });
          if (error) setProblem(authMessage(error, "We could not start the change. Please try again."));
          else {
            setSentTo(v.newEmail);
            form.reset();
          }
        })}
      >
        <Field
          id="new-email"
          label="New e-mail address"
          hint="We send a link to the new address. Until you open it, your current address stays in use."
          error={errs.newEmail?.message}
        >
          <input
            id="new-email"
            type="email"
            className="field-input"
            autoComplete="email"
            aria-invalid={errs.newEmail ? true : undefined}
            aria-describedby={describedBy("new-email", { error: errs.newEmail, hint: true })}
            {...form.register("newEmail")}
          />
        </Field>
        <button type="submit" className="btn-primary" disabled={form.formState.isSubmitting}>
          {form.formState.isSubmitting ? "Sending…" : "Send the confirmation link"}
        </button>
      </form>
      {sentTo ? (
        <Notice tone="info" live title="Check the new address">
          <p>
            If no other account uses <strong className="break-all">{sentTo}</strong>, a confirmation link is on its way there; it works for
            an hour. Until you open it, you keep signing in with {email}.
          </p>
        </Notice>
      ) : null}
      {problem ? (
        <Notice tone="error" live>
          <p>{problem}</p>
        </Notice>
      ) : null}
    </Section>
  );
}

function PasswordSection() {
  const [done, setDone] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const form = useForm<z.input<typeof changePasswordSchema>, unknown, z.output<typeof changePasswordSchema>>({
    resolver: zodResolver(changePasswordSchema),
    defaultValues: { currentPassword: "", newPassword: "", confirm: "" },
  });
  const errs = form.formState.errors;
  const field = (name: "currentPassword" | "newPassword" | "confirm", label: string, autoComplete: string, hint?: string) => (
    <Field id={`pw-${name}`} label={label} hint={hint} error={errs[name]?.message}>
      <input
        id={`pw-${name}`}
        type="password"
        className="field-input"
        autoComplete={autoComplete}
        aria-invalid={errs[name] ? true : undefined}
        aria-describedby={describedBy(`pw-${name}`, { error: errs[name], hint })}
        {...form.register(name)}
      />
    </Field>
  );
  return (
    <Section id="password" title="Password">
      <form
        noValidate
        className="space-y-3"
        onSubmit={form.handleSubmit(async (v) => {
          setProblem(null);
          setDone(false);
          const { error } = await authClient.changePassword({
            currentPassword: v.currentPassword,
            newPassword: v.newPassword,
            revokeOtherSessions: true,
          });
          if (error) {
            const message = authMessage(error, "We could not change the password. Please try again.");
            if (error.code === "INVALID_PASSWORD") form.setError("currentPassword", { message });
            else form.setError("newPassword", { message: `New password: ${message}` });
            setProblem(null);
          } else {
            setDone(true);
            form.reset();
          }
        })}
      >
        {field("currentPassword", "Current password", "current-password")}
        {field("newPassword", "New password", "new-password", "At least 8 characters; not one of the most common passwords.")}
        {field("confirm", "Repeat the new password", "new-password")}
        <button type="submit" className="btn-primary" disabled={form.formState.isSubmitting}>
          {form.formState.isSubmitting ? "Changing…" : "Change password"}
        </button>
      </form>
      {done ? (
        <Notice tone="success" live title="Password changed">
          <p>Every other device where you were signed in has been signed out.</p>
        </Notice>
      ) : null}
      {problem ? (
        <Notice tone="error" live>
          <p>{problem}</p>
        </Notice>
      ) : null}
    </Section>
  );
}

function CloseSection({ openJobs, openClaims }: { openJobs: OwnerAccountView["openJobs"]; openClaims: number }) {
  const router = useRouter();
  const form = useForm<z.input<typeof closeAccountSchema>, unknown, z.output<typeof closeAccountSchema>>({
    resolver: zodResolver(closeAccountSchema),
    defaultValues: { password: "", confirm: false as unknown as true },
  });
  const close = useMutation({
    mutationFn: (body: z.output<typeof closeAccountSchema>) => api("/api/portal/account/close", { method: "POST", body }),
    onSuccess: () => {
      // Every session has ended: the next page is the public one.
      router.replace("/");
      router.refresh();
    },
    onError: (e) => {
      if (e instanceof ApiError && e.fields.password) form.setError("password", { message: e.fields.password });
    },
  });
  const errs = form.formState.errors;
  const blocked = openJobs.length > 0 || openClaims > 0;
  return (
    <Section id="close" title="Close my account">
      <div className="space-y-2">
        <p>
          <strong>What the shop keeps.</strong> The records tax law and your warranty ask us to keep: each job with its estimates, payments,
          refunds, receipts and invoices; the certificates of your sets and any claims on them; the messages and photos on each job; and the
          address a finished job was shipped to. They stay with the shop for as long as the law asks, no longer, and are no longer tied to
          your name, e-mail or phone. A certificate stays valid: a later buyer can still check its code.
        </p>
        <p>
          <strong>What is removed.</strong> Your name, e-mail address and phone number on the account, your address book, your password and
          every session: you are signed out everywhere and can no longer sign in. Closing cannot be undone; to bring a set in again later,
          make a new account.
        </p>
      </div>
      {blocked ? (
        <Notice tone="caution" title="Not yet: something is still open" live>
          {openJobs.length > 0 ? (
            <>
              <p>These jobs must reach their end first (returned, declined or cancelled):</p>
              <ul className="list-disc pl-5" data-testid="open-jobs">
                {openJobs.map((j) => (
                  <li key={j.id}>
                    <Link href={`/portal/jobs/${j.id}`}>{j.number}</Link> — {j.setName}: {j.stateLabel}
                  </li>
                ))}
              </ul>
            </>
          ) : null}
          {openClaims > 0 ? <p>A warranty claim is still open; the shop answers it first.</p> : null}
        </Notice>
      ) : null}
      <form noValidate className="space-y-3" onSubmit={form.handleSubmit((v) => close.mutate(v))}>
        <Field id="close-password" label="Your password, to confirm" error={errs.password?.message}>
          <input
            id="close-password"
            type="password"
            className="field-input"
            autoComplete="current-password"
            aria-invalid={errs.password ? true : undefined}
            aria-describedby={describedBy("close-password", { error: errs.password })}
            {...form.register("password")}
          />
        </Field>
        <div>
          <label className="inline-flex items-start gap-2">
            <input
              type="checkbox"
              className="mt-1"
              aria-describedby={errs.confirm ? "close-confirm-error" : undefined}
              {...form.register("confirm")}
            />
            <span>I understand what the shop keeps and what is removed, and that closing cannot be undone.</span>
          </label>
          {errs.confirm?.message ? (
            <p id="close-confirm-error" className="field-error" role="alert">
              {errs.confirm.message}
            </p>
          ) : null}
        </div>
        <button type="submit" className="btn-primary bg-fail hover:bg-fail" disabled={close.isPending || blocked}>
          {close.isPending ? "Closing…" : "Close my account"}
        </button>
      </form>
      {close.isError && !(close.error instanceof ApiError && close.error.fields.password) ? (
        <Notice tone="error" live>
          <p>{close.error.message}</p>
        </Notice>
      ) : null}
    </Section>
  );
}

export function AccountView({ initial, emailChanged }: { initial: OwnerAccountView; emailChanged: boolean }) {
  const query = useQuery({
    queryKey: accountKey,
    queryFn: () => api<OwnerAccountView>("/api/portal/account"),
    initialData: initial,
  });
  const v = query.data;
  return (
    <div className="mx-auto max-w-3xl space-y-8">
      <div>
        <h1 className="text-3xl font-bold">My account</h1>
        <p className="text-bakelite-soft">Your details, where we send your sets back, and how you sign in.</p>
      </div>
      <ProfileSection profile={v.profile} />
      <AddressesSection addresses={v.addresses} defaultName={v.profile.name} />
      <EmailSection email={v.profile.email} emailChanged={emailChanged} />
      <PasswordSection />
      <CloseSection openJobs={v.openJobs} openClaims={v.openClaims} />
    </div>
  );
}
