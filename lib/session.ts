import "server-only";
import { eq } from "drizzle-orm";
import { headers } from "next/headers";
import { notFound, redirect } from "next/navigation";
import { cache } from "react";
import { db } from "@/db";
import { session as sessionTable } from "@/db/schema";
import type { Role } from "@/db/schema/enums";
import { auth, SESSION_ABSOLUTE_SECONDS } from "./auth";
import { can, isRole, type Permission } from "./permissions";

export type Viewer = { id: string; name: string; email: string; role: Role; sessionId: string };

// Resolves the session against the database on every request (no cookie cache), so a revoked
// or deactivated account stops working at the next request.
export async function viewerFromHeaders(h: Headers): Promise<Viewer | null> {
  const result = await auth().api.getSession({ headers: h });
  if (!result) return null;
  const { user, session } = result;
  if (user.banned) return null;
  if (Date.now() - new Date(session.createdAt).getTime() > SESSION_ABSOLUTE_SECONDS * 1000) {
    await db.delete(sessionTable).where(eq(sessionTable.id, session.id));
    return null;
  }
  const role = isRole(user.role) ? user.role : "customer";
  return { id: user.id, name: user.name, email: user.email, role, sessionId: session.id };
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
  if (!can(viewer.role, permission)) notFound();
  return viewer;
}
