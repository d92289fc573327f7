import { and, count, eq, gte } from "drizzle-orm";
import { db } from "@/db";
import { jobs, photos } from "@/db/schema";

// A photo for whoever may see it: its uploader, the owner of its job, or (staff) the workshop.
export async function getPhotoForViewer({ photoId, viewerId, staff }: { photoId: string; viewerId: string; staff: boolean }) {
  const [row] = await db
    .select({ photo: photos, customerId: jobs.customerId })
    .from(photos)
    .leftJoin(jobs, eq(jobs.id, photos.jobId))
    .where(eq(photos.id, photoId))
    .limit(1);
  if (!row) return null;
  if (staff || row.photo.uploaderId === viewerId || row.customerId === viewerId) return row.photo;
  return null;
}

// Photos one person stored since a moment: the per-person quota.
export async function countPhotosByUploaderSince({ uploaderId, since }: { uploaderId: string; since: Date }): Promise<number> {
  const [row] = await db
    .select({ n: count() })
    .from(photos)
    .where(and(eq(photos.uploaderId, uploaderId), gte(photos.createdAt, since)));
  return row?.n ?? 0;
}
