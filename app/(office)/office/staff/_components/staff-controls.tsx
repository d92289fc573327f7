"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import type { Role } from "@/lib/engine/permissions";
import { ROLE_LABEL } from "@/lib/engine/permissions";
import { staffInviteSchema } from "@/lib/validation/account";
import { changeStaffRole, inviteStaff, setStaffActive } from "../actions";

type Person = { id: string; name: string; email: string; role: Role; active: boolean };

export function StaffRow({ person, self }: { person: Person; self: boolean }) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [problem, setProblem] = useState<string | null>(null);
  // Deactivating signs the person out everywhere at once: it is asked for, named, and confirmed.
  const [confirming, setConfirming] = useState(false);
  const run = (fn: () => Promise<{ ok: boolean; error?: { message: string } }>) =>
    start(async () => {
      setProblem(null);
      const r = await fn();
      if (!r.ok) setProblem(r.error?.message ?? "That did not work.");
      router.refresh();
    });
  return (
    <tr>
      <td>{person.name}</td>
      <td>{person.email}</td>
      <td>
        <label className="sr-only" htmlFor={`role-${person.id}`}>
          Role of {person.name}
        </label>
        <select
          id={`role-${person.id}`}
          className="rounded-card border border-bakelite-muted bg-white px-2 py-1"
          defaultValue={person.role}
          disabled={self || pending}
          onChange={(e) => run(() => changeStaffRole({ userId: person.id, role: e.target.value }))}
        >
          {(["technician", "owner", "customer"] as const).map((r) => (
            <option key={r} value={r}>
              {ROLE_LABEL[r]}
            </option>
          ))}
        </select>
      </td>
      <td>{person.active ? "Active" : "Deactivated"}</td>
      <td className="space-x-2">
        {self ? (
          <span className="text-bakelite-muted">You</span>
        ) : (
          <button
            type="button"
            className="btn-secondary px-2 py-1"
            disabled={pending || confirming}
            onClick={() => (person.active ? setConfirming(true) : run(() => setStaffActive({ userId: person.id, active: true })))}
          >
            {person.active ? `Deactivate ${person.name}` : `Reactivate ${person.name}`}
          </button>
        )}
        {confirming ? (
          <div role="alertdialog" aria-labelledby={`deactivate-${person.id}`} className="mt-2 max-w-sm space-y-2 text-left">
            <p id={`deactivate-${person.id}`} className="text-sm">
              Deactivate {person.name}? They are signed out everywhere at once and cannot sign in until you reactivate them. We e-mail{" "}
              {person.email} to tell them.
            </p>
            <div className="flex gap-2">
              <button
                type="button"
                className="btn-primary px-2 py-1"
                disabled={pending}
                onClick={() => {
                  setConfirming(false);
                  run(() => setStaffActive({ userId: person.id, active: false }));
                }}
              >
                Yes, deactivate {person.name}
              </button>
              <button type="button" className="btn-quiet px-2 py-1" onClick={() => setConfirming(false)}>
                Cancel
              </button>
            </div>
          </div>
        ) : null}
        {problem ? (
          <span role="alert" className="text-fail">
            {problem}
          </span>
        ) : null}
      </td>
    </tr>
  );
}

export function InviteForm() {
  const router = useRouter();
  const [message, setMessage] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  const { register, handleSubmit, formState, reset } = useForm<z.input<typeof staffInviteSchema>>({
    resolver: zodResolver(staffInviteSchema),
    defaultValues: { role: "technician" },
  });
  const { errors } = formState;
  // A set owner's e-mail is refused; converting that account needs its own confirmation naming what it holds.
  const [conversion, setConversion] = useState<{ values: z.input<typeof staffInviteSchema>; holdings: string } | null>(null);
  const send = async (values: z.input<typeof staffInviteSchema>) => {
    const r = await inviteStaff(values);
    if (r.ok) {
      setConversion(null);
      setMessage({ tone: "success", text: `Invitation sent to ${values.email}.` });
      reset({ name: "", email: "", role: "technician" });
      router.refresh();
      return;
    }
    setMessage({ tone: "error", text: r.error.message });
    const holdings = r.error.fields?.holdings;
    setConversion(holdings ? { values: { ...values, convertCustomer: undefined, holdings: undefined }, holdings } : null);
  };
  const onSubmit = handleSubmit((values) => send(values));
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-3 sm:grid-cols-2">
      <Field id="invite-name" label="Name" error={errors.name?.message}>
        <input
          id="invite-name"
          className="field-input"
          aria-invalid={!!errors.name}
          aria-describedby={describedBy("invite-name", { error: errors.name })}
          {...register("name")}
        />
      </Field>
      <Field id="invite-email" label="E-mail" error={errors.email?.message}>
        <input
          id="invite-email"
          type="email"
          className="field-input"
          aria-invalid={!!errors.email}
          aria-describedby={describedBy("invite-email", { error: errors.email })}
          {...register("email")}
        />
      </Field>
      <Field id="invite-role" label="Role">
        <select id="invite-role" className="field-input" {...register("role")}>
          <option value="technician">Technician</option>
          <option value="owner">Shop owner</option>
        </select>
      </Field>
      <div className="flex items-end">
        <button type="submit" className="btn-primary" disabled={formState.isSubmitting}>
          Send invitation
        </button>
      </div>
      {message ? (
        <div className="sm:col-span-2">
          <Notice tone={message.tone} live>
            <p>{message.text}</p>
          </Notice>
        </div>
      ) : null}
      {conversion ? (
        <div role="alertdialog" aria-labelledby="convert-account" className="space-y-2 rounded-card border border-fail p-3 sm:col-span-2">
          <p id="convert-account" className="text-sm">
            Convert the set owner&apos;s account {conversion.values.email} into a staff account? It holds {conversion.holdings}. They keep
            their records and still see and answer their own jobs, certificates and claims under &ldquo;My sets&rdquo;, and they gain staff
            access to every customer&apos;s jobs.
          </p>
          <div className="flex flex-wrap gap-2">
            <button
              type="button"
              className="btn-secondary"
              onClick={() => send({ ...conversion.values, convertCustomer: true, holdings: conversion.holdings })}
            >
              Yes, convert the account holding {conversion.holdings}
            </button>
            <button type="button" className="btn-quiet" onClick={() => setConversion(null)}>
              Cancel
            </button>
          </div>
        </div>
      ) : null}
    </form>
  );
}
