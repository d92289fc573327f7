import "server-only";
import { createUploadthing, type FileRouter } from "uploadthing/next";
import { UploadThingError, UTApi } from "uploadthing/server";
import { countStoredPhotosByUploaderSince } from "@/db/queries/photos";
import { canAccess } from "@/lib/engine/permissions";
import { viewerFromHeaders } from "@/lib/server/session";
import { toAppError } from "@/lib/server/errors";
import { acceptPhoto, PhotoRefused } from "@/lib/server/uploads/photos";
import { PHOTO_STORE_RETRY_MESSAGE, PhotoStoreUnavailable } from "@/lib/server/uploads/storage";
import { MAX_MESSAGE_PHOTOS } from "@/lib/validation/messages";
import { MAX_PHOTO_BYTES, MAX_PHOTOS } from "@/lib/validation/quote";

/** Photos one person may store per day: generous for real requests, a ceiling for abuse. */
export const DAILY_PHOTO_QUOTA = 120;

function friendly(message: string): string {
  if (message.includes("FileSizeMismatch")) return `A photo is larger than ${MAX_PHOTO_BYTES / 1024 / 1024} MB. Please send a smaller one.`;
  if (message.includes("FileCountMismatch")) return `At most ${MAX_PHOTOS} photos per request.`;
  if (message.includes("InvalidFileType") || message.includes("UnknownFileType")) return "Only photos (JPEG, PNG or WebP) can be added.";
  return message;
}

const f = createUploadthing({ errorFormatter: (err) => ({ message: friendly(`${err.message} ${String(err.cause ?? "")}`).trim() }) });

export type PhotoServerData = { ok: true; ticket: string; width: number; height: number } | { ok: false; error: string };

// The SDK trusts the browser's declared type and size; the bytes are judged in onUploadComplete.
async function fetchCapped(url: string, cap: number): Promise<Buffer | "too-large"> {
  const res = await fetch(url, { signal: AbortSignal.timeout(30_000) });
  if (!res.ok || !res.body) throw new Error(`upload service answered ${res.status}`);
  const chunks: Buffer[] = [];
  let total = 0;
  for await (const chunk of res.body as AsyncIterable<Uint8Array>) {
    total += chunk.byteLength;
    if (total > cap) return "too-large";
    chunks.push(Buffer.from(chunk));
  }
  return Buffer.concat(chunks);
}

type Viewer = NonNullable<Awaited<ReturnType<typeof viewerFromHeaders>>>;

// Who may store photos through a slug, then the per-person daily quota shared by every slug.
function photoMiddleware(allowed: (viewer: Viewer) => boolean) {
  return async ({ req }: { req: Request }) => {
    const viewer = await viewerFromHeaders(req.headers);
    if (!viewer || !allowed(viewer)) {
      throw new UploadThingError({ code: "FORBIDDEN", message: "Please sign in to add photos." });
    }
    const recent = await countStoredPhotosByUploaderSince({ uploaderId: viewer.id, since: new Date(Date.now() - 24 * 3600 * 1000) });
    if (recent >= DAILY_PHOTO_QUOTA) {
      throw new UploadThingError({
        code: "FILE_LIMIT_EXCEEDED",
        message: "You have sent a lot of photos today. Please try again tomorrow or write to the shop.",
      });
    }
    return { uploaderId: viewer.id };
  };
}

// The same byte checks, re-encoding and metadata stripping for every photo, whichever form it came from.
async function completePhoto({
  file,
  metadata,
}: {
  file: { ufsUrl: string; name: string; key: string };
  metadata: { uploaderId: string };
}): Promise<PhotoServerData> {
  // Warnings and errors only: the SDK logs signed file URLs at its default level.
  const utapi = new UTApi({ logLevel: "Warning" });
  try {
    const bytes = await fetchCapped(file.ufsUrl, MAX_PHOTO_BYTES);
    if (bytes === "too-large") {
      return { ok: false, error: `This photo is larger than ${MAX_PHOTO_BYTES / 1024 / 1024} MB. Please send a smaller one.` };
    }
    const accepted = await acceptPhoto({ bytes, name: file.name, uploaderId: metadata.uploaderId });
    return { ok: true, ...accepted };
  } catch (error) {
    if (error instanceof PhotoRefused) return { ok: false, error: error.message };
    if (error instanceof PhotoStoreUnavailable) {
      console.error("[bandedge] photo store unavailable during an upload", error.message, error.cause);
      return { ok: false, error: PHOTO_STORE_RETRY_MESSAGE };
    }
    const known = toAppError(error);
    // The database did not answer: nothing was kept, and the upload is not confirmed, so the browser sends it
    // again (the same answer as an app that stopped half-way), rather than calling the photo itself bad.
    if (known.code === "unavailable") throw known;
    return { ok: false, error: "This photo could not be processed. Please try again." };
  } finally {
    // The original keeps its metadata (GPS included): only the re-encoded copy is kept.
    await utapi.deleteFiles(file.key).catch((e: unknown) => console.error("[bandedge] could not delete the original upload", e));
  }
}

export const uploadRouter = {
  quotePhotos: f({ image: { maxFileSize: "32MB", maxFileCount: MAX_PHOTOS } }, { awaitServerData: true })
    .middleware(photoMiddleware((v) => canAccess(v, "quote.request") || canAccess(v, "claim.open") || canAccess(v, "job.intake")))
    .onUploadComplete(completePhoto),
  // Photos for a message on a job's thread, from the owner or the workshop; attached when the message is posted.
  messagePhotos: f({ image: { maxFileSize: "32MB", maxFileCount: MAX_MESSAGE_PHOTOS } }, { awaitServerData: true })
    .middleware(photoMiddleware((v) => canAccess(v, "message.post")))
    .onUploadComplete(completePhoto),
} satisfies FileRouter;

export type UploadRouter = typeof uploadRouter;
