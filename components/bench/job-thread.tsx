"use client";

// Parses with zod in the browser: its settings (no eval, field words) first.
import "@/lib/client/zod-setup";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useCallback, useEffect, useState } from "react";
import { PhotoPicker, type PhotoPickerState } from "@/components/photo-picker";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { api, ApiError, errorText, retryLostAnswer } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import type { StaffThread } from "@/lib/server/services/messages";
import { benchNoteSchema } from "@/lib/validation/bench";
import { MAX_MESSAGE_PHOTOS, messageFormSchema } from "@/lib/validation/messages";
import { useShopTimeZone } from "@/components/shop-time-zone";
import { formatDateTime } from "@/lib/engine/dates";

type Audience = "owner" | "workshop";

// The job's thread for the workshop: the owner's messages, the shop's, and workshop-only notes, with a
// composer that writes to the owner (photos allowed, e-mailed to them) or a note the owner never sees.
function Composer({ jobId }: { jobId: string }) {
  const qc = useQueryClient();
  const [audience, setAudience] = useState<Audience>("owner");
  const [body, setBody] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [idempotencyKey, setIdempotencyKey] = useState(() => crypto.randomUUID());
  const [pickerKey, setPickerKey] = useState(0);
  const [photos, setPhotos] = useState<PhotoPickerState>({ tickets: [], busy: false });
  const onPhotos = useCallback((s: PhotoPickerState) => setPhotos(s), []);
  const m = useMutation({
    mutationFn: (v: { body: string; idempotencyKey: string; photos: string[]; audience: Audience }) =>
      v.audience === "owner"
        ? api(`/api/bench/jobs/${jobId}/messages`, {
            method: "POST",
            body: { body: v.body, idempotencyKey: v.idempotencyKey, photos: v.photos },
          })
        : api(`/api/bench/jobs/${jobId}/notes`, { method: "POST", body: { body: v.body, idempotencyKey: v.idempotencyKey } }),
    retry: retryLostAnswer,
    onSuccess: () => {
      setBody("");
      setError(null);
      setIdempotencyKey(crypto.randomUUID());
      setPickerKey((k) => k + 1);
      setPhotos({ tickets: [], busy: false });
      void qc.invalidateQueries({ queryKey: benchKeys.messages(jobId) });
      void qc.invalidateQueries({ queryKey: benchKeys.job(jobId) });
    },
    onError: (e) => {
      if (e instanceof ApiError && e.fields.idempotencyKey) {
        setIdempotencyKey(crypto.randomUUID());
        void qc.invalidateQueries({ queryKey: benchKeys.messages(jobId) });
      }
      setError(e instanceof ApiError ? (e.fields.body ?? e.fields.photos ?? errorText(e)) : errorText(e));
    },
  });
  const hint =
    audience === "owner"
      ? "The owner reads it on their job page and gets it by e-mail. The job stays where it is."
      : "Only the workshop sees this note.";
  return (
    <form
      noValidate
      className="space-y-2"
      aria-label="Write on the thread"
      onSubmit={(e) => {
        e.preventDefault();
        const parsed = (audience === "owner" ? messageFormSchema : benchNoteSchema.pick({ body: true })).safeParse({ body });
        if (!parsed.success) return setError(parsed.error.issues[0]?.message ?? "Write a message first.");
        if (audience === "owner" && photos.busy) return setError("Please wait until every photo has finished uploading.");
        setError(null);
        m.mutate({ body: parsed.data.body, idempotencyKey, photos: audience === "owner" ? photos.tickets : [], audience });
      }}
    >
      <fieldset className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
        <legend className="field-label">Who reads it</legend>
        <label className="inline-flex items-center gap-1.5">
          <input type="radio" name="thread-audience" checked={audience === "owner"} onChange={() => setAudience("owner")} />
          The owner (and the workshop)
        </label>
        <label className="inline-flex items-center gap-1.5">
          <input type="radio" name="thread-audience" checked={audience === "workshop"} onChange={() => setAudience("workshop")} />
          Workshop only
        </label>
      </fieldset>
      <Field
        id="thread-body"
        label={audience === "owner" ? "Message to the owner" : "Workshop note"}
        error={error ?? undefined}
        hint={hint}
      >
        <textarea
          id="thread-body"
          rows={3}
          className="field-input"
          value={body}
          onChange={(e) => setBody(e.target.value)}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy("thread-body", { error, hint })}
        />
      </Field>
      {audience === "owner" ? (
        <PhotoPicker
          key={pickerKey}
          endpoint="messagePhotos"
          max={MAX_MESSAGE_PHOTOS}
          inputId="thread-photos"
          label="Photos for this message"
          compact
          onChange={onPhotos}
        />
      ) : null}
      <button type="submit" className="btn-secondary" disabled={m.isPending}>
        {m.isPending ? "Sending…" : audience === "owner" ? "Send to the owner" : "Add workshop note"}
      </button>
    </form>
  );
}

export function JobThread({ jobId }: { jobId: string }) {
  const timeZone = useShopTimeZone();
  const qc = useQueryClient();
  const q = useQuery({ queryKey: benchKeys.messages(jobId), queryFn: () => api<StaffThread>(`/api/bench/jobs/${jobId}/messages`) });
  const markRead = useMutation({
    mutationFn: (lastMessageId: string) => api(`/api/bench/jobs/${jobId}/messages/read`, { method: "POST", body: { lastMessageId } }),
    onSuccess: () => void qc.invalidateQueries({ queryKey: benchKeys.queues() }),
  });
  const newest = q.data?.messages.at(-1);
  const unread = q.data?.unread ?? 0;
  const { mutate } = markRead;
  useEffect(() => {
    if (newest && unread > 0) mutate(newest.id);
  }, [newest, unread, mutate]);
  return (
    <section className="card space-y-3 p-3" aria-labelledby="thread-heading">
      <h2 id="thread-heading" className="text-lg font-semibold">
        Messages
        {unread > 0 ? (
          <span className="ml-2 rounded-full border border-ember px-2 py-0.5 text-sm text-ember-dark">{unread} new from the owner</span>
        ) : null}
      </h2>
      {q.isError ? <Notice tone="error">{errorText(q.error)}</Notice> : null}
      {q.data?.messages.length ? (
        <ol className="space-y-2 text-sm">
          {q.data.messages.map((m) => (
            <li
              key={m.id}
              data-unread={m.unread ? "true" : undefined}
              data-internal={m.internal ? "true" : undefined}
              className={`rounded border p-2 ${m.internal ? "border-dashed border-brass bg-dial-deep" : m.unread ? "border-ember" : "border-dial-rule"}`}
            >
              <p className="text-xs text-bakelite-muted">
                {m.unread ? <span className="mr-1 rounded border border-ember px-1 font-semibold text-ember-dark">New</span> : null}
                <span className="font-semibold text-bakelite">{m.fromOwner ? `${m.authorName} (owner)` : m.authorName}</span>
                {m.internal ? " · workshop only" : ""}
                {m.isQuestion ? " · question" : ""} · {formatDateTime(m.createdAt, { timeZone, style: "compact" })}
              </p>
              <p className="whitespace-pre-wrap">{m.body}</p>
              {m.photos.length ? (
                <ul className="mt-1 flex flex-wrap gap-2" aria-label="Photos with this message">
                  {m.photos.map((p) => (
                    <li key={p.id}>
                      <a href={p.url} target="_blank" rel="noreferrer">
                        {/* eslint-disable-next-line @next/next/no-img-element -- photos come re-encoded from our own authorised route; the image optimiser would fetch them without the session */}
                        <img src={p.thumbUrl} alt={p.name} className="h-20 w-20 rounded object-cover" />
                      </a>
                    </li>
                  ))}
                </ul>
              ) : null}
            </li>
          ))}
        </ol>
      ) : q.isSuccess ? (
        <p className="text-sm text-bakelite-muted">No messages yet.</p>
      ) : null}
      <Composer jobId={jobId} />
    </section>
  );
}
