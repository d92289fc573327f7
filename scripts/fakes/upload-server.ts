// Local stand-in for the UploadThing ingest and API servers, answering what uploadthing 7.7.4's server SDK
// and browser client call (production mode, i.e. UPLOADTHING_IS_DEV=false):
//   POST /route-metadata      the app registers the file keys it presigned (API-key header)
//   HEAD /:key?…&signature    the browser asks where to resume (x-ut-range-start)
//   PUT  /:key?…&signature    the browser sends the file (multipart); we store it, POST the signed callback to
//                             the app, wait for its /callback-result, and answer with the URLs and server data
//   POST /callback-result     the app's onUploadComplete result
//   GET  /a/:appId/:key, /f/:key   the stored file
//   POST /v6/deleteFiles      UTApi.deleteFiles (file keys or custom ids)
// and what the app's photo store calls through UTApi on the server:
//   PUT  /:key?…&signature    UTApi.uploadFiles (no route registration; ACL and custom id from the signed URL);
//                             the file is kept under its custom id when it has one, as the hosted store lets
//                             a file be addressed by either
//   GET  /a/:appId/:id        a private file only with a valid signature (UTApi.generateSignedURL)
// Tests switch faults on with POST /control/faults?mode=…: "down" (every API, ingest and file call answers
// 503), "slow" (they answer 503 after 30 s), "store-down" / "store-slow" (the same for the calls the app's
// photo store makes only: server uploads, private reads, deletes by custom id; the browser's upload flow
// keeps working), "off".
// This mirrors the SDK's internal protocol, not a documented API: keep the versions pinned.
import { createHash, createHmac, timingSafeEqual } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import { join } from "node:path";

const port = Number(process.env.UPLOAD_STANDIN_PORT ?? 4030);
const dir = join(process.env.UPLOAD_DIR ?? join(process.cwd(), ".bandedge", "uploads"), "ingest");
const token = JSON.parse(Buffer.from(process.env.UPLOADTHING_TOKEN ?? "", "base64").toString("utf8") || "{}") as {
  apiKey?: string;
  appId?: string;
};
const apiKey = token.apiKey ?? "";
const appId = token.appId ?? "local";
const ufsHost = process.env.UPLOADTHING_UFS_HOST ?? `localhost:${port}`;
const origin = `http://127.0.0.1:${port}`;
mkdirSync(dir, { recursive: true });

type Registration = { metadata: unknown; callbackUrl: string; callbackSlug: string; awaitServerData: boolean };
const registrations = new Map<string, Registration>();
const waiting = new Map<string, (data: unknown) => void>();

const CORS: Record<string, string> = {
  "access-control-allow-origin": "*",
  "access-control-allow-methods": "GET, HEAD, PUT, POST, OPTIONS",
  "access-control-allow-headers": "range, content-type, x-uploadthing-version, b3, traceparent, x-uploadthing-package",
  "access-control-expose-headers": "x-ut-range-start",
  "access-control-max-age": "600",
};

function send(res: ServerResponse, status: number, body: unknown, headers: Record<string, string> = {}) {
  res.writeHead(status, { "content-type": "application/json", ...CORS, ...headers });
  res.end(JSON.stringify(body));
}

async function readBody(req: IncomingMessage, limit = 64 * 1024 * 1024): Promise<Buffer> {
  const chunks: Buffer[] = [];
  let total = 0;
  for await (const c of req) {
    total += (c as Buffer).length;
    if (total > limit) throw new Error("body too large");
    chunks.push(c as Buffer);
  }
  return Buffer.concat(chunks);
}

function hmacHex(payload: string): string {
  return createHmac("sha256", apiKey).update(payload).digest("hex");
}

// The SDK signs the presigned URL (without the signature parameter) with the API key.
function verifyPresigned(url: URL): { ok: true; params: URLSearchParams } | { ok: false; message: string } {
  const signature = url.searchParams.get("signature");
  if (!signature?.startsWith("hmac-sha256=")) return { ok: false, message: "missing signature" };
  // The signature is the last parameter; what it signs is the URL text before it, byte for byte.
  const cut = url.href.lastIndexOf("&signature=");
  if (cut < 0) return { ok: false, message: "missing signature" };
  const want = Buffer.from(hmacHex(url.href.slice(0, cut)));
  const got = Buffer.from(signature.slice(12));
  if (want.length !== got.length || !timingSafeEqual(want, got)) return { ok: false, message: "invalid signature" };
  const expires = Number(url.searchParams.get("expires"));
  if (!Number.isFinite(expires) || expires < Date.now()) return { ok: false, message: "presigned URL expired" };
  return { ok: true, params: url.searchParams };
}

const keyPath = (key: string) => join(dir, key.replace(/[^A-Za-z0-9._-]/g, "").replace(/^\.+/, ""));

type Meta = { type: string; name: string; acl?: string; key?: string; customId?: string | null };
const FAULT_MODES = ["off", "down", "slow", "store-down", "store-slow"] as const;
let faults: (typeof FAULT_MODES)[number] = "off";

// Answers a store call with the fault in force, if any; true when it did.
async function storeFault(res: ServerResponse): Promise<boolean> {
  if (faults !== "store-down" && faults !== "store-slow") return false;
  if (faults === "store-slow") await new Promise((r) => setTimeout(r, 30_000));
  send(res, 503, { error: "The upload service is unavailable." });
  return true;
}

// A server-side upload (UTApi.uploadFiles): nothing registered, the signed URL carries everything.
async function handleServerPut(req: IncomingMessage, res: ServerResponse, params: URLSearchParams, key: string) {
  if (await storeFault(res)) return;
  const raw = await readBody(req);
  const form = await new Response(new Uint8Array(raw), {
    headers: { "content-type": String(req.headers["content-type"] ?? "") },
  }).formData();
  const file = form.get("file");
  if (!file || typeof file === "string") return send(res, 400, { error: "No file in the upload." });
  const bytes = Buffer.from(await file.arrayBuffer());
  const declared = Number(decodeURIComponent(params.get("x-ut-file-size") ?? "0"));
  if (bytes.length !== declared) return send(res, 400, { error: "The file size does not match what was announced." });
  const customId = params.get("x-ut-custom-id") ? decodeURIComponent(params.get("x-ut-custom-id")!) : null;
  const id = customId ?? key;
  if (existsSync(keyPath(id))) return send(res, 409, { error: `A file with the custom id ${id} already exists.` });
  const meta: Meta = {
    type: decodeURIComponent(params.get("x-ut-file-type") ?? "application/octet-stream"),
    name: decodeURIComponent(params.get("x-ut-file-name") ?? "file"),
    acl: decodeURIComponent(params.get("x-ut-acl") ?? "public-read"),
    key,
    customId,
  };
  writeFileSync(keyPath(id), bytes);
  writeFileSync(`${keyPath(id)}.json`, JSON.stringify(meta));
  send(res, 200, { ...fileUrls(key), fileHash: createHash("md5").update(bytes).digest("hex") });
}

function fileUrls(key: string) {
  return {
    url: `http://${ufsHost}/f/${key}`,
    appUrl: `http://${ufsHost}/a/${appId}/${key}`,
    ufsUrl: `http://${ufsHost}/a/${appId}/${key}`,
  };
}

async function handlePut(req: IncomingMessage, res: ServerResponse, url: URL, key: string) {
  const check = verifyPresigned(url);
  if (!check.ok) return send(res, 403, { error: check.message });
  const reg = registrations.get(key);
  if (!reg) return handleServerPut(req, res, check.params, key);
  const raw = await readBody(req);
  const form = await new Response(new Uint8Array(raw), {
    headers: { "content-type": String(req.headers["content-type"] ?? "") },
  }).formData();
  const file = form.get("file");
  if (!file || typeof file === "string") return send(res, 400, { error: "No file in the upload." });
  const bytes = Buffer.from(await file.arrayBuffer());
  const name = decodeURIComponent(check.params.get("x-ut-file-name") ?? "file");
  const type = decodeURIComponent(check.params.get("x-ut-file-type") ?? "application/octet-stream");
  const declared = Number(decodeURIComponent(check.params.get("x-ut-file-size") ?? "0"));
  if (bytes.length !== declared) return send(res, 400, { error: "The file size does not match what was announced." });
  writeFileSync(keyPath(key), bytes);
  writeFileSync(`${keyPath(key)}.json`, JSON.stringify({ type, name }));
  const urls = fileUrls(key);
  const fileHash = createHash("md5").update(bytes).digest("hex");
  const payload = JSON.stringify({
    status: "uploaded",
    file: { name, size: bytes.length, type, customId: null, key, ...urls, fileHash, lastModified: Date.now() },
    origin,
    metadata: reg.metadata,
  });
  const result = new Promise<unknown>((resolve) => {
    waiting.set(key, resolve);
    setTimeout(() => resolve(undefined), 60_000);
  });
  const callback = new URL(reg.callbackUrl);
  callback.searchParams.set("slug", reg.callbackSlug);
  let callbackOk = false;
  try {
    const r = await fetch(callback, {
      method: "POST",
      headers: {
        "content-type": "application/json",
        "uploadthing-hook": "callback",
        "x-uploadthing-signature": `hmac-sha256=${hmacHex(payload)}`,
      },
      body: payload,
      signal: AbortSignal.timeout(60_000),
    });
    callbackOk = r.ok;
    await r.text();
  } catch (e) {
    console.error("[upload stand-in] callback failed", e);
  }
  if (!callbackOk) {
    waiting.delete(key);
    return send(res, 200, { error: "The shop's server did not confirm this upload. Please try again." });
  }
  const serverData = reg.awaitServerData ? await result : null;
  waiting.delete(key);
  registrations.delete(key);
  if (reg.awaitServerData && serverData === undefined)
    return send(res, 200, { error: "The shop's server did not confirm this upload. Please try again." });
  send(res, 200, { ...urls, fileHash, serverData: serverData ?? null });
}

const server = createServer(async (req, res) => {
  try {
    // Signatures cover the URL as the SDK wrote it, host included (the ingest and file hosts differ).
    const url = new URL(req.url ?? "/", req.headers.host ? `http://${req.headers.host}` : origin);
    const path = url.pathname;
    if (req.method === "POST" && path === "/control/faults") {
      const mode = FAULT_MODES.find((m) => m === url.searchParams.get("mode"));
      if (!mode) return send(res, 400, { error: `mode: one of ${FAULT_MODES.join(", ")}` });
      faults = mode;
      return send(res, 200, { faults });
    }
    if ((faults === "down" || faults === "slow") && path !== "/health") {
      if (faults === "slow") await new Promise((r) => setTimeout(r, 30_000));
      return send(res, 503, { error: "The upload service is unavailable." });
    }
    if (req.method === "OPTIONS") {
      // Allow whatever headers the browser asks for (clients add tracing and proxy headers of their own).
      const asked = req.headers["access-control-request-headers"];
      res.writeHead(204, { ...CORS, ...(typeof asked === "string" && asked ? { "access-control-allow-headers": asked } : {}) });
      return res.end();
    }
    if (path === "/health") return send(res, 200, { ok: true });

    if (
      req.method === "POST" &&
      (path === "/route-metadata" || path === "/callback-result" || path.startsWith("/v6/") || path.startsWith("/v7/"))
    ) {
      if (req.headers["x-uploadthing-api-key"] !== apiKey) return send(res, 401, { error: "Invalid API key" });
      const body = JSON.parse((await readBody(req)).toString("utf8") || "{}") as Record<string, unknown>;
      if (path === "/route-metadata") {
        if (body.isDev)
          return send(res, 400, { error: "This stand-in speaks the production protocol only (set UPLOADTHING_IS_DEV=false)." });
        for (const key of (body.fileKeys as string[]) ?? []) {
          registrations.set(key, {
            metadata: body.metadata ?? {},
            callbackUrl: String(body.callbackUrl),
            callbackSlug: String(body.callbackSlug),
            awaitServerData: body.awaitServerData !== false,
          });
        }
        return send(res, 200, { ok: true });
      }
      if (path === "/callback-result") {
        const resolve = waiting.get(String(body.fileKey));
        if (resolve) resolve(body.callbackData ?? null);
        return send(res, 200, { ok: true });
      }
      if (path === "/v6/deleteFiles") {
        if (body.customIds && (await storeFault(res))) return;
        let deletedCount = 0;
        for (const key of [...((body.fileKeys as string[]) ?? []), ...((body.customIds as string[]) ?? [])]) {
          const p = keyPath(key);
          if (existsSync(p)) {
            rmSync(p, { force: true });
            rmSync(`${p}.json`, { force: true });
            deletedCount++;
          }
        }
        return send(res, 200, { success: true, deletedCount });
      }
      return send(res, 404, { error: `not supported here: ${path}` });
    }

    const served = /^\/(?:a\/[^/]+|f)\/([A-Za-z0-9_-][A-Za-z0-9._-]*)$/.exec(path);
    if (req.method === "GET" && served) {
      const p = keyPath(served[1]!);
      // A file's metadata sits beside it and is not itself a file.
      if (p.endsWith(".json") || !existsSync(p)) return send(res, 404, { error: "not found" });
      const meta = JSON.parse(readFileSync(`${p}.json`, "utf8")) as Meta;
      if (meta.acl === "private") {
        if (await storeFault(res)) return;
        const check = verifyPresigned(url);
        if (!check.ok) return send(res, 403, { error: `This file is private: ${check.message}` });
      }
      const bytes = readFileSync(p);
      res.writeHead(200, {
        "content-type": "application/octet-stream",
        "content-length": String(bytes.length),
        "x-declared-type": meta.type,
        ...CORS,
      });
      return res.end(bytes);
    }

    const ingest = /^\/([A-Za-z0-9_-]+)$/.exec(path);
    if (ingest && req.method === "HEAD") {
      const check = verifyPresigned(url);
      res.writeHead(check.ok ? 200 : 403, { ...CORS, "x-ut-range-start": "0" });
      return res.end();
    }
    if (ingest && req.method === "PUT") return await handlePut(req, res, url, ingest[1]!);
    send(res, 404, { error: "not found" });
  } catch (error) {
    console.error("[upload stand-in]", error);
    if (!res.headersSent) send(res, 500, { error: "stand-in error" });
  }
});

server.listen(port, "127.0.0.1", () => console.log(`[upload stand-in] listening on ${origin}`));
for (const sig of ["SIGINT", "SIGTERM"] as const) process.on(sig, () => server.close(() => process.exit(0)));
