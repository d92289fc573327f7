import "server-only";
import { createHmac, timingSafeEqual } from "node:crypto";
import { eq, sql } from "drizzle-orm";
import { headers } from "next/headers";
import { notFound, redirect } from "next/navigation";
import { cache } from "react";
import { db } from "@/db";
import { session as sessionTable, user } from "@/db/schema";
import type { Role } from "@/lib/engine/permissions";
import { auth, SESSION_ABSOLUTE_SECONDS } from "./auth";
import { canAccess, isRole, type Permission } from "@/lib/engine/permissions";

/**
 * `holdsSets`: a staff account that also holds jobs, certificates or claims as a set owner (converted on
 * purpose); it keeps the portal for those (`canAccess` in lib/engine/permissions.ts). Always false for a
 * set owner's own account, whose portal is its role's.
 */
export type Viewer = { id: string; name: string; email: string; role: Role; sessionId: string; holdsSets: boolean };

// Whether a staff account holds a set owner's records: read with the session, in the same query.
const holdsSetsSql = sql<boolean>`("user"."role" <> 'customer' and (
  exists (select 1 from "job" j where j."customer_id" = "user"."id")
  or exists (select 1 from "certificate" c where c."customer_id" = "user"."id")
  or exists (select 1 from "claim" k where k."claimant_id" = "user"."id")))`;

// Resolves the session against the database on every request (no cookie cache), so a revoked
// or deactivated account stops working at the next request.
export async function viewerFromHeaders(h: Headers): Promise<Viewer | null> {
  const quick = await readSessionDirectly(h);
  if (quick === "absent") return null;
  if (quick !== "ask-auth") return quick;
  const result = await auth().api.getSession({ headers: h });
  if (!result) return null;
  const { user: u, session } = result;
  const [holder] = await db.select({ holdsSets: holdsSetsSql }).from(user).where(eq(user.id, u.id)).limit(1);
  return admit({
    id: u.id,
    name: u.name,
    email: u.email,
    role: u.role,
    banned: u.banned,
    sessionId: session.id,
    createdAt: new Date(session.createdAt),
    holdsSets: holder?.holdsSets ?? false,
  });
}

async function admit(row: {
  id: string;
  name: string;
  email: string;
  role: string | null | undefined;
  banned: boolean | null | undefined;
  sessionId: string;
  createdAt: Date;
  holdsSets: boolean | null;
}): Promise<Viewer | null> {
  if (row.banned) return null;
  if (Date.now() - row.createdAt.getTime() > SESSION_ABSOLUTE_SECONDS * 1000) {
    await db.delete(sessionTable).where(eq(sessionTable.id, row.sessionId));
    return null;
  }
  const role = row.role && isRole(row.role) ? row.role : "customer";
  return {
    id: row.id,
    name: row.name,
    email: row.email,
    role,
    sessionId: row.sessionId,
    holdsSets: role !== "customer" && row.holdsSets === true,
  };
}

// Prepared once per database connection: the statement every signed-in request runs.
let preparedSessionByToken: ReturnType<typeof prepareSessionByToken> | undefined;
function prepareSessionByToken() {
  return db
    .select({
      sessionId: sessionTable.id,
      expiresAt: sessionTable.expiresAt,
      createdAt: sessionTable.createdAt,
      id: user.id,
      name: user.name,
      email: user.email,
      role: user.role,
      banned: user.banned,
      holdsSets: holdsSetsSql,
    })
    .from(sessionTable)
    .innerJoin(user, eq(user.id, sessionTable.userId))
    .where(eq(sessionTable.token, sql.placeholder("token")))
    .limit(1)
    .prepare("bandedge_session_by_token");
}
function sessionByToken() {
  preparedSessionByToken ??= prepareSessionByToken();
  return preparedSessionByToken;
}

function cookieValue(header: string, name: string): string | null {
  for (const part of header.split(";")) {
    const eq = part.indexOf("=");
    if (eq > 0 && part.slice(0, eq).trim() === name) return part.slice(eq + 1).trim();
  }
  return null;
}

/**
 * The read-only path of a session check, in one query: the signed session cookie is verified here and
 * the session and its user read together. Anything that needs a write or a new cookie (expired, due for
 * its sliding refresh) goes to the sign-in service itself ("ask-auth"), which stays the only writer.
 * "absent": no session cookie, or one whose signature or token does not match (the service answers
 * no session for both as well).
 */
async function readSessionDirectly(h: Headers): Promise<Viewer | null | "absent" | "ask-auth"> {
  const cookies = h.get("cookie");
  if (!cookies) return "absent";
  const ctx = await auth().$context;
  const raw = cookieValue(cookies, ctx.authCookies.sessionToken.name);
  if (!raw) return "absent";
  let value: string;
  try {
    value = decodeURIComponent(raw);
  } catch {
    return "absent";
  }
  const dot = value.lastIndexOf(".");
  if (dot < 1) return "absent";
  const token = value.slice(0, dot);
  const signature = value.slice(dot + 1);
  if (signature.length !== 44 || !signature.endsWith("=")) return "absent";
  const expected = createHmac("sha256", ctx.secret).update(token).digest();
  const given = Buffer.from(signature, "base64");
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return "absent";

  const found = await sessionByToken().execute({ token });
  const row = found[0];
  if (!row) return "absent";
  const { expiresIn, updateAge } = ctx.sessionConfig;
  const now = Date.now();
  if (row.expiresAt.getTime() <= now) return "ask-auth";
  if (row.expiresAt.getTime() - expiresIn * 1000 + updateAge * 1000 <= now) return "ask-auth";
  return admit(row);
}

// The sign-in service's own endpoints (session, account and password changes) know only the sliding expiry:
// a session past the absolute lifetime is ended before they run, so they see no session either.
export async function endSessionPastLifetime(h: Headers): Promise<void> {
  if (!/(?:^|;\s*)(?:__Secure-)?better-auth\.session_token=/.test(h.get("cookie") ?? "")) return;
  await viewerFromHeaders(h);
}

export const getViewer = cache(async (): Promise<Viewer | null> => viewerFromHeaders(await headers()));

// For pages: anonymous visitors go to sign-in; a signed-in person without the permission sees not-found.
export async function requireViewer(nextPath?: string): Promise<Viewer> {
  const viewer = await getViewer();
  if (!viewer) redirect(nextPath ? `/sign-in?next=${encodeURIComponent(nextPath)}` : "/sign-in");
  return viewer;
}

export async function requirePermission(permission: Permission, nextPath?: string): Promise<Viewer> {
  const viewer = await requireViewer(nextPath);
  if (!canAccess(viewer, permission)) notFound();
  return viewer;
}
