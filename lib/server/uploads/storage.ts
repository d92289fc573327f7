import "server-only";
import { mkdir, readFile, rename, rm, writeFile } from "node:fs/promises";
import { dirname, join, resolve, sep } from "node:path";
import { UTApi, UTFile } from "uploadthing/server";
import { env } from "@/lib/server/env";

// Where re-encoded photos live. The app talks to this seam only: the hosted upload store in every shop with
// more than one app instance (and in npm start / npm test, against the stand-in), the disk for unit work.
export interface PhotoStore {
  put(key: string, bytes: Buffer, contentType: string): Promise<void>;
  /** The stored bytes as a stream, or null when the store has no such file. */
  open(key: string): Promise<{ body: ReadableStream<Uint8Array>; size: number | null } | null>;
  remove(keys: readonly string[]): Promise<void>;
}

/** The store did not answer, answered with an error, or took too long: worth trying again later. */
export class PhotoStoreUnavailable extends Error {
  constructor(what: string, options?: { cause?: unknown }) {
    super(`photo store unavailable: ${what}`, options);
    this.name = "PhotoStoreUnavailable";
  }
}

/** What a person is told when the store fails during their upload: nothing was kept, try again. */
export const PHOTO_STORE_RETRY_MESSAGE =
  "The photo store is not answering just now, so this photo was not saved. Please add it again in a minute.";

/** What a page is told when a stored photo cannot be fetched for a while. */
export const PHOTO_STORE_DOWN_MESSAGE = "Photos cannot be fetched just now. Please try again in a minute.";

const KEY = /^photos\/[0-9a-f-]{36}(-thumb)?\.jpg$/;

function checkKey(key: string): string {
  if (!KEY.test(key)) throw new Error(`not a photo key: ${key}`);
  return key;
}

/**
 * The name a photo has in the hosted store: its own key, slash-free, set as the file's custom id. The hosted
 * store addresses a file by its custom id as well as by the key it generates, so the database keeps our key
 * and a restore or a migration that uploads the same photo again needs no key rewritten.
 */
export function hostedIdOf(key: string): string {
  return checkKey(key).replace("/", "-");
}

class DiskStore implements PhotoStore {
  constructor(private readonly root: string) {}

  private path(key: string): string {
    const p = resolve(this.root, checkKey(key));
    if (!p.startsWith(resolve(this.root) + sep)) throw new Error("photo key escapes the store");
    return p;
  }

  async put(key: string, bytes: Buffer): Promise<void> {
    const p = this.path(key);
    await mkdir(dirname(p), { recursive: true });
    const tmp = `${p}.${process.pid}.tmp`;
    await writeFile(tmp, bytes, { mode: 0o600 });
    await rename(tmp, p);
  }

  async open(key: string) {
    let bytes: Buffer;
    try {
      bytes = await readFile(this.path(key));
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code === "ENOENT") return null;
      throw e;
    }
    return { body: new Blob([new Uint8Array(bytes)]).stream(), size: bytes.length };
  }

  async remove(keys: readonly string[]): Promise<void> {
    for (const key of keys) await rm(this.path(key), { force: true });
  }
}

/** Seconds a signed URL for reading one photo stays valid: it is used at once, by the server only. */
const SIGNED_URL_SECONDS = 60;

class HostedStore implements PhotoStore {
  private readonly api: UTApi;

  constructor(private readonly timeoutMs: number) {
    // Every SDK call is bounded; warnings and errors only, since the SDK logs signed URLs at its default level.
    this.api = new UTApi({
      logLevel: "Warning",
      fetch: (input, init) => {
        const limit = AbortSignal.timeout(timeoutMs);
        const given = (init as RequestInit | undefined)?.signal;
        return fetch(input as RequestInfo, { ...(init as RequestInit), signal: given ? AbortSignal.any([given, limit]) : limit });
      },
    });
  }

  async put(key: string, bytes: Buffer, contentType: string): Promise<void> {
    const id = hostedIdOf(key);
    const file = new UTFile([new Uint8Array(bytes)], id, { type: contentType, customId: id });
    let out: { error: { code: string; message: string } | null };
    try {
      out = await this.api.uploadFiles(file, { acl: "private", contentDisposition: "inline" });
    } catch (e) {
      throw new PhotoStoreUnavailable("upload failed", { cause: e });
    }
    if (out.error) throw new PhotoStoreUnavailable(`upload refused: ${out.error.code} ${out.error.message}`, { cause: out.error });
  }

  async open(key: string) {
    let res: Response;
    const stop = new AbortController();
    // The time limit covers the answer's headers; the body then streams to the browser at its own pace.
    const timer = setTimeout(() => stop.abort(new Error("timed out")), this.timeoutMs);
    try {
      const { ufsUrl } = await this.api.generateSignedURL(hostedIdOf(key), { expiresIn: SIGNED_URL_SECONDS });
      res = await fetch(ufsUrl, { signal: stop.signal });
    } catch (e) {
      throw new PhotoStoreUnavailable("read failed", { cause: e });
    } finally {
      clearTimeout(timer);
    }
    if (res.status === 404) {
      await res.body?.cancel();
      return null;
    }
    if (!res.ok || !res.body) {
      await res.body?.cancel();
      throw new PhotoStoreUnavailable(`read answered ${res.status}`);
    }
    const size = Number(res.headers.get("content-length"));
    return { body: res.body, size: Number.isFinite(size) && size > 0 ? size : null };
  }

  async remove(keys: readonly string[]): Promise<void> {
    if (!keys.length) return;
    try {
      await this.api.deleteFiles(keys.map(hostedIdOf), { keyType: "customId" });
    } catch (e) {
      throw new PhotoStoreUnavailable("delete failed", { cause: e });
    }
  }
}

const g = globalThis as unknown as { bandedgePhotoStore?: PhotoStore };

export function photoStore(): PhotoStore {
  if (!g.bandedgePhotoStore) {
    const e = env();
    const kind = e.PHOTO_STORE ?? (e.UPLOADTHING_TOKEN ? "hosted" : "disk");
    if (kind === "hosted") {
      if (!e.UPLOADTHING_TOKEN) throw new Error("PHOTO_STORE=hosted needs UPLOADTHING_TOKEN.");
      g.bandedgePhotoStore = new HostedStore(e.PHOTO_STORE_TIMEOUT_MS);
    } else {
      if (!e.UPLOAD_DIR) throw new Error("UPLOAD_DIR is not set: there is nowhere to keep photos.");
      g.bandedgePhotoStore = new DiskStore(join(e.UPLOAD_DIR, "store"));
    }
  }
  return g.bandedgePhotoStore;
}
