// Ids the access matrix's routes are called with, and how a matrix entry becomes a request path.
// Shared by the access suite (demo data) and the fuzz suite (its own rows).
import { randomUUID } from "node:crypto";
import sharp from "sharp";
import { UTApi, UTFile } from "uploadthing/server";
import { sql } from "../../support/db";
import type { Fixtures, RouteEntry } from "./matrix";

async function one<T extends Record<string, unknown>>(q: string, v: unknown[] = []): Promise<T> {
  const rows = await sql<T>(q, v);
  if (!rows[0]) throw new Error(`fixture query found nothing: ${q}`);
  return rows[0];
}

/** A photo of a job's set, stored the way the upload path stores one. */
export async function storePhoto({
  uploaderId,
  jobId,
  displayName = "front.jpg",
}: {
  uploaderId: string;
  jobId: string;
  displayName?: string;
}): Promise<string> {
  const photoId = randomUUID();
  const key = `photos/${randomUUID()}.jpg`;
  const jpeg = await sharp({ create: { width: 8, height: 8, channels: 3, background: "#884422" } })
    .jpeg()
    .toBuffer();
  // Into the upload store as the app keeps photos there: private, under the key as custom id (slash a dash).
  const id = key.replace("/", "-");
  const out = await new UTApi({ logLevel: "Warning" }).uploadFiles(
    new UTFile([new Uint8Array(jpeg)], id, { type: "image/jpeg", customId: id }),
    {
      acl: "private",
    },
  );
  if (out.error) throw new Error(`fixture photo not stored: ${out.error.message}`);
  await sql(
    "insert into photo (id, uploader_id, job_id, storage_key, display_name, mime, width, height, bytes) values ($1, $2, $3, $4, $5, 'image/jpeg', 8, 8, $6)",
    [photoId, uploaderId, jobId, key, displayName, jpeg.length],
  );
  return photoId;
}

/** A postal address in an owner's address book. */
export async function storeAddress(ownerId: string): Promise<string> {
  const { id } = await one<{ id: string }>(
    `insert into owner_address (owner_id, recipient, line1, city, region, postal_code, country)
     values ($1, 'Mira Holloway', '14 Kestrel Lane', 'Port Alder', 'ME', '04101', 'US') returning id`,
    [ownerId],
  );
  return id;
}

/** Customer A's (Mira's) demo jobs, revision, certificate, claim and payment, plus a stored photo. */
export async function fixturesFromSeed(): Promise<Fixtures> {
  const { id: jobA } = await one<{ id: string }>(
    "select id from job where idempotency_key = 'demo-returned' and customer_id = 'demo-cust-mira'",
  );
  const { id: jobOpenA } = await one<{ id: string }>(
    "select id from job where idempotency_key = 'demo-final' and customer_id = 'demo-cust-mira'",
  );
  const { id: revisionA } = await one<{ id: string }>("select id from estimate_revision where job_id = $1 order by revision desc limit 1", [
    jobA,
  ]);
  const { id: certificateA } = await one<{ id: string }>("select id from certificate where job_id = $1", [jobA]);
  const { id: claimA } = await one<{ id: string }>("select id from claim where certificate_id = $1", [certificateA]);
  const pay = await one<{ id: string; checkout_session_id: string }>(
    "select id, checkout_session_id from payment where job_id = $1 and purpose = 'deposit'",
    [jobA],
  );
  const photoA = await storePhoto({ uploaderId: "demo-cust-mira", jobId: jobA });
  // Office rows: the demo's settled refund, and any message of the outbox.
  const { id: refundAny } = await one<{ id: string }>("select id from refund order by created_at limit 1");
  const { id: emailAny } = await one<{ id: string }>("select id from email_outbox order by created_at limit 1");
  // The demo returned job's readings name the shop's instruments.
  const { id: instrumentAny } = await one<{ id: string }>(
    "select instrument_id as id from reading where job_id = $1 and instrument_id is not null limit 1",
    [jobA],
  );
  const addressA = await storeAddress("demo-cust-mira");
  const addressSparesA = await Promise.all(Array.from({ length: 12 }, () => storeAddress("demo-cust-mira")));
  // A part the checklist calls for: never deleted, so a DELETE that gets through answers 409.
  const { id: partAny } = await one<{ id: string }>("select id from part where code = 'fuse' limit 1");
  const { id: documentA } = await one<{ id: string }>("select id from money_document where payment_id = $1 and kind = 'receipt'", [pay.id]);
  return {
    addressA,
    addressSparesA,
    jobA,
    documentA,
    jobOpenA,
    revisionA,
    certificateA,
    claimA,
    paymentA: pay.id,
    sessionA: pay.checkout_session_id,
    photoA,
    refundAny,
    emailAny,
    instrumentAny,
    partAny,
  };
}

/** The request path of a matrix entry, its params filled from the fixtures. */
export function pathOf(entry: RouteEntry, f: Fixtures): string {
  let path = entry.route;
  for (const [k, v] of Object.entries(entry.params?.(f) ?? {}))
    path = path.replace(`[...${k}]`, v).replace(`[${k}]`, encodeURIComponent(v));
  return path + (entry.query ?? "");
}
