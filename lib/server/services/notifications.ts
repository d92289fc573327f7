import "server-only";
import { and, count, desc, eq, inArray, isNull, sql } from "drizzle-orm";
import { db } from "@/db";
import { notificationPreferences, notifications, user } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import {
  chooseRecipients,
  NOTIFICATION_KIND_LABEL,
  NOTIFICATION_KINDS,
  resolvePreferences,
  type NotificationKind,
  type NotificationPreferences,
} from "@/lib/engine/notifications";
import { env } from "@/lib/server/env";
import { AppError } from "@/lib/server/errors";
import { queueEmail } from "@/lib/server/mail";

export type StaffEvent = {
  kind: NotificationKind;
  /** The job the event is about (its assigned technician hears of it), or the claim. */
  jobId?: string | null;
  claimId?: string | null;
  technicianId: string | null;
  /** Whoever caused the event; never told of it. */
  actorId: string | null;
  title: string;
  body?: string;
  /** The event's own identity: the same event twice (a redelivered webhook) tells nobody twice. */
  dedupeKey: string;
  /** Money settling back: the shop's business whoever holds the job at the bench. */
  shopOnly?: boolean;
};

const BODY_LIMIT = 400;

function excerpt(text: string): string {
  const flat = text.trim();
  return flat.length > BODY_LIMIT ? `${flat.slice(0, BODY_LIMIT - 1).trimEnd()}…` : flat;
}

/** Where a notification leads: the claim, else the job, on the bench (every staff role has it). */
export function notificationPath(n: { jobId: string | null; claimId: string | null }): string {
  if (n.claimId) return `/bench/claims/${n.claimId}`;
  if (n.jobId) return `/bench/jobs/${n.jobId}`;
  return "/staff/notifications";
}

/**
 * Tells the right staff of an event, in the caller's transaction: the in-app rows and the queued e-mails
 * commit with the event or not at all. Each person's choices decide the channels; deactivated accounts and
 * the actor get nothing (chooseRecipients).
 */
export async function notifyStaff(ctx: TxContext, event: StaffEvent): Promise<void> {
  const staff = await ctx.tx
    .select({ id: user.id, role: user.role, banned: user.banned, name: user.name, email: user.email })
    .from(user)
    .where(inArray(user.role, ["technician", "owner"]));
  const ids = chooseRecipients({
    technicianId: event.technicianId,
    actorId: event.actorId,
    shopOnly: event.shopOnly,
    staff: staff.map((s) => ({ id: s.id, role: s.role, active: s.banned !== true })),
  });
  if (ids.length === 0) return;
  const prefRows = await ctx.tx
    .select()
    .from(notificationPreferences)
    .where(and(inArray(notificationPreferences.userId, ids), eq(notificationPreferences.kind, event.kind)));
  const body = excerpt(event.body ?? "");
  const path = notificationPath({ jobId: event.jobId ?? null, claimId: event.claimId ?? null });
  for (const id of ids) {
    const person = staff.find((s) => s.id === id)!;
    const choice = resolvePreferences(prefRows.filter((r) => r.userId === id))[event.kind];
    if (choice.inApp) {
      await ctx.tx
        .insert(notifications)
        .values({
          recipientId: id,
          kind: event.kind,
          title: event.title,
          body,
          jobId: event.jobId ?? null,
          claimId: event.claimId ?? null,
          actorId: event.actorId,
          dedupeKey: event.dedupeKey,
        })
        .onConflictDoNothing({ target: [notifications.recipientId, notifications.dedupeKey] });
    }
    if (choice.email) {
      await queueEmail(ctx, {
        to: person.email,
        template: "staff-notice",
        props: {
          name: person.name.split(" ")[0]!,
          title: event.title,
          body,
          kindLabel: NOTIFICATION_KIND_LABEL[event.kind],
          url: `${env().APP_URL}${path}`,
          linkLabel: event.claimId ? "Open the claim" : "Open the job",
          preferencesUrl: `${env().APP_URL}/staff/profile`,
        },
        dedupeKey: `staff-notice:${event.dedupeKey}:${id}`,
      });
    }
  }
}

export type NotificationItem = {
  id: string;
  kind: NotificationKind;
  kindLabel: string;
  title: string;
  body: string;
  href: string;
  createdAt: string;
  read: boolean;
};

const PAGE_SIZE = 100;

/** The person's own notifications, newest first, with how many are unread. */
export async function listNotifications({ userId }: { userId: string }): Promise<{ items: NotificationItem[]; unread: number }> {
  const rows = await db
    .select()
    .from(notifications)
    .where(eq(notifications.recipientId, userId))
    .orderBy(desc(notifications.createdAt), desc(notifications.id))
    .limit(PAGE_SIZE);
  return {
    items: rows.map((n) => ({
      id: n.id,
      kind: n.kind,
      kindLabel: NOTIFICATION_KIND_LABEL[n.kind],
      title: n.title,
      body: n.body,
      href: notificationPath(n),
      createdAt: n.createdAt.toISOString(),
      read: n.readAt !== null,
    })),
    unread: await unreadCount({ userId }),
  };
}

export async function unreadCount({ userId }: { userId: string }): Promise<number> {
  const [row] = await db
    .select({ n: count() })
    .from(notifications)
    .where(and(eq(notifications.recipientId, userId), isNull(notifications.readAt)));
  return row?.n ?? 0;
}

/** Marks one of the person's own notifications read or unread; anyone else's is not found. */
export async function markNotification({ id, userId, read }: { id: string; userId: string; read: boolean }) {
  const [row] = await db
    .update(notifications)
    .set({ readAt: read ? sql`coalesce(${notifications.readAt}, now())` : null })
    .where(and(eq(notifications.id, id), eq(notifications.recipientId, userId)))
    .returning({ id: notifications.id, readAt: notifications.readAt });
  if (!row) throw new AppError("not_found", "That notification was not found.");
  return { id: row.id, read: row.readAt !== null, unread: await unreadCount({ userId }) };
}

export async function markAllNotificationsRead({ userId }: { userId: string }) {
  const rows = await db
    .update(notifications)
    .set({ readAt: sql`now()` })
    .where(and(eq(notifications.recipientId, userId), isNull(notifications.readAt)))
    .returning({ id: notifications.id });
  return { marked: rows.length, unread: 0 };
}

export async function getNotificationPreferences({ userId }: { userId: string }): Promise<NotificationPreferences> {
  const rows = await db.select().from(notificationPreferences).where(eq(notificationPreferences.userId, userId));
  return resolvePreferences(rows);
}

export async function saveNotificationPreferences({ userId, preferences }: { userId: string; preferences: NotificationPreferences }) {
  const now = new Date();
  await db
    .insert(notificationPreferences)
    .values(NOTIFICATION_KINDS.map((kind) => ({ userId, kind, ...preferences[kind], updatedAt: now })))
    .onConflictDoUpdate({
      target: [notificationPreferences.userId, notificationPreferences.kind],
      set: { inApp: sql`excluded.in_app`, email: sql`excluded.email`, updatedAt: now },
    });
  return getNotificationPreferences({ userId });
}

/** The header's viewer with the unread count drawn in, so the bell shows it before any script runs. */
export async function withUnreadCount<V extends { id: string }>(viewer: V): Promise<V & { unreadNotifications: number }> {
  return { ...viewer, unreadNotifications: await unreadCount({ userId: viewer.id }) };
}
