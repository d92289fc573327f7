import { and, asc, eq, inArray, lt, sql } from "drizzle-orm";
import { db } from "@/db";
import { jobs, messages, photos, storedUploads } from "@/db/schema";

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

// Files one person stored since a moment: the per-person quota. Every upload the store acknowledged counts,
// attached or not, and so does any photo row (a quote's, a message's, a counter intake's) whose file was
// stored without an upload row (photos kept before uploads were recorded).
export async function countStoredPhotosByUploaderSince({ uploaderId, since }: { uploaderId: string; since: Date }): Promise<number> {
  const result = await db.execute<{ n: number }>(sql`
    select (
      (select count(*) from ${storedUploads} u where u.uploader_id = ${uploaderId} and u.created_at >= ${since})
      + (select count(*) from ${photos} p
           where p.uploader_id = ${uploaderId} and p.created_at >= ${since}
             and not exists (select 1 from ${storedUploads} u where u.key = p.storage_key))
    )::int as n`);
  return Number(result.rows[0]?.n ?? 0);
}

/** Records an upload the store acknowledged. */
export async function recordStoredUpload(values: { key: string; thumbKey: string; uploaderId: string; bytes: number }): Promise<void> {
  await db.insert(storedUploads).values(values);
}

// Uploads no photo row refers to, stored before a moment: abandoned before any quote, message or claim used them.
export async function listUnattachedUploads({ before, limit }: { before: Date; limit: number }) {
  return db
    .select({ key: storedUploads.key, thumbKey: storedUploads.thumbKey })
    .from(storedUploads)
    .where(and(lt(storedUploads.createdAt, before), sql`not exists (select 1 from ${photos} p where p.storage_key = ${storedUploads.key})`))
    .orderBy(asc(storedUploads.createdAt))
    .limit(limit);
}

/** Forgets an upload, unless a photo row came to refer to it meanwhile; says whether it was removed. */
export async function deleteUnattachedUpload({ key }: { key: string }): Promise<boolean> {
  const rows = await db
    .delete(storedUploads)
    .where(and(eq(storedUploads.key, key), sql`not exists (select 1 from ${photos} p where p.storage_key = ${key})`))
    .returning({ key: storedUploads.key });
  return rows.length > 0;
}
