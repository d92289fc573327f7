import { and, asc, count, eq, gte, inArray } from "drizzle-orm";
import { db } from "@/db";
import { jobs, messages, photos } from "@/db/schema";

// A photo for whoever may see it: its uploader, the owner of its job, or (staff) the workshop. A photo that
// came with a workshop-only note is the workshop's alone, whoever owns the job.
export async function getPhotoForViewer({ photoId, viewerId, staff }: { photoId: string; viewerId: string; staff: boolean }) {
  const [row] = await db
    .select({ photo: photos, customerId: jobs.customerId, internal: messages.internal })
    .from(photos)
    .leftJoin(jobs, eq(jobs.id, photos.jobId))
    .leftJoin(messages, eq(messages.id, photos.messageId))
    .where(eq(photos.id, photoId))
    .limit(1);
  if (!row) return null;
  if (staff) return row.photo;
  if (row.internal === true) return null;
  if (row.photo.uploaderId === viewerId || row.customerId === viewerId) return row.photo;
  return null;
}

// The photos that came with these messages. The caller passes ids it was allowed to read.
export async function listPhotosForMessages({ messageIds }: { messageIds: string[] }) {
  if (!messageIds.length) return [];
  return db
    .select({ id: photos.id, messageId: photos.messageId, displayName: photos.displayName, width: photos.width, height: photos.height })
    .from(photos)
    .where(inArray(photos.messageId, messageIds))
    .orderBy(asc(photos.createdAt));
}

// Photos one person stored since a moment: the per-person quota.
export async function countPhotosByUploaderSince({ uploaderId, since }: { uploaderId: string; since: Date }): Promise<number> {
  const [row] = await db
    .select({ n: count() })
    .from(photos)
    .where(and(eq(photos.uploaderId, uploaderId), gte(photos.createdAt, since)));
  return row?.n ?? 0;
}
