"use client";

import { genUploader } from "uploadthing/client";
import { useCallback, useEffect, useRef, useState } from "react";
import type { PhotoServerData, UploadRouter } from "@/lib/server/uploads/router";
import { MAX_PHOTO_BYTES, MAX_PHOTOS } from "@/lib/validation/quote";

const { uploadFiles } = genUploader<UploadRouter>({ url: "/api/uploadthing", package: "bandedge" });

const ACCEPT = ["image/jpeg", "image/png", "image/webp"];

type Item = {
  id: string;
  file: File;
  preview: string;
  progress: number;
  status: "uploading" | "done" | "refused" | "failed";
  /** The browser could not draw the file (not an image it can decode): show a plain mark, not a broken image. */
  noPreview?: boolean;
  message?: string;
  ticket?: string;
  controller?: AbortController;
};

export type PhotoPickerState = { tickets: string[]; busy: boolean };

// Drag-and-drop or pick; one upload per file so each has its own progress bar, retry and remove.
export function PhotoPicker({
  onChange,
  error,
  describedById,
  endpoint = "quotePhotos",
  max = MAX_PHOTOS,
  inputId = "photos",
  label = "Photos of the set",
  compact = false,
  optional = false,
}: {
  onChange: (s: PhotoPickerState) => void;
  error?: string;
  describedById?: string;
  /** Which upload slug: both run the same byte checks, re-encoding and metadata stripping. */
  endpoint?: "quotePhotos" | "messagePhotos";
  max?: number;
  inputId?: string;
  label?: string;
  /** Photos may be left out (the counter's intake): the hint does not ask for at least one. */
  optional?: boolean;
  compact?: boolean;
}) {
  const [items, setItems] = useState<Item[]>([]);
  const [announce, setAnnounce] = useState("");
  const [note, setNote] = useState<string | null>(null);
  const [dragging, setDragging] = useState(false);
  const inputRef = useRef<HTMLInputElement>(null);
  const chooseRef = useRef<HTMLButtonElement>(null);
  const listRef = useRef<HTMLUListElement>(null);
  const itemsRef = useRef<Item[]>([]);
  useEffect(() => {
    itemsRef.current = items;
  }, [items]);

  useEffect(() => {
    onChange({
      tickets: items.filter((i) => i.status === "done" && i.ticket).map((i) => i.ticket!),
      busy: items.some((i) => i.status === "uploading"),
    });
  }, [items, onChange]);

  useEffect(() => () => itemsRef.current.forEach((i) => URL.revokeObjectURL(i.preview)), []);

  const patch = useCallback(
    (id: string, change: Partial<Item>) => setItems((all) => all.map((i) => (i.id === id ? { ...i, ...change } : i))),
    [],
  );

  const start = useCallback(
    async (item: Item) => {
      const controller = new AbortController();
      patch(item.id, { status: "uploading", progress: 0, message: undefined, controller });
      try {
        const [result] = await uploadFiles(endpoint, {
          files: [item.file],
          signal: controller.signal,
          onUploadProgress: ({ progress }) => patch(item.id, { progress }),
        });
        const data = result?.serverData as PhotoServerData | undefined;
        if (data?.ok) {
          patch(item.id, { status: "done", progress: 100, ticket: data.ticket });
          setAnnounce(`${item.file.name} uploaded.`);
        } else {
          const message = data && !data.ok ? data.error : "The shop's server did not accept this photo.";
          patch(item.id, { status: "refused", message });
          setAnnounce(`${item.file.name} was not accepted: ${message}`);
        }
      } catch (e) {
        if (controller.signal.aborted) return;
        const message =
          e instanceof Error && e.message && !/^XHR failed|UPLOAD_FAILED/.test(e.message) ? e.message : "The upload was interrupted.";
        patch(item.id, { status: "failed", message });
        setAnnounce(`${item.file.name} did not upload: ${message}`);
      }
    },
    [patch, endpoint],
  );

  const add = useCallback(
    (files: FileList | File[]) => {
      setNote(null);
      const list = Array.from(files);
      const room = max - itemsRef.current.filter((i) => i.status !== "refused").length;
      if (list.length > room)
        setNote(
          `At most ${max} photos per ${endpoint === "quotePhotos" ? "request" : "message"}: ${list.length - Math.max(0, room)} ${list.length - room === 1 ? "was" : "were"} not added.`,
        );
      const fresh: Item[] = list.slice(0, Math.max(0, room)).map((file) => {
        const item: Item = { id: crypto.randomUUID(), file, preview: URL.createObjectURL(file), progress: 0, status: "uploading" };
        if (!ACCEPT.includes(file.type)) return { ...item, status: "refused", message: "Only photos (JPEG, PNG or WebP) can be added." };
        if (file.size > MAX_PHOTO_BYTES)
          return {
            ...item,
            status: "refused",
            message: `This photo is larger than ${MAX_PHOTO_BYTES / 1024 / 1024} MB. Please send a smaller one.`,
          };
        return item;
      });
      setItems((all) => [...all, ...fresh]);
      const uploading = fresh.filter((i) => i.status === "uploading");
      if (uploading.length) setAnnounce(`Uploading ${uploading.map((i) => i.file.name).join(", ")}…`);
      for (const item of uploading) void start(item);
    },
    [start, max, endpoint],
  );

  const remove = (item: Item) => {
    item.controller?.abort();
    URL.revokeObjectURL(item.preview);
    // The focused Remove button goes away with its photo: keep the keyboard user's place by moving focus to
    // the next photo's Remove button, else the previous one's, else back to "Choose photos".
    const index = itemsRef.current.findIndex((i) => i.id === item.id);
    const neighbour = itemsRef.current[index + 1] ?? itemsRef.current[index - 1];
    setItems((all) => all.filter((i) => i.id !== item.id));
    setAnnounce(`${item.file.name} removed.`);
    requestAnimationFrame(() => {
      const next = neighbour ? listRef.current?.querySelector<HTMLButtonElement>(`button[data-remove="${neighbour.id}"]`) : null;
      (next ?? chooseRef.current)?.focus();
    });
  };

  return (
    <div className="space-y-3">
      <div
        className={`rounded-card border-2 border-dashed ${compact ? "p-3" : "p-6"} text-center ${dragging ? "border-ember bg-ember-light" : error ? "border-fail bg-white" : "border-bakelite-muted bg-white"}`}
        onDragOver={(e) => {
          e.preventDefault();
          setDragging(true);
        }}
        onDragLeave={() => setDragging(false)}
        onDrop={(e) => {
          e.preventDefault();
          setDragging(false);
          if (e.dataTransfer.files.length) add(e.dataTransfer.files);
        }}
      >
        <p className={compact ? "text-sm" : "text-base"}>Drag photos here, or</p>
        <button
          ref={chooseRef}
          type="button"
          className={compact ? "btn-secondary mt-1 px-2 py-1" : "btn-secondary mt-2"}
          onClick={() => inputRef.current?.click()}
          aria-describedby={describedById}
        >
          Choose photos
        </button>
        <input
          ref={inputRef}
          id={inputId}
          type="file"
          accept={ACCEPT.join(",")}
          multiple
          className="sr-only"
          tabIndex={-1}
          aria-label={label}
          onChange={(e) => {
            if (e.target.files?.length) add(e.target.files);
            e.target.value = "";
          }}
        />
        {endpoint === "quotePhotos" ? (
          <p className="field-hint">
            JPEG, PNG or WebP, up to {MAX_PHOTO_BYTES / 1024 / 1024} MB each,{" "}
            {optional ? `up to ${max} photos, if any` : `1 to ${max} photos`}. Front, back, chassis, dial and any labels help most.
          </p>
        ) : (
          <p className="field-hint">
            Optional: JPEG, PNG or WebP, up to {MAX_PHOTO_BYTES / 1024 / 1024} MB each, at most {max}. Location and camera details are
            removed.
          </p>
        )}
      </div>
      {note ? <p className="field-error">{note}</p> : null}
      <p className="sr-only" role="status" aria-live="polite">
        {announce}
      </p>
      {items.length ? (
        <ul ref={listRef} className="grid gap-3 sm:grid-cols-2" aria-label="Photos added">
          {items.map((item) => (
            <li key={item.id} className="card flex gap-3 p-3" data-status={item.status}>
              {item.status === "refused" || item.noPreview ? (
                <span
                  aria-hidden="true"
                  className="flex h-16 w-16 shrink-0 items-center justify-center rounded border border-dial-rule bg-dial-deep text-2xl text-bakelite-muted"
                >
                  ⊘
                </span>
              ) : (
                // eslint-disable-next-line @next/next/no-img-element -- a local blob preview of the chosen file; the image optimiser cannot read it
                <img
                  src={item.preview}
                  alt=""
                  className="h-16 w-16 shrink-0 rounded object-cover"
                  onError={() => patch(item.id, { noPreview: true })}
                />
              )}
              <div className="min-w-0 flex-1 space-y-1">
                <p className="truncate text-sm font-semibold">{item.file.name}</p>
                {item.status === "uploading" ? (
                  <>
                    <progress
                      className="h-2 w-full accent-ember"
                      max={100}
                      value={item.progress}
                      aria-label={`Upload of ${item.file.name}`}
                    />
                    <p className="text-xs text-bakelite-muted">Uploading… {Math.round(item.progress)} %</p>
                  </>
                ) : item.status === "done" ? (
                  <p className="text-sm text-pass">
                    <span aria-hidden="true">✓ </span>Uploaded
                  </p>
                ) : (
                  <p className="text-sm text-fail">
                    <span aria-hidden="true">✕ </span>
                    {item.message}
                  </p>
                )}
                <div className="flex gap-2">
                  {item.status === "failed" ||
                  (item.status === "refused" && item.message === "The shop's server did not accept this photo.") ? (
                    <button type="button" className="btn-quiet px-2 py-1" onClick={() => void start(item)}>
                      Retry<span className="sr-only"> {item.file.name}</span>
                    </button>
                  ) : null}
                  <button type="button" className="btn-quiet px-2 py-1" data-remove={item.id} onClick={() => remove(item)}>
                    Remove<span className="sr-only"> {item.file.name}</span>
                  </button>
                </div>
              </div>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
