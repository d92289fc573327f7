import "server-only";
import { createHash } from "node:crypto";
import { and, count, eq, gt, sql } from "drizzle-orm";
import { db } from "@/db";
import { auditEvents } from "@/db/schema";
import { auditNow } from "./audit";

/** Failed sign-ins allowed for one e-mail, from any address, before further attempts are refused. */
export const ACCOUNT_FAILURE_LIMIT = 10;
export const ACCOUNT_FAILURE_WINDOW_MINUTES = 15;

/**
 * The audit log names the e-mail of a sign-in attempt by a hash: attempts for e-mails without an account
 * are counted the same way as for real ones, and a stranger's typed address is not kept in clear.
 */
export function emailKey(email: string): string {
  return createHash("sha256").update(email.trim().toLowerCase()).digest("hex").slice(0, 40);
}

/** Failed sign-ins for this e-mail in the window, read from the audit log that records each of them. */
export async function recentFailures(email: string): Promise<number> {
  const [row] = await db
    .select({ n: count() })
    .from(auditEvents)
    .where(
      and(
        eq(auditEvents.entity, "sign_in"),
        eq(auditEvents.entityId, emailKey(email)),
        eq(auditEvents.action, "auth.sign_in_failed"),
        gt(auditEvents.at, sql`now() - make_interval(mins => ${ACCOUNT_FAILURE_WINDOW_MINUTES})`),
      ),
    );
  return row?.n ?? 0;
}

export async function recordFailedSignIn(email: string, address: string | null, reason: string): Promise<void> {
  await auditNow({
    actorId: null,
    action: "auth.sign_in_failed",
    entity: "sign_in",
    entityId: emailKey(email),
    after: { address, reason },
  });
}

// Longest text each field of the sign-in service may carry; the browser forms use the same figures
// (lib/validation/account.ts). Anything not named here is held to OTHER_FIELD_MAX.
export const AUTH_FIELD_MAX: Record<string, number> = {
  name: 120,
  email: 254,
  password: 128,
  newPassword: 128,
  currentPassword: 128,
  token: 512,
  callbackURL: 2048,
  redirectTo: 2048,
  newEmail: 254,
  image: 2048,
  role: 32,
  userId: 128,
  banReason: 500,
  searchValue: 254,
};
const OTHER_FIELD_MAX = 500;
const MAX_DEPTH = 4;
const MAX_KEYS = 40;

/** The first field of a request body that is too long or too deeply nested, with what is allowed. */
export function oversizedField(value: unknown, path: string[] = []): { field: string; message: string } | null {
  if (typeof value === "string") {
    const key = [...path].reverse().find((s) => !/^\d+$/.test(s)) ?? "";
    const max = AUTH_FIELD_MAX[key] ?? OTHER_FIELD_MAX;
    if (value.length > max) return { field: path.join("."), message: `${path.join(".")}: use at most ${max} characters.` };
    if (key === "name" && value.trim().length === 0) return { field: path.join("."), message: "name: enter a name." };
    return null;
  }
  if (value && typeof value === "object") {
    if (path.length >= MAX_DEPTH) return { field: path.join("."), message: `${path.join(".")}: nested too deeply.` };
    const entries = Array.isArray(value) ? value.map((v, i) => [String(i), v] as const) : Object.entries(value);
    if (entries.length > MAX_KEYS) return { field: path.join(".") || "body", message: `${path.join(".") || "body"}: too many fields.` };
    for (const [k, v] of entries) {
      const found = oversizedField(v, [...path, k]);
      if (found) return found;
    }
  }
  return null;
}

/** A request body as the audit log may keep it: no password, token or secret of any kind. */
export function withoutSecrets(body: unknown): Record<string, unknown> {
  if (!body || typeof body !== "object" || Array.isArray(body)) return {};
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(body)) {
    if (/pass|token|secret|otp|code|key/i.test(k)) continue;
    out[k] = v && typeof v === "object" ? withoutSecrets(v) : v;
  }
  return out;
}
