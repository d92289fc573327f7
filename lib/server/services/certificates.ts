import "server-only";
import { eq } from "drizzle-orm";
import { getCurrentCertificateForJob, getUserName, loadCertificateSources, lockCertificate } from "@/db/queries/certificates";
import { certificates, claims, jobs, type Certificate } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import {
  buildCertificateContent,
  generateCertificateCode,
  parseKeyring,
  publicKeyPemFromPrivate,
  signCertificate,
  verifyWithKeyring,
  type Keyring,
} from "@/lib/engine/certificates";
import { setProfileSchema } from "@/lib/engine/checklist/profile";
import { partCodeSchema } from "@/lib/engine/pricing/parts";
import { EngineError } from "@/lib/engine/engine-error";
import { env } from "@/lib/server/env";
import { AppError } from "@/lib/server/errors";
import { queueEmail } from "@/lib/server/mail";
import { getShop, type Shop } from "@/lib/server/services/shop";
import { dayInZone } from "@/lib/engine/dates";
import { queueRevocationNotice } from "./notices";
import { buildPerformanceSection } from "@/lib/engine/certificates/performance-section";
import { isPerformanceKey, listPerformanceReadings } from "@/lib/engine/performance";
import { loadPerformanceSetup, passbandSectionFor } from "./performance";
import { forgetVerifyPages } from "@/lib/server/verify-pages";
import { listRequiredReadings, parseReadingKey, type ReadingRequirement } from "@/lib/engine/verdicts";
import { parseWarrantyTerms } from "@/lib/validation/office";
import { dayNumber } from "@/lib/engine/warranty";
import { isInstrumentKind } from "@/lib/engine/instruments";
import {
  certificateDocumentSchema,
  composeTermsText,
  parseCertificateDocument,
  RIGHTS_SENTENCE,
  todayIso,
  type CertificateDocument,
  type CertificateInstrument,
  type CertificateReading,
  type CertificateStatus,
  type CertificateTerms,
} from "@/lib/engine/certificates/document";

// ---------------------------------------------------------------------------------------------
// The written warranty as the office set it (shop_settings.warranty_terms, read through the office's
// parser), carried in the signed content so the certificate, the PDF and the claim path all read the
// terms in force on the day. The schema here is the certificate's own and stays stable: stored
// certificates must parse forever, whatever the settings form becomes.

export function readCertificateTerms(shop: Pick<Shop, "warrantyTerms">): CertificateTerms {
  const t = parseWarrantyTerms(shop.warrantyTerms);
  return {
    transferable: t.transferable,
    whoIsCovered: t.whoIsCovered,
    whatWeWillDo: t.whatWeWillDo,
    whatWeWillNotDo: t.whatWeWillNotDo,
    howToClaim: [...t.howToClaim],
    disputes: t.disputes,
    impliedWarranties: t.impliedWarranties,
    consequentialDamages: t.consequentialDamages,
    shopWording: t.shopWording,
    rightsSentence: RIGHTS_SENTENCE,
  };
}

// ---------------------------------------------------------------------------------------------
// CERT_SIGNING_KEY holds the PKCS8 PEM, base64-encoded so it fits on one line of an env file.
function signingKeyPem(): string {
  const raw = env().CERT_SIGNING_KEY.trim();
  if (raw.startsWith("-----BEGIN")) return raw;
  return Buffer.from(raw, "base64").toString("utf8");
}

// The key ring: the current key (CERT_SIGNING_KEY, named CERT_KEY_ID) signs; it and every retired key
// (CERT_RETIRED_KEYS, public halves only) verify what they signed. `npm run cert:rotate` moves the current
// key into the retired list and makes a new one. Built once per distinct setting.
let ring: { source: string; keys: Keyring } | undefined;
function verificationKeys(): Keyring {
  const settings = env();
  const source = `${settings.CERT_KEY_ID}\n${settings.CERT_SIGNING_KEY}\n${settings.CERT_RETIRED_KEYS}`;
  if (ring?.source === source) return ring.keys;
  const keys = parseKeyring(settings.CERT_RETIRED_KEYS);
  const current = publicKeyPemFromPrivate(signingKeyPem());
  const clash = keys.get(settings.CERT_KEY_ID);
  if (clash && clash !== current)
    throw new AppError(
      "unavailable",
      `Certificate keys are misconfigured: the current key id ${settings.CERT_KEY_ID} also names a retired key.`,
    );
  keys.set(settings.CERT_KEY_ID, current);
  ring = { source, keys };
  return keys;
}

/** True only when the stored content is exactly what the shop signed, with the key the row names. */
export function verifyStoredCertificate(row: Pick<Certificate, "content" | "signature" | "keyId">): boolean {
  return verifyWithKeyring(row.content, row.signature, row.keyId, verificationKeys());
}

/** Status for people: an altered row is "unverifiable" whatever its columns say. */
export function certificateStatus(
  row: Pick<Certificate, "content" | "signature" | "keyId" | "revokedAt" | "supersededById">,
  today = todayIso(),
): {
  status: CertificateStatus;
  document: CertificateDocument | null;
} {
  const document = parseCertificateDocument(row.content);
  if (!document || !verifyStoredCertificate(row)) return { status: "unverifiable", document: null };
  if (row.revokedAt) return { status: "revoked", document };
  if (row.supersededById) return { status: "superseded", document };
  if (document.warranty.termDays === 0 || dayNumber(today) > dayNumber(document.warranty.endsOn)) return { status: "expired", document };
  return { status: "valid", document };
}

// ---------------------------------------------------------------------------------------------

// The calendar day on which something happened at the shop, in the shop's zone.
function isoDay(d: Date | null | undefined, timeZone: string): string {
  return dayInZone(d ?? new Date(), timeZone);
}

// Part lines are coded "part.<catalogue code>[.n]"; the certificate names the catalogue part itself.
function bareCode(lineCode: string): string {
  const bare = lineCode.replace(/^part\./, "").replace(/\.\d+$/, "");
  return partCodeSchema.safeParse(bare).success ? bare : lineCode;
}

type Sources = NonNullable<Awaited<ReturnType<typeof loadCertificateSources>>>;

function readingLabel(key: string): string {
  const p = parseReadingKey(key);
  if (!p) return key;
  switch (p.kind) {
    case "if-peak":
      return `IF peak at ${p.ifKHz} kHz`;
    case "edge":
      return `Band ${p.band + 1}: dial calibration at the ${p.end} band edge`;
    case "lo":
      return `Band ${p.band + 1}: dial calibration at the ${p.end} tracking point, LO frequency`;
    case "track":
      return `Band ${p.band + 1}: dial calibration at tracking point ${p.point + 1}, received frequency`;
    case "leakage":
      return p.plug === "a" ? "Leakage current, plug one way" : "Leakage current, plug reversed";
    case "bplus":
      return "B+ at the filter output";
    case "bplus-mains":
      return "Mains voltage while B+ was read";
  }
}

type PerformanceSources = {
  setup: Awaited<ReturnType<typeof loadPerformanceSetup>>;
  passband: Awaited<ReturnType<typeof passbandSectionFor>>;
};

async function performanceSources(tx: TxContext["tx"], jobId: string): Promise<PerformanceSources> {
  const setup = await loadPerformanceSetup(tx, jobId);
  return { setup, passband: setup.enabled ? await passbandSectionFor(tx, jobId) : undefined };
}

type StoredRow = Sources["readings"][number];

// I1, I2, ... in the order of kind, maker, model, serial: the certificate refers to instruments by these.
function instrumentRefs(src: Sources): Map<string, CertificateInstrument> {
  const sorted = [...src.instruments].sort(
    (a, b) =>
      a.kind.localeCompare(b.kind) || a.maker.localeCompare(b.maker) || a.model.localeCompare(b.model) || a.serial.localeCompare(b.serial),
  );
  return new Map(
    sorted.map((i, n) => [
      i.id,
      {
        ref: `I${n + 1}`,
        kind: isInstrumentKind(i.kind) ? i.kind : "meter",
        maker: i.maker,
        model: i.model,
        serial: i.serial,
        calibratedOn: i.calibratedOn,
        calibrationDueOn: i.calibrationDueOn,
      },
    ]),
  );
}

function takenWith(stored: StoredRow, refs: Map<string, CertificateInstrument>): { instrument?: string; instrumentOverdue?: true } {
  const ref = stored.instrumentId ? refs.get(stored.instrumentId)?.ref : undefined;
  if (!ref) return {};
  return stored.instrumentOverdue ? { instrument: ref, instrumentOverdue: true } : { instrument: ref };
}

function withAsReceived(
  row: CertificateReading,
  received: StoredRow | undefined,
  refs: Map<string, CertificateInstrument>,
): CertificateReading {
  if (!received) return row;
  const verdict = row.verdict === "recorded" ? "recorded" : received.verdict;
  return { ...row, asReceived: { value: received.value, verdict, ...takenWith(received, refs) } };
}

function buildDocument(
  src: Sources,
  perf: PerformanceSources,
  shop: Shop,
  code: string,
  technicianName: string,
  correction?: CertificateDocument["correction"],
  answers?: CertificateDocument["answers"],
): CertificateDocument {
  const profile = setProfileSchema.safeParse(src.set.profile);
  if (!profile.success)
    throw new AppError("conflict", "The set profile is incomplete, so no certificate can be issued. Correct the profile and try again.");
  const requirements: ReadingRequirement[] = listRequiredReadings(profile.data, shop.policy.tolerances);
  // Verdicts and band edges come from the readings as returned; as-received ones are printed beside them.
  const returned = src.readings.filter((r) => r.phase !== "as_received");
  const receivedByKey = new Map(src.readings.filter((r) => r.phase === "as_received").map((r) => [r.key, r]));
  const byKey = new Map(returned.map((r) => [r.key, r]));
  const refs = instrumentRefs(src);

  const doneTasks = src.tasks.filter((t) => t.doneAt !== null);
  const partLines = src.lines.filter((l) => l.category === "parts" || l.partCostMinor !== null);
  const workLines = src.lines.filter((l) => !partLines.includes(l));
  // Ticked bench lines are the work done; a job without bench ticks falls back to the approved lines.
  // Listed in the order of the approved estimate (the checklist order), then anything ticked beyond it.
  const position = new Map(src.lines.map((l) => [l.code, l.position]));
  const ordered = [...doneTasks].sort(
    (a, b) => (position.get(a.code) ?? Infinity) - (position.get(b.code) ?? Infinity) || a.code.localeCompare(b.code),
  );
  const work =
    ordered.length > 0 ? ordered.map((t) => ({ code: t.code, title: t.title })) : workLines.map((l) => ({ code: l.code, title: l.title }));
  const parts = partLines.map((l) => ({ code: bareCode(l.code), title: l.title, quantity: l.quantity }));

  const completedOn = isoDay(src.job.returnedAt ?? src.job.completedAt, shop.timeZone);
  const content = buildCertificateContent(
    {
      code,
      jobId: src.job.id,
      shop: { name: shop.name, address: shop.addressLines.join(", "), phone: shop.phone },
      set: {
        maker: src.set.maker,
        model: src.set.model,
        ...(src.set.year !== null ? { year: src.set.year } : {}),
        ...(src.set.serial ? { serial: src.set.serial } : {}),
        kind: src.set.kind,
      },
      owner: { name: src.owner?.name ?? "" },
      technician: { name: technicianName },
      completedOn,
      issuedOn: todayIso(new Date(), shop.timeZone),
      profile: profile.data,
      work,
      parts,
      requirements,
      readings: Object.fromEntries(returned.map((r) => [r.key, r.value])),
      termsText: "",
    },
    shop.policy,
  );
  // The certificate prints what was judged at the bench: the tolerance and verdict stored with each reading.
  const required = new Set(requirements.map((r) => r.key));
  const readings: CertificateReading[] = content.readings.map((r) => {
    const stored = byKey.get(r.key);
    // A reading with nothing to judge it by is recorded, whatever an older row stored for it.
    const row: CertificateReading = stored
      ? {
          ...r,
          toleranceText: stored.toleranceText || r.toleranceText,
          verdict: r.verdict === "recorded" ? "recorded" : stored.verdict,
          ...takenWith(stored, refs),
        }
      : r;
    return withAsReceived(row, receivedByKey.get(r.key), refs);
  });
  for (const stored of returned) {
    // Performance readings print in their own section, judged against the figures in force.
    if (required.has(stored.key) || isPerformanceKey(stored.key)) continue;
    const row: CertificateReading = {
      key: stored.key,
      label: readingLabel(stored.key),
      unit: stored.unit,
      nominal: null,
      value: stored.value,
      toleranceText: stored.toleranceText,
      verdict: stored.verdict,
      ...takenWith(stored, refs),
    };
    readings.push(withAsReceived(row, receivedByKey.get(stored.key), refs));
  }
  const performance = perf.setup.enabled
    ? buildPerformanceSection(
        listPerformanceReadings(profile.data, perf.setup),
        Object.fromEntries(returned.map((r) => [r.key, r.value])),
        perf.setup.conditions,
      )
    : undefined;
  // Only instruments a printed reading names are listed.
  const listed = new Set(readings.flatMap((r) => [r.instrument, r.asReceived?.instrument]).filter(Boolean));
  const instrumentList = [...refs.values()].filter((i) => listed.has(i.ref));
  const terms = readCertificateTerms(shop);
  const termsText = composeTermsText(terms, content.warranty, shop, content.completedOn);
  const doc: CertificateDocument = {
    ...content,
    readings,
    warranty: { ...content.warranty, termsText },
    terms,
    ...(instrumentList.length ? { instruments: instrumentList } : {}),
    ...(correction ? { correction } : {}),
    ...(answers ? { answers } : {}),
    ...(performance ? { performance } : {}),
    ...(perf.passband ? { passband: perf.passband } : {}),
  };
  // Round-trip through the schema so nothing unsignable or unexpected reaches the row.
  return certificateDocumentSchema.parse(doc);
}

function termEndsAt(doc: CertificateDocument): Date {
  // The last covered day, to its end, in the shop's calendar (UTC here).
  return new Date(`${doc.warranty.endsOn}T23:59:59.999Z`);
}

async function insertSigned(ctx: TxContext, src: Sources, doc: CertificateDocument, supersedesId: string | null) {
  let signature: string;
  try {
    signature = signCertificate(doc, signingKeyPem()).signature;
  } catch (e) {
    if (e instanceof EngineError)
      throw new AppError("unavailable", "Certificates cannot be signed right now: the signing key is not configured correctly.");
    throw e;
  }
  const [row] = await ctx.tx
    .insert(certificates)
    .values({
      code: doc.code,
      jobId: src.job.id,
      customerId: src.job.customerId,
      content: doc as unknown as Record<string, unknown>,
      signature,
      keyId: env().CERT_KEY_ID,
      termEndsAt: termEndsAt(doc),
      supersedesId,
    })
    .returning();
  return row!;
}

async function queueIssuedMail(ctx: TxContext, src: Sources, row: Certificate, doc: CertificateDocument, corrected: boolean) {
  if (!src.owner) return;
  const base = env().APP_URL.replace(/\/$/, "");
  await queueEmail(ctx, {
    to: src.owner.email,
    template: "certificate-issued",
    props: {
      name: src.owner.name,
      maker: doc.set.maker,
      model: doc.set.model,
      code: doc.code,
      designation: doc.warranty.designation,
      termDays: doc.warranty.termDays,
      endsOn: doc.warranty.endsOn,
      corrected,
      // A correction comes later: by then the words of the day of return may no longer be true.
      returnMethod: corrected ? null : (src.job.returnMethod ?? null),
      verifyUrl: `${base}/verify/${doc.code}`,
      jobUrl: `${base}/portal/jobs/${src.job.id}`,
      pdfUrl: `${base}/api/certificates/${row.id}/pdf`,
    },
    dedupeKey: `certificate-issued:${row.id}`,
  });
}

// A warranty job's certificate names the certificate and the claim it answers.
async function answersOf(
  ctx: TxContext,
  job: { isWarranty: boolean; certificateId: string | null; claimId: string | null },
  timeZone: string,
): Promise<CertificateDocument["answers"]> {
  if (!job.isWarranty || !job.certificateId || !job.claimId) return undefined;
  const [original] = await ctx.tx
    .select({ code: certificates.code })
    .from(certificates)
    .where(eq(certificates.id, job.certificateId))
    .limit(1);
  const [claim] = await ctx.tx.select({ createdAt: claims.createdAt }).from(claims).where(eq(claims.id, job.claimId)).limit(1);
  if (!original || !claim) return undefined;
  return { certificateCode: original.code, claimId: job.claimId, claimOpenedOn: dayInZone(claim.createdAt, timeZone) };
}

/**
 * Issues the certificate of a returned job, inside the caller's transaction (the one that records the
 * return). Issuing twice for the same job hands back the certificate already in force.
 */
export async function issueCertificate(
  ctx: TxContext,
  { jobId, actorId }: { jobId: string; actorId: string | null },
): Promise<{ certificateId: string; code: string }> {
  // Serialise issuing per job: the return and a retry cannot both sign.
  const [locked] = await ctx.tx.select({ id: jobs.id, state: jobs.state }).from(jobs).where(eq(jobs.id, jobId)).for("update").limit(1);
  if (!locked) throw new AppError("not_found", "That job was not found.");
  if (locked.state !== "returned") throw new AppError("conflict", "A certificate is issued only when the set has been returned.");
  const existing = await getCurrentCertificateForJob({ tx: ctx.tx, jobId });
  if (existing) return { certificateId: existing.id, code: existing.code };

  const src = await loadCertificateSources({ tx: ctx.tx, jobId });
  if (!src) throw new AppError("not_found", "That job was not found.");
  const shop = await getShop(ctx.tx);
  const technicianName =
    src.technician?.name ?? (actorId ? (await getUserName({ tx: ctx.tx, userId: actorId }))?.name : undefined) ?? shop.name;
  const doc = buildDocument(
    src,
    await performanceSources(ctx.tx, jobId),
    shop,
    generateCertificateCode(),
    technicianName,
    undefined,
    await answersOf(ctx, src.job, shop.timeZone),
  );
  const row = await insertSigned(ctx, src, doc, null);
  await audit(ctx, {
    actorId,
    action: "certificate.issue",
    entity: "certificate",
    entityId: row.id,
    before: null,
    after: { jobId, code: row.code, termEndsOn: doc.warranty.endsOn, designation: doc.warranty.designation },
  });
  await queueIssuedMail(ctx, src, row, doc, false);
  return { certificateId: row.id, code: row.code };
}

/**
 * A correction: a new certificate built from the job's stored data as it is now, which supersedes the
 * old one. The old row keeps its signed content; only its superseded-by pointer is set.
 */
export async function reissueCertificate(
  ctx: TxContext,
  { certificateId, actorId, reason }: { certificateId: string; actorId: string; reason: string },
): Promise<{ certificateId: string; code: string }> {
  const old = await lockCertificate({ tx: ctx.tx, certificateId });
  if (!old) throw new AppError("not_found", "That certificate was not found.");
  if (old.supersededById) throw new AppError("conflict", "This certificate has already been replaced by a newer one.");
  if (old.revokedAt) throw new AppError("conflict", "A revoked certificate cannot be corrected.");
  const oldDoc = parseCertificateDocument(old.content);
  const src = await loadCertificateSources({ tx: ctx.tx, jobId: old.jobId });
  if (!src) throw new AppError("not_found", "The job of this certificate was not found.");
  const shop = await getShop(ctx.tx);
  const technicianName = src.technician?.name ?? oldDoc?.technician.name ?? shop.name;
  const doc = buildDocument(
    src,
    await performanceSources(ctx.tx, old.jobId),
    shop,
    generateCertificateCode(),
    technicianName,
    { supersedesCode: old.code, reason },
    await answersOf(ctx, src.job, shop.timeZone),
  );
  // The term runs from the original completion, whatever day the correction is made.
  const row = await insertSigned(ctx, src, doc, old.id);
  await ctx.tx.update(certificates).set({ supersededById: row.id }).where(eq(certificates.id, old.id));
  // The row's new version already keeps the old page from being served; this frees it at once.
  forgetVerifyPages(old.code);
  await audit(ctx, {
    actorId,
    action: "certificate.reissue",
    entity: "certificate",
    entityId: old.id,
    before: { code: old.code },
    after: { supersededBy: row.id, code: row.code, reason },
  });
  await queueIssuedMail(ctx, src, row, doc, true);
  return { certificateId: row.id, code: row.code };
}

export async function revokeCertificate(
  ctx: TxContext,
  { certificateId, actorId, reason }: { certificateId: string; actorId: string; reason: string },
): Promise<{ certificateId: string }> {
  const row = await lockCertificate({ tx: ctx.tx, certificateId });
  if (!row) throw new AppError("not_found", "That certificate was not found.");
  if (row.revokedAt) throw new AppError("conflict", "This certificate is already revoked.");
  const revokedAt = new Date();
  await ctx.tx.update(certificates).set({ revokedAt, revokedBy: actorId, revokeReason: reason }).where(eq(certificates.id, certificateId));
  forgetVerifyPages(row.code);
  await audit(ctx, {
    actorId,
    action: "certificate.revoke",
    entity: "certificate",
    entityId: certificateId,
    before: { revokedAt: null },
    after: { revokedAt: revokedAt.toISOString(), reason },
  });
  await queueRevocationNotice(ctx, { certificateId, reason });
  return { certificateId };
}

/** Lookups of codes that do not exist allowed per client address per minute (views of real certificates are not counted). */
export const VERIFY_GUESS_LIMIT_PER_MINUTE = 60;

export function isUuid(value: string): boolean {
  return /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(value);
}
