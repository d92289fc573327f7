import "server-only";
import { z } from "zod";

// Every setting the app reads, validated once. Stand-in URLs are optional: production leaves them unset.
const envSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DATABASE_URL: z.string().url(),
  APP_URL: z.string().url().default("http://127.0.0.1:3000"),
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
  // Sign-in throttling; tests turn it down only through this setting, never through code paths.
  AUTH_RATE_LIMIT_MAX: z.coerce.number().int().positive().default(5),
  AUTH_RATE_LIMIT_WINDOW_SECONDS: z.coerce.number().int().positive().default(60),
  TRUSTED_IP_HEADER: z.string().default("x-forwarded-for"),
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
  UPLOADTHING_INGEST_URL: z.string().url().optional(),
  UPLOADTHING_UFS_HOST: z.string().optional(),
});

export type Env = z.infer<typeof envSchema>;

let cached: Env | undefined;

export function env(): Env {
  if (!cached) {
    const parsed = envSchema.safeParse(process.env);
    if (!parsed.success) {
      const problems = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
      throw new Error(`Invalid environment: ${problems}`);
    }
    cached = parsed.data;
  }
  return cached;
}
