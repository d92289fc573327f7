// The hosted photo store for the backup, restore and migration scripts, through the same server SDK and the
// same naming as the app (lib/server/uploads/storage.ts): a photo's key "photos/<uuid>.jpg" is kept as the
// private file with the custom id "photos-<uuid>.jpg", read with a short-lived signed URL.
import { createHash } from "node:crypto";
import { join } from "node:path";
import pg from "pg";
import { UTApi, UTFile } from "uploadthing/server";
import { readEnvFile, ROOT } from "./stack.mjs";

export const sha256 = (bytes) => createHash("sha256").update(bytes).digest("hex");

// Must match hostedIdOf in lib/server/uploads/storage.ts.
const KEY = /^photos\/[0-9a-f-]{36}(-thumb)?\.jpg$/;
export function hostedIdOf(key) {
  if (!KEY.test(key)) throw new Error(`not a photo key: ${key}`);
  return key.replace("/", "-");
}

// The store's settings come from the environment (UPLOADTHING_TOKEN and, for the stand-in, its URLs); without
// them, the local demo's upload stand-in as npm start runs it.
function ensureStoreEnv() {
  if (process.env.UPLOADTHING_TOKEN) return;
  const state = process.env.BANDEDGE_STATE_DIR ?? join(ROOT, ".bandedge");
  const secrets = readEnvFile(join(state, "local.env"));
  if (!secrets.UPLOADTHING_API_KEY) throw new Error("No UPLOADTHING_TOKEN and no local demo: set the upload store's settings.");
  const port = process.env.BANDEDGE_UPLOAD_PORT ?? "4030";
  process.env.UPLOADTHING_TOKEN = Buffer.from(
    JSON.stringify({ apiKey: secrets.UPLOADTHING_API_KEY, appId: "bandedge-local", regions: ["local"] }),
  ).toString("base64");
  process.env.UPLOADTHING_API_URL ??= `http://127.0.0.1:${port}`;
  process.env.UPLOADTHING_INGEST_URL ??= `http://127.0.0.1:${port}`;
  process.env.UPLOADTHING_UFS_HOST ??= `localhost:${port}`;
  process.env.UPLOADTHING_UFS_APP_ID_LOCATION ??= "path";
  process.env.UPLOADTHING_IS_DEV ??= "false";
}

export function photoStore({ timeoutMs = 30_000 } = {}) {
  ensureStoreEnv();
  const api = new UTApi({
    logLevel: "Warning",
    fetch: (input, init) => {
      const limit = AbortSignal.timeout(timeoutMs);
      return fetch(input, { ...init, signal: init?.signal ? AbortSignal.any([init.signal, limit]) : limit });
    },
  });
  return {
    /** The stored bytes, or null when the store has no such file; throws when the store fails. */
    async read(key) {
      const { ufsUrl } = await api.generateSignedURL(hostedIdOf(key), { expiresIn: 60 });
      const res = await fetch(ufsUrl, { signal: AbortSignal.timeout(timeoutMs) });
      if (res.status === 404) return null;
      if (!res.ok) throw new Error(`the store answered ${res.status} for ${key}`);
      return Buffer.from(await res.arrayBuffer());
    },
    async write(key, bytes) {
      const id = hostedIdOf(key);
      const file = new UTFile([new Uint8Array(bytes)], id, { type: "image/jpeg", customId: id });
      const out = await api.uploadFiles(file, { acl: "private", contentDisposition: "inline" });
      if (out.error) throw new Error(`the store refused ${key}: ${out.error.code} ${out.error.message}`);
    },
  };
}

/** Every stored file the database refers to: photos (with their thumbnails) and recorded uploads. */
export async function referencedKeys(databaseUrl) {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    const { rows } = await client.query(`
      select k from (
        select storage_key as k from photo union select thumb_key from photo
        union select key from stored_upload union select thumb_key from stored_upload
      ) x where k is not null order by k`);
    return rows.map((r) => r.k);
  } finally {
    await client.end();
  }
}
