"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation } from "@tanstack/react-query";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Notice } from "@/components/ui/notice";
import { NOTIFICATION_KIND_LABEL, NOTIFICATION_KINDS, type NotificationPreferences } from "@/lib/engine/notifications";
import { officeFetch } from "@/lib/client/office-api";
import { notificationPreferencesSchema, type NotificationPreferencesInput } from "@/lib/validation/notifications";

const KIND_HINT: Record<(typeof NOTIFICATION_KINDS)[number], string> = {
  quote_requested: "A set owner asks for a quote (no technician holds it yet, so the shop owner hears of it).",
  owner_message: "A set owner writes on a job's thread. Workshop notes never make a notification.",
  estimate_decided: "A set owner approves or declines an estimate or a revision.",
  payment_received: "A deposit or balance payment arrives from the card processor.",
  refund_settled: "A refund the office asked for succeeds or fails.",
  claim_opened: "A set owner opens a warranty claim on a certificate.",
};

// One row per kind of event, one box per channel; saved together.
export function NotificationPreferencesForm({ initial }: { initial: NotificationPreferences }) {
  const [saved, setSaved] = useState(false);
  const form = useForm<NotificationPreferencesInput>({
    resolver: zodResolver(notificationPreferencesSchema),
    defaultValues: { preferences: initial },
  });
  const save = useMutation({
    mutationFn: (values: NotificationPreferencesInput) =>
      officeFetch<{ preferences: NotificationPreferences }>("/api/staff/notification-preferences", { method: "PUT", json: values }),
    onSuccess: (r) => {
      form.reset({ preferences: r.preferences });
      setSaved(true);
    },
  });
  return (
    <form
      onSubmit={form.handleSubmit((v) => {
        setSaved(false);
        save.mutate(v);
      })}
      className="space-y-4"
      aria-labelledby="notification-choices"
    >
      <div>
        <h2 id="notification-choices" className="text-xl font-bold">
          Notifications
        </h2>
        <p className="text-sm text-bakelite-soft">
          You hear of events on the jobs assigned to you; events on jobs no technician holds yet go to the shop owner. You are never told of
          what you did yourself.
        </p>
      </div>
      <fieldset className="card divide-y divide-dial-rule">
        <legend className="sr-only">What reaches you, and how</legend>
        {NOTIFICATION_KINDS.map((kind) => (
          <div key={kind} className="flex flex-col gap-2 p-3 sm:flex-row sm:items-center sm:justify-between sm:gap-4">
            <div className="min-w-0">
              <p className="font-semibold" id={`kind-${kind}`}>
                {NOTIFICATION_KIND_LABEL[kind]}
              </p>
              <p className="text-sm text-bakelite-soft">{KIND_HINT[kind]}</p>
            </div>
            <div className="flex shrink-0 gap-5 text-sm" role="group" aria-labelledby={`kind-${kind}`}>
              <label className="inline-flex min-h-9 items-center gap-2">
                <input type="checkbox" className="h-5 w-5" {...form.register(`preferences.${kind}.inApp`)} />
                In the app
              </label>
              <label className="inline-flex min-h-9 items-center gap-2">
                <input type="checkbox" className="h-5 w-5" {...form.register(`preferences.${kind}.email`)} />
                By e-mail
              </label>
            </div>
          </div>
        ))}
      </fieldset>
      {save.error ? (
        <Notice tone="error" live>
          {save.error.message}
        </Notice>
      ) : null}
      {saved && !form.formState.isDirty ? (
        <Notice tone="success" live>
          Your notification choices are saved.
        </Notice>
      ) : null}
      <button type="submit" className="btn-primary" disabled={save.isPending}>
        {save.isPending ? "Saving…" : "Save choices"}
      </button>
    </form>
  );
}
