import { and, desc, eq, inArray } from "drizzle-orm";
import { db, type Database } from "@/db";
import { certificates, claims, jobs, photos, user } from "@/db/schema";

const claimColumns = {
  claim: claims,
  certificateCode: certificates.code,
  certificateContent: certificates.content,
  certificateCustomerId: certificates.customerId,
};

// A claimant sees only their own claims; anyone else's answers not-found.
export async function listClaimsForClaimant({ claimantId }: { claimantId: string }) {
  return db
    .select(claimColumns)
    .from(claims)
    .innerJoin(certificates, eq(certificates.id, claims.certificateId))
    .where(eq(claims.claimantId, claimantId))
    .orderBy(desc(claims.createdAt));
}

export async function getClaimForClaimant({ claimId, claimantId }: { claimId: string; claimantId: string }) {
  const [row] = await db
    .select(claimColumns)
    .from(claims)
    .innerJoin(certificates, eq(certificates.id, claims.certificateId))
    .where(and(eq(claims.id, claimId), eq(claims.claimantId, claimantId)))
    .limit(1);
  return row ?? null;
}

export async function listClaimsForStaff({ statuses }: { statuses?: (typeof claims.$inferSelect)["status"][] } = {}) {
  return db
    .select({ ...claimColumns, claimantName: user.name, claimantEmail: user.email, jobNumber: jobs.number })
    .from(claims)
    .innerJoin(certificates, eq(certificates.id, claims.certificateId))
    .innerJoin(user, eq(user.id, claims.claimantId))
    .innerJoin(jobs, eq(jobs.id, certificates.jobId))
    .where(statuses && statuses.length ? inArray(claims.status, statuses) : undefined)
    .orderBy(desc(claims.createdAt))
    .limit(300);
}

export async function getClaimForStaff({ claimId }: { claimId: string }) {
  const [row] = await db
    .select({ ...claimColumns, certificate: certificates, claimantName: user.name, claimantEmail: user.email, jobNumber: jobs.number })
    .from(claims)
    .innerJoin(certificates, eq(certificates.id, claims.certificateId))
    .innerJoin(user, eq(user.id, claims.claimantId))
    .innerJoin(jobs, eq(jobs.id, certificates.jobId))
    .where(eq(claims.id, claimId))
    .limit(1);
  return row ?? null;
}

export async function lockClaim({ tx, claimId }: { tx: Database; claimId: string }) {
  const [row] = await tx.select().from(claims).where(eq(claims.id, claimId)).for("update").limit(1);
  return row ?? null;
}

export async function listClaimPhotos({ tx = db, claimId }: { tx?: Database; claimId: string }) {
  return tx.select().from(photos).where(eq(photos.claimId, claimId));
}
