import "server-only";
import { createHmac, randomUUID, timingSafeEqual } from "node:crypto";
import { fileTypeFromBuffer } from "file-type";
import sharp from "sharp";
import { env } from "../env";
import { AppError } from "../errors";
import { photoStore } from "./storage";
import { recordStoredUpload } from "@/db/queries/photos";
import { MAX_PHOTO_BYTES } from "@/lib/validation/quote";

// What the server accepts as a photo, judged from the bytes only (the browser's type and size are claims).
const ACCEPTED = new Set(["image/jpeg", "image/png", "image/webp"]);
/** Pixel-flood guard: a small file may claim an enormous canvas. 50 MP covers any phone or camera. */
export const MAX_INPUT_PIXELS = 50_000_000;
const MAX_EDGE = 2400;
const THUMB_EDGE = 480;

export class PhotoRefused extends Error {
  constructor(message: string) {
    super(message);
    this.name = "PhotoRefused";
  }
}

function indexOfSeq(buf: Buffer, seq: number[], from = 0): number {
  return buf.indexOf(Buffer.from(seq), from);
}

// A file that is also a ZIP (or carries markup/script) is refused even when it decodes as an image.
function looksPolyglot(buf: Buffer): boolean {
  // ZIP end-of-central-directory record near the end: what unzip tools look for.
  const tail = buf.subarray(Math.max(0, buf.length - 65_557));
  if (indexOfSeq(tail, [0x50, 0x4b, 0x05, 0x06]) >= 0) return true;
  // ZIP local file headers with a plausible "version needed" field.
  for (let i = indexOfSeq(buf, [0x50, 0x4b, 0x03, 0x04]); i >= 0; i = indexOfSeq(buf, [0x50, 0x4b, 0x03, 0x04], i + 1)) {
    const version = buf[i + 4];
    if (buf[i + 5] === 0 && version !== undefined && version >= 10 && version <= 63) return true;
  }
  const text = buf.toString("latin1").toLowerCase();
  return ["<script", "<html", "<?php", "<svg", "<iframe", "%pdf-"].some((m) => text.includes(m));
}

// JPEG must end with its end-of-image marker (a few padding bytes allowed); PNG with its IEND chunk.
function looksTruncated(buf: Buffer, mime: string): boolean {
  if (mime === "image/jpeg") {
    const end = buf.lastIndexOf(Buffer.from([0xff, 0xd9]));
    return end < 0 || buf.length - (end + 2) > 32;
  }
  if (mime === "image/png") {
    return buf.lastIndexOf(Buffer.from("IEND", "latin1")) < 0;
  }
  return false;
}

export type ProcessedPhoto = { image: Buffer; thumb: Buffer; width: number; height: number; mime: "image/jpeg" };

/**
 * Checks the real bytes and re-encodes them: orientation baked in, every bit of metadata (EXIF, GPS, XMP,
 * ICC) dropped, size bounded, and a thumbnail. Throws PhotoRefused with a message for the owner.
 */
export async function processPhoto(bytes: Buffer): Promise<ProcessedPhoto> {
  if (bytes.length === 0) throw new PhotoRefused("This file is empty.");
  if (bytes.length > MAX_PHOTO_BYTES)
    throw new PhotoRefused(`This photo is larger than ${Math.round(MAX_PHOTO_BYTES / 1024 / 1024)} MB. Please send a smaller one.`);
  const type = await fileTypeFromBuffer(bytes);
  if (!type || !ACCEPTED.has(type.mime)) throw new PhotoRefused("This file is not a JPEG, PNG or WebP photo.");
  if (looksPolyglot(bytes))
    throw new PhotoRefused("This file contains more than a photo (for example an archive or a web page) and cannot be accepted.");
  if (looksTruncated(bytes, type.mime)) throw new PhotoRefused("This photo seems incomplete (the file is cut off). Please send it again.");

  let meta: Awaited<ReturnType<ReturnType<typeof sharp>["metadata"]>>;
  try {
    meta = await sharp(bytes, { limitInputPixels: false }).metadata();
  } catch {
    throw new PhotoRefused("This photo could not be read. Please send it again or try another format.");
  }
  if (!meta.width || !meta.height) throw new PhotoRefused("This photo could not be read. Please send it again or try another format.");
  if (meta.width * meta.height > MAX_INPUT_PIXELS || (meta.pages ?? 1) > 1) {
    throw new PhotoRefused(
      `This image claims to be ${meta.width} × ${meta.height} pixels, which is far more than any photo needs. Please send a normal photo.`,
    );
  }

  try {
    const base = () => sharp(bytes, { limitInputPixels: MAX_INPUT_PIXELS, failOn: "warning", sequentialRead: true }).rotate();
    const [image, thumb] = await Promise.all([
      base()
        .resize({ width: MAX_EDGE, height: MAX_EDGE, fit: "inside", withoutEnlargement: true })
        .flatten({ background: "#ffffff" })
        .jpeg({ quality: 85 })
        .toBuffer({ resolveWithObject: true }),
      base()
        .resize({ width: THUMB_EDGE, height: THUMB_EDGE, fit: "inside", withoutEnlargement: true })
        .flatten({ background: "#ffffff" })
        .jpeg({ quality: 72 })
        .toBuffer(),
    ]);
    return { image: image.data, thumb, width: image.info.width, height: image.info.height, mime: "image/jpeg" };
  } catch {
    throw new PhotoRefused("This photo seems damaged or incomplete and could not be processed. Please send it again.");
  }
}

/** A display name that is only ever shown as text: no path, no control characters, bounded. */
export function cleanDisplayName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? "";
  const cleaned = base
    .replace(/[\u0000-\u001f\u007f]/g, "")
    .trim()
    .slice(0, 120);
  return cleaned || "photo";
}

// ---- a stored photo, vouched for until it is attached to a job ----

export type PhotoTicket = {
  key: string;
  thumbKey: string;
  width: number;
  height: number;
  bytes: number;
  name: string;
  uploaderId: string;
  at: number;
};

export const TICKET_TTL_MS = 24 * 3600 * 1000;

function ticketKey(): Buffer {
  return createHmac("sha256", env().BETTER_AUTH_SECRET).update("bandedge:photo-ticket").digest();
}

export function signTicket(t: PhotoTicket): string {
  const body = Buffer.from(JSON.stringify(t)).toString("base64url");
  const mac = createHmac("sha256", ticketKey()).update(body).digest("base64url");
  return `${body}.${mac}`;
}

/** Reads a ticket the browser sends back with the quote; only its uploader may use it, within a day. */
export function readTicket(token: string, uploaderId: string): PhotoTicket {
  const [body, mac] = token.split(".");
  const bad = new AppError("invalid_input", "A photo could not be matched to your upload. Please add it again.", {
    photos: "A photo could not be matched to your upload. Please add it again.",
  });
  if (!body || !mac) throw bad;
  const want = createHmac("sha256", ticketKey()).update(body).digest();
  const got = Buffer.from(mac, "base64url");
  if (got.length !== want.length || !timingSafeEqual(got, want)) throw bad;
  let t: PhotoTicket;
  try {
    t = JSON.parse(Buffer.from(body, "base64url").toString("utf8")) as PhotoTicket;
  } catch {
    throw bad;
  }
  if (t.uploaderId !== uploaderId || Date.now() - t.at > TICKET_TTL_MS) throw bad;
  return t;
}

/**
 * Processes and stores one uploaded file under generated keys, records the upload (the quota and the sweep of
 * abandoned uploads read that row), and returns the ticket for the form. Nothing is acknowledged unless
 * both files are in the store and the row is written; a half-done upload is taken back out of the store.
 * A store that fails or is slow throws PhotoStoreUnavailable.
 */
export async function acceptPhoto({ bytes, name, uploaderId }: { bytes: Buffer; name: string; uploaderId: string }) {
  const processed = await processPhoto(bytes);
  const id = randomUUID();
  const key = `photos/${id}.jpg`;
  const thumbKey = `photos/${id}-thumb.jpg`;
  const store = photoStore();
  const takeBack = (why: unknown) =>
    store.remove([key, thumbKey]).catch((e: unknown) => console.error("[bandedge] could not take back a half-stored photo", why, e));
  try {
    await store.put(key, processed.image, processed.mime);
    await store.put(thumbKey, processed.thumb, processed.mime);
    await recordStoredUpload({ key, thumbKey, uploaderId, bytes: processed.image.length + processed.thumb.length });
  } catch (e) {
    await takeBack(e);
    throw e;
  }
  const ticket: PhotoTicket = {
    key,
    thumbKey,
    width: processed.width,
    height: processed.height,
    bytes: processed.image.length,
    name: cleanDisplayName(name),
    uploaderId,
    at: Date.now(),
  };
  return { ticket: signTicket(ticket), width: processed.width, height: processed.height };
}
