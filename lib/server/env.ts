import "server-only";
import { z } from "@/lib/engine/zod";

// Every setting the app reads, validated once. Stand-in URLs are optional: production leaves them unset.
const envSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DATABASE_URL: z.string().url(),
  APP_URL: z.string().url().default("http://127.0.0.1:3000"),
  // Where the app reaches itself (the public verification page renders each certificate through it once per
  // version); APP_URL when unset. Set it when the servers cannot reach the public address, e.g. http://127.0.0.1:3000.
  APP_INTERNAL_URL: z.string().url().optional(),
  BETTER_AUTH_SECRET: z.string().min(32, "BETTER_AUTH_SECRET must be at least 32 characters"),
  CERT_SIGNING_KEY: z.string().min(1, "CERT_SIGNING_KEY (Ed25519 private key, PEM) is required"),
  CERT_KEY_ID: z.string().default("k1"),
  MAIL_FROM: z.string().default("Kestrel Lane Wireless <workshop@kestrel-lane.example>"),
  RESEND_API_KEY: z.string().min(1),
  RESEND_BASE_URL: z.string().url().optional(),
  MAILBOX_URL: z.string().url().optional(),
  STRIPE_SECRET_KEY: z.string().min(1),
  STRIPE_WEBHOOK_SECRET: z.string().min(1),
  STRIPE_API_BASE: z.string().url().optional(),
  UPLOADTHING_TOKEN: z.string().optional(),
  UPLOAD_DIR: z.string().optional(),
  // Where re-encoded photos are kept (lib/server/uploads/storage.ts): the hosted upload store through its
  // server SDK (needs UPLOADTHING_TOKEN), or "disk" under UPLOAD_DIR for a single instance without it.
  PHOTO_STORE: z.enum(["hosted", "disk"]).optional(),
  // Each call to the upload store gives up after this long (milliseconds), answered as retryable.
  PHOTO_STORE_TIMEOUT_MS: z.coerce.number().int().positive().default(10_000),
  // How often each instance removes uploads never attached to anything (seconds).
  PHOTO_SWEEP_SECONDS: z.coerce.number().int().positive().default(600),
  // Sign-in throttling; tests turn it down only through this setting, never through code paths.
  AUTH_RATE_LIMIT_MAX: z.coerce.number().int().positive().default(5),
  AUTH_RATE_LIMIT_WINDOW_SECONDS: z.coerce.number().int().positive().default(60),
  TRUSTED_IP_HEADER: z.string().default("x-forwarded-for"),
  // Which proxies in front of the app may say who the client is (lib/server/client-address.ts): their
  // addresses or CIDR ranges, comma-separated, or the number of proxies. Neither: the header is ignored.
  TRUSTED_PROXIES: z
    .string()
    .default("")
    .transform((v) =>
      v
        .split(",")
        .map((s) => s.trim())
        .filter(Boolean),
    )
    .pipe(z.array(z.union([z.ipv4(), z.ipv6(), z.cidrv4(), z.cidrv6()], { error: "TRUSTED_PROXIES: addresses or CIDR ranges" }))),
  TRUSTED_PROXY_HOPS: z.coerce.number().int().min(0).max(10).default(0),
  // The local demo (npm start, the test command): stand-ins, the mailbox page, loopback only.
  BANDEDGE_LOCAL_DEMO: z
    .enum(["0", "1"])
    .default("0")
    .transform((v) => v === "1"),
  // Read by the upload SDK itself; named here so a stand-in address cannot slip into a real deployment.
  UPLOADTHING_API_URL: z.string().url().optional(),
  UPLOADTHING_INGEST_URL: z.string().url().optional(),
  WORKER_ENABLED: z
    .enum(["0", "1"])
    .default("1")
    .transform((v) => v === "1"),

  // --- Database resilience and roles ---
  // Timeouts of the app's connection pool (milliseconds): a stopped or frozen PostgreSQL answers 503 in
  // seconds instead of hanging requests.
  DB_CONNECT_TIMEOUT_MS: z.coerce.number().int().positive().default(3_000),
  DB_STATEMENT_TIMEOUT_MS: z.coerce.number().int().positive().default(8_000),
  DB_IDLE_IN_TRANSACTION_TIMEOUT_MS: z.coerce.number().int().positive().default(10_000),
  // Graceful shutdown: how long in-flight requests and the queue worker get after SIGTERM.
  SHUTDOWN_GRACE_MS: z.coerce.number().int().positive().default(10_000),

  // --- Certificate key ring ---
  // Retired verification keys, "id:base64-of-SPKI-PEM" separated by commas (written by npm run cert:rotate).
  CERT_RETIRED_KEYS: z.string().default(""),

  // --- Content Security Policy sources ---
  // Where photos are uploaded to and shown from; unset means the hosted upload service's hosts.
  UPLOADTHING_UFS_HOST: z.string().optional(),
});

const STAND_IN_URLS = ["RESEND_BASE_URL", "MAILBOX_URL", "STRIPE_API_BASE", "UPLOADTHING_API_URL", "UPLOADTHING_INGEST_URL"] as const;
const LOOPBACK_HOSTS = new Set(["127.0.0.1", "localhost", "[::1]"]);

// Stand-ins exist only in the local demo, the local demo runs only on this machine and only with local keys:
// a real deployment that inherits a stand-in address (and would send a password-reset link to a page
// anyone can read) refuses to start instead.
const checkedEnvSchema = envSchema.superRefine((e, ctx) => {
  if (!e.BANDEDGE_LOCAL_DEMO) {
    for (const name of STAND_IN_URLS) {
      if (e[name])
        ctx.addIssue({
          code: "custom",
          path: [name],
          message: "a stand-in address is allowed only in the local demo (BANDEDGE_LOCAL_DEMO=1, set by npm start); unset it",
        });
    }
    return;
  }
  if (!LOOPBACK_HOSTS.has(new URL(e.APP_URL).hostname))
    ctx.addIssue({ code: "custom", path: ["APP_URL"], message: "the local demo serves only this machine: use http://127.0.0.1:<port>" });
  if (e.APP_INTERNAL_URL && !LOOPBACK_HOSTS.has(new URL(e.APP_INTERNAL_URL).hostname))
    ctx.addIssue({
      code: "custom",
      path: ["APP_INTERNAL_URL"],
      message: "the local demo serves only this machine: use http://127.0.0.1:<port>",
    });
  if (/^(sk|rk)_live_/.test(e.STRIPE_SECRET_KEY))
    ctx.addIssue({ code: "custom", path: ["STRIPE_SECRET_KEY"], message: "the local demo refuses a live payment key" });
});

export type Env = z.infer<typeof envSchema>;

let cached: Env | undefined;

export function env(): Env {
  if (!cached) {
    const parsed = checkedEnvSchema.safeParse(process.env);
    if (!parsed.success) {
      const problems = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
      throw new Error(`Invalid environment: ${problems}`);
    }
    cached = parsed.data;
  }
  return cached;
}
