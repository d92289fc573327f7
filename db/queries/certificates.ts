import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { db, type Database } from "@/db";
import {
  certificates,
  estimateLines,
  estimateRevisions,
  instruments,
  jobs,
  jobTasks,
  radioSets,
  readings,
  shopSettings,
  user,
} from "@/db/schema";
import { DEFAULT_SHOP_TIME_ZONE } from "@/lib/engine/dates";

// Everything a certificate is built from: the job, its set, the people, ticked lines, the approved
// revision's lines and every stored reading. Read inside the issuing transaction.
export async function loadCertificateSources({ tx = db, jobId }: { tx?: Database; jobId: string }) {
  const [row] = await tx
    .select({ job: jobs, set: radioSets })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .where(eq(jobs.id, jobId))
    .limit(1);
  if (!row) return null;
  const [owner] = await tx
    .select({ id: user.id, name: user.name, email: user.email })
    .from(user)
    .where(eq(user.id, row.job.customerId))
    .limit(1);
  const [technician] = row.job.technicianId
    ? await tx.select({ id: user.id, name: user.name }).from(user).where(eq(user.id, row.job.technicianId)).limit(1)
    : [];
  const tasks = await tx.select().from(jobTasks).where(eq(jobTasks.jobId, jobId)).orderBy(asc(jobTasks.doneAt), asc(jobTasks.code));
  const [revision] = await tx
    .select()
    .from(estimateRevisions)
    .where(and(eq(estimateRevisions.jobId, jobId), eq(estimateRevisions.status, "approved")))
    .orderBy(desc(estimateRevisions.revision))
    .limit(1);
  const lines = revision
    ? await tx.select().from(estimateLines).where(eq(estimateLines.revisionId, revision.id)).orderBy(asc(estimateLines.position))
    : [];
  const stored = await tx.select().from(readings).where(eq(readings.jobId, jobId)).orderBy(asc(readings.key));
  const named = [...new Set(stored.map((r) => r.instrumentId).filter((id): id is string => id !== null))];
  const used = named.length ? await tx.select().from(instruments).where(inArray(instruments.id, named)) : [];
  return {
    job: row.job,
    set: row.set,
    owner: owner ?? null,
    technician: technician ?? null,
    tasks,
    revision: revision ?? null,
    lines,
    readings: stored,
    instruments: used,
  };
}

export async function getUserName({ tx = db, userId }: { tx?: Database; userId: string }) {
  const [row] = await tx.select({ name: user.name, email: user.email }).from(user).where(eq(user.id, userId)).limit(1);
  return row ?? null;
}

// The job's certificate still in force (not superseded), if any.
export async function getCurrentCertificateForJob({ tx = db, jobId }: { tx?: Database; jobId: string }) {
  const rows = await tx.select().from(certificates).where(eq(certificates.jobId, jobId)).orderBy(desc(certificates.issuedAt));
  return rows.find((r) => r.supersededById === null) ?? null;
}

export async function getCertificateById({ tx = db, certificateId }: { tx?: Database; certificateId: string }) {
  const [row] = await tx.select().from(certificates).where(eq(certificates.id, certificateId)).limit(1);
  return row ?? null;
}

export async function lockCertificate({ tx, certificateId }: { tx: Database; certificateId: string }) {
  const [row] = await tx.select().from(certificates).where(eq(certificates.id, certificateId)).for("update").limit(1);
  return row ?? null;
}

export async function getCertificateByCode({ tx = db, code }: { tx?: Database; code: string }) {
  const [row] = await tx.select().from(certificates).where(eq(certificates.code, code)).limit(1);
  return row ?? null;
}

// The holder of a certificate is the customer it was issued to; anyone else gets not-found.
export async function getCertificateForCustomer({ certificateId, customerId }: { certificateId: string; customerId: string }) {
  const [row] = await db
    .select()
    .from(certificates)
    .where(and(eq(certificates.id, certificateId), eq(certificates.customerId, customerId)))
    .limit(1);
  return row ?? null;
}

export async function listCertificatesForCustomer({ customerId }: { customerId: string }) {
  return db.select().from(certificates).where(eq(certificates.customerId, customerId)).orderBy(desc(certificates.issuedAt));
}

export async function listCertificatesForJobOfCustomer({ jobId, customerId }: { jobId: string; customerId: string }) {
  return db
    .select()
    .from(certificates)
    .where(and(eq(certificates.jobId, jobId), eq(certificates.customerId, customerId)))
    .orderBy(desc(certificates.issuedAt));
}

export async function listCertificatesForStaff({ limit = 200 }: { limit?: number } = {}) {
  return db
    .select({ certificate: certificates, jobNumber: jobs.number, customerName: user.name, customerEmail: user.email })
    .from(certificates)
    .innerJoin(jobs, eq(jobs.id, certificates.jobId))
    .innerJoin(user, eq(user.id, certificates.customerId))
    .orderBy(desc(certificates.issuedAt))
    .limit(limit);
}

// Everything the public verification page of a certificate is rendered from, as version stamps: the
// certificate row's xmin and the shop settings row's xmin (PostgreSQL gives every updated row a new xmin,
// whoever makes the change: the services or a hand-written UPDATE), plus the shop's time zone, in which the
// page prints the revocation date. A page rendered for one stamp is never shown for another. Prepared once per
// database connection: every view of the public page runs it.
export type VerifyPageStamp = { certificate: string; shop: string; timeZone: string };

let preparedVerifyPageStamp: ReturnType<typeof prepareVerifyPageStamp> | undefined;
function prepareVerifyPageStamp() {
  return db
    .select({
      certificate: sql<string>`${certificates}.xmin::text`,
      shop: sql<string>`coalesce(${shopSettings}.xmin::text, '0')`,
      timeZone: sql<string>`coalesce(${shopSettings.timeZone}, ${DEFAULT_SHOP_TIME_ZONE})`,
    })
    .from(certificates)
    .leftJoin(shopSettings, eq(shopSettings.id, "shop"))
    .where(eq(certificates.code, sql.placeholder("code")))
    .limit(1)
    .prepare("bandedge_verify_page_stamp");
}

export async function getVerifyPageStamp({ code }: { code: string }): Promise<VerifyPageStamp | null> {
  preparedVerifyPageStamp ??= prepareVerifyPageStamp();
  const [row] = await preparedVerifyPageStamp.execute({ code });
  return row ?? null;
}

// Fixed-window counter per client address in the shared rate_limit table (several app instances agree).
// Counts lookups of codes that do not exist; returns the count and when the current window started.
export async function countVerifyGuess({
  ip,
  windowSeconds,
}: {
  ip: string;
  windowSeconds: number;
}): Promise<{ count: number; windowStartedAt: number }> {
  const key = `verify:${ip}`;
  const now = Date.now();
  const windowStart = now - windowSeconds * 1000;
  const result = await db.execute<{ count: number; last_request: string }>(sql`
    insert into rate_limit (id, key, count, last_request) values (${key}, ${key}, 1, ${now})
    on conflict (key) do update set
      count = case when rate_limit.last_request < ${windowStart} then 1 else rate_limit.count + 1 end,
      last_request = case when rate_limit.last_request < ${windowStart} then ${now} else rate_limit.last_request end
    returning count, last_request`);
  const row = result.rows[0];
  return { count: Number(row?.count ?? 1), windowStartedAt: Number(row?.last_request ?? now) };
}
