"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useCallback, useState } from "react";
import { PhotoPicker, type PhotoPickerState } from "@/components/photo-picker";
import { useForm } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { MAX_MESSAGE_PHOTOS, messageFormSchema, type MessageForm, type MessageInput } from "@/lib/validation/messages";
import { api, ApiError } from "../../../_lib/api";
import { portalKeys } from "../../../_lib/query-keys";

// A lost answer (no connection, the server restarting) is retried with the same key: the shop gets it once.
const retryLostAnswer = (failures: number, e: Error) => failures < 2 && e instanceof ApiError && (e.status === 0 || e.status >= 500);

function postErrorText(e: Error): string {
  if (e instanceof ApiError && e.fields.idempotencyKey)
    return "An earlier version of this message already reached the shop; it is shown above. Send again to add this text as a new message.";
  return e.message;
}

// The form under the thread, loaded after the page is interactive so the job page's first load stays small.
export default function MessageComposer({ jobId }: { jobId: string }) {
  const queryClient = useQueryClient();
  // One key per composed message: kept while this message is retried, renewed once it is stored.
  const [idempotencyKey, setIdempotencyKey] = useState(() => crypto.randomUUID());
  // The picker is remounted (new key) once a message is stored, so its photos go with that message only.
  const [pickerKey, setPickerKey] = useState(0);
  const [photos, setPhotos] = useState<PhotoPickerState>({ tickets: [], busy: false });
  const [waitNote, setWaitNote] = useState(false);
  const onPhotos = useCallback((s: PhotoPickerState) => {
    setPhotos(s);
    if (!s.busy) setWaitNote(false);
  }, []);
  const { register, handleSubmit, reset, formState } = useForm<MessageForm>({
    resolver: zodResolver(messageFormSchema),
    defaultValues: { body: "" },
  });
  const post = useMutation({
    mutationFn: (v: MessageInput) =>
      api<{ id: string; duplicate: boolean }>(`/api/portal/jobs/${jobId}/messages`, { method: "POST", body: v }),
    retry: retryLostAnswer,
    onSuccess: async () => {
      reset({ body: "" });
      setIdempotencyKey(crypto.randomUUID());
      setPickerKey((k) => k + 1);
      setPhotos({ tickets: [], busy: false });
      // An answer may also move the job (the shop was waiting on it).
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: portalKeys.messages(jobId) }),
        queryClient.invalidateQueries({ queryKey: portalKeys.job(jobId) }),
      ]);
    },
    onError: async (e) => {
      // The text was changed after an earlier try that did reach the shop: show the thread as stored and
      // let the next send be a message of its own.
      if (e instanceof ApiError && e.fields.idempotencyKey) {
        setIdempotencyKey(crypto.randomUUID());
        await queryClient.invalidateQueries({ queryKey: portalKeys.messages(jobId) });
      }
    },
  });

  return (
    <form
      noValidate
      onSubmit={handleSubmit((v) => {
        if (photos.busy) {
          setWaitNote(true);
          return;
        }
        post.mutate({ ...v, idempotencyKey, photos: photos.tickets });
      })}
      className="space-y-2"
    >
      <Field
        id="message-body"
        label="Write to the shop"
        error={formState.errors.body?.message ?? (post.isError ? postErrorText(post.error) : undefined)}
      >
        <textarea
          id="message-body"
          rows={3}
          className="field-input"
          aria-invalid={!!formState.errors.body}
          aria-describedby={describedBy("message-body", { error: formState.errors.body })}
          {...register("body")}
        />
      </Field>
      <PhotoPicker
        key={pickerKey}
        endpoint="messagePhotos"
        max={MAX_MESSAGE_PHOTOS}
        inputId="message-photos"
        label="Photos for this message"
        compact
        onChange={onPhotos}
      />
      {waitNote ? <p className="field-error">Please wait until every photo has finished uploading.</p> : null}
      <button type="submit" className="btn-secondary" disabled={post.isPending}>
        {post.isPending ? "Sending…" : "Send message"}
      </button>
    </form>
  );
}
