import "server-only";
import { mkdir, readFile, rename, rm, writeFile } from "node:fs/promises";
import { dirname, join, resolve, sep } from "node:path";
import { env } from "@/lib/server/env";

// Where re-encoded photos live. The app talks to this seam only, so a hosted object store can replace the
// disk driver without touching the upload checks, the queries or the pages.
export interface PhotoStore {
  put(key: string, bytes: Buffer, contentType: string): Promise<void>;
  get(key: string): Promise<Buffer | null>;
  remove(key: string): Promise<void>;
}

const KEY = /^photos\/[0-9a-f-]{36}(-thumb)?\.jpg$/;

class DiskStore implements PhotoStore {
  constructor(private readonly root: string) {}

  private path(key: string): string {
    if (!KEY.test(key)) throw new Error(`not a photo key: ${key}`);
    const p = resolve(this.root, key);
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

  async get(key: string): Promise<Buffer | null> {
    try {
      return await readFile(this.path(key));
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code === "ENOENT") return null;
      throw e;
    }
  }

  async remove(key: string): Promise<void> {
    await rm(this.path(key), { force: true });
  }
}

const g = globalThis as unknown as { bandedgePhotoStore?: PhotoStore };

export function photoStore(): PhotoStore {
  if (!g.bandedgePhotoStore) {
    const dir = env().UPLOAD_DIR;
    if (!dir) throw new Error("UPLOAD_DIR is not set: there is nowhere to keep photos.");
    g.bandedgePhotoStore = new DiskStore(join(dir, "store"));
  }
  return g.bandedgePhotoStore;
}
