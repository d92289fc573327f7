import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { lockClaim } from "@/db/queries/claims";
import { getCertificateByCode, getCertificateById, getUserName } from "@/db/queries/certificates";
import { claims, estimateLines, estimateRevisions, jobs, photos, radioSets, type Certificate, type Claim } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import { normaliseCertificateCode } from "@/lib/engine/certificates";
import { EngineError } from "@/lib/engine/engine-error";
import { env } from "@/lib/server/env";
import { AppError } from "@/lib/server/errors";
import { queueEmail } from "@/lib/server/mail";
import { notifyStaff } from "@/lib/server/services/notifications";
import { jobNumber } from "@/lib/engine/jobs/states";
import { CLAIM_SYMPTOM_WORDS, isSafetySymptom } from "@/lib/engine/warranty/advise-claim";
import { formatMinor } from "@/lib/engine/pricing/money";
import { certificateStatus } from "@/lib/server/services/certificates";
import { todayIso, type CertificateDocument } from "@/lib/engine/certificates/document";
import { saveDraft } from "@/lib/server/services/estimates";
import { recordJobCreated, transitionJob } from "@/lib/server/services/jobs";
import { getShop, readShopTimeZone } from "@/lib/server/services/shop";
import { readTicket } from "@/lib/server/uploads/photos";
import type { DraftLine } from "@/lib/validation/estimate";
import type { ClaimDecision } from "@/lib/validation/claims";
import {
  adviseClaim,
  coverageFromCertificate,
  type ClaimAdvice,
  type ClaimFinding,
  type ClaimSymptom,
  type ExclusionCode,
} from "@/lib/engine/warranty";

/** What is stored in claim.advice: the engine's advice and the facts it was computed from. */
export type StoredAdvice = ClaimAdvice & {
  reportedOn: string;
  symptoms: ClaimSymptom[];
  findings: ClaimFinding[];
  computedBy: "claimant" | "staff";
};

export function computeAdvice(
  doc: CertificateDocument,
  facts: { reportedOn: string; symptom: ClaimSymptom; findings: ClaimFinding[] },
  computedBy: StoredAdvice["computedBy"],
): StoredAdvice {
  const advice = adviseClaim(coverageFromCertificate(doc), {
    reportedOn: facts.reportedOn,
    symptoms: [facts.symptom],
    findings: facts.findings,
  });
  return { ...advice, reportedOn: facts.reportedOn, symptoms: [facts.symptom], findings: facts.findings, computedBy };
}

function isOneOpenClaimViolation(e: unknown): boolean {
  const err = e as { code?: string; constraint?: string; cause?: { code?: string; constraint?: string } };
  const code = err.code ?? err.cause?.code;
  const constraint = err.constraint ?? err.cause?.constraint;
  return code === "23505" && constraint === "claim_one_open_per_certificate_idx";
}

export type OpenClaimArgs = {
  claimantId: string;
  symptomCategory: ClaimSymptom;
  description: string;
  statements: ExclusionCode[];
  /** Upload tickets (lib/uploads); each is honoured only for the person who uploaded it. */
  photos: string[];
} & ({ certificateId: string } | { code: string });

/**
 * Opens a claim. The holder opens it from the certificate's id; anyone else only with the certificate's
 * code, and only when the terms printed on that certificate let coverage pass to a later owner.
 * One open claim per certificate: the partial unique index decides under concurrency, mapped to a 409.
 */
export async function openClaim(ctx: TxContext, args: OpenClaimArgs): Promise<Claim> {
  let cert: Certificate | null;
  if ("certificateId" in args) {
    cert = await getCertificateById({ tx: ctx.tx, certificateId: args.certificateId });
    // A certificate id is only honoured for its holder: another person's id is simply not found.
    if (!cert || cert.customerId !== args.claimantId) throw new AppError("not_found", "That certificate was not found.");
  } else {
    let code: string;
    try {
      code = normaliseCertificateCode(args.code);
    } catch (e) {
      if (e instanceof EngineError)
        throw new AppError("invalid_input", "That is not a certificate code.", {
          code: "Check the code: 28 letters and digits, as printed on the certificate.",
        });
      throw e;
    }
    cert = await getCertificateByCode({ tx: ctx.tx, code });
    if (!cert)
      throw new AppError("not_found", "No certificate has that code.", {
        code: "No certificate has that code. Check it against the printed certificate.",
      });
  }

  const { status, document } = certificateStatus(cert);
  if (!document || status === "unverifiable")
    throw new AppError("conflict", "This certificate cannot be verified, so no claim can be opened against it. Please contact the shop.");
  if (status === "revoked")
    throw new AppError("conflict", "This certificate has been revoked by the shop, so no claim can be opened against it.");
  if (status === "superseded")
    throw new AppError("conflict", "This certificate was replaced by a corrected one. Open the claim from the newer certificate.");
  const isHolder = cert.customerId === args.claimantId;
  if (!isHolder && !document.terms.transferable) {
    throw new AppError(
      "forbidden",
      "The warranty on this certificate covers only the owner it was issued to, so it cannot be claimed by a later owner.",
      {
        code: "This warranty does not pass to a later owner.",
      },
    );
  }

  const tickets = args.photos.map((t) => readTicket(t, args.claimantId));
  const keys = new Set(tickets.map((t) => t.key));
  if (keys.size !== tickets.length)
    throw new AppError("invalid_input", "The same photo was added twice.", { photos: "The same photo was added twice." });
  if (keys.size > 0) {
    const used = await ctx.tx
      .select({ id: photos.id })
      .from(photos)
      .where(inArray(photos.storageKey, [...keys]))
      .limit(1);
    if (used.length)
      throw new AppError("invalid_input", "One of these photos is already attached elsewhere. Please add it again.", {
        photos: "One of these photos is already attached elsewhere. Please add it again.",
      });
  }

  const reportedOn = todayIso(new Date(), await readShopTimeZone(ctx.tx));
  const findings: ClaimFinding[] = args.statements.map((code) => ({ code, status: "confirmed" }));
  const advice = computeAdvice(document, { reportedOn, symptom: args.symptomCategory, findings }, "claimant");

  let claim: Claim;
  // A savepoint, so a lost race leaves the caller's transaction usable for the clear 409.
  await ctx.tx.execute(sql`savepoint claim_open`);
  try {
    const [row] = await ctx.tx
      .insert(claims)
      .values({
        certificateId: cert.id,
        claimantId: args.claimantId,
        symptomCategory: args.symptomCategory,
        description: args.description,
        advice: advice as unknown as Record<string, unknown>,
      })
      .returning();
    claim = row!;
    await ctx.tx.execute(sql`release savepoint claim_open`);
  } catch (e) {
    await ctx.tx.execute(sql`rollback to savepoint claim_open`);
    if (isOneOpenClaimViolation(e))
      throw new AppError("conflict", "There is already an open claim for this certificate. The shop will answer it first.");
    throw e;
  }
  if (tickets.length > 0) {
    await ctx.tx.insert(photos).values(
      tickets.map((t) => ({
        uploaderId: args.claimantId,
        claimId: claim.id,
        storageKey: t.key,
        thumbKey: t.thumbKey,
        displayName: t.name,
        mime: "image/jpeg",
        width: t.width,
        height: t.height,
        bytes: t.bytes,
      })),
    );
  }
  await audit(ctx, {
    actorId: args.claimantId,
    action: "claim.open",
    entity: "claim",
    entityId: claim.id,
    before: null,
    after: {
      certificateId: cert.id,
      symptom: args.symptomCategory,
      outcome: advice.outcome,
      laterOwner: !isHolder,
      photos: tickets.length,
    },
  });
  // The technician who did the certified work hears of it first; without one (or no longer active), the shop.
  const [work] = await ctx.tx
    .select({ technicianId: jobs.technicianId, number: jobs.number, maker: radioSets.maker, model: radioSets.model })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .where(eq(jobs.id, cert.jobId))
    .limit(1);
  const symptom = CLAIM_SYMPTOM_WORDS[args.symptomCategory] ?? "A symptom";
  await notifyStaff(ctx, {
    kind: "claim_opened",
    claimId: claim.id,
    technicianId: work?.technicianId ?? null,
    actorId: args.claimantId,
    title: `Warranty claim opened${work ? ` on ${jobNumber(work.number)}: ${work.maker} ${work.model}` : ""}`,
    body: `${symptom}${isSafetySymptom(args.symptomCategory) ? " (a safety symptom)" : ""}${isHolder ? "" : ", reported by a later owner"}.\n${args.description}`,
    dedupeKey: `claim:${claim.id}`,
  });
  return claim;
}

const DECISION_STATUS: Record<ClaimDecision, Claim["status"]> = { accept: "accepted", reject: "rejected", inspect: "inspecting" };

/** Staff decide with the advice; the claimant is e-mailed; an accepted claim opens the warranty job. */
export async function decideClaim(
  ctx: TxContext,
  {
    claimId,
    actorId,
    decision,
    reason,
    findings,
  }: { claimId: string; actorId: string; decision: ClaimDecision; reason: string; findings: ExclusionCode[] },
): Promise<{ claim: Claim; warrantyJobId: string | null }> {
  const claim = await lockClaim({ tx: ctx.tx, claimId });
  if (!claim) throw new AppError("not_found", "That claim was not found.");
  if (claim.status !== "open" && claim.status !== "inspecting") throw new AppError("conflict", "This claim has already been decided.");
  if (decision === "inspect" && claim.status === "inspecting")
    throw new AppError("conflict", "This claim is already waiting for inspection.");
  const cert = await getCertificateById({ tx: ctx.tx, certificateId: claim.certificateId });
  if (!cert) throw new AppError("not_found", "The certificate of this claim was not found.");
  const { document } = certificateStatus(cert);
  if (decision === "accept" && !document)
    throw new AppError("conflict", "This certificate cannot be verified: it cannot back a warranty job.");

  // Staff findings join what the owner said; the advice is recomputed so the record shows what the decision saw.
  const previous = claim.advice as unknown as StoredAdvice;
  let advice: StoredAdvice | Record<string, unknown> = claim.advice;
  if (document && findings.length > 0) {
    const merged = new Map<ExclusionCode, ClaimFinding>((previous.findings ?? []).map((f) => [f.code, f]));
    for (const code of findings) merged.set(code, { code, status: "confirmed" });
    advice = computeAdvice(
      document,
      {
        reportedOn: previous.reportedOn ?? todayIso(new Date(), await readShopTimeZone(ctx.tx)),
        symptom: claim.symptomCategory as ClaimSymptom,
        findings: [...merged.values()],
      },
      "staff",
    );
  }

  let warrantyJobId: string | null = null;
  if (decision === "accept" && document) {
    warrantyJobId = await openWarrantyJob(ctx, { claim, cert, actorId, advice: advice as StoredAdvice });
  }
  const now = new Date();
  const [updated] = await ctx.tx
    .update(claims)
    .set({
      status: DECISION_STATUS[decision],
      decisionReason: reason || null,
      decidedBy: actorId,
      decidedAt: now,
      advice: advice as Record<string, unknown>,
      warrantyJobId,
    })
    .where(eq(claims.id, claimId))
    .returning();
  await audit(ctx, {
    actorId,
    action: `claim.${decision}`,
    entity: "claim",
    entityId: claimId,
    before: { status: claim.status },
    after: {
      status: DECISION_STATUS[decision],
      ...(reason ? { reason } : {}),
      ...(warrantyJobId ? { warrantyJobId } : {}),
      ...(findings.length ? { findings } : {}),
    },
  });

  const claimant = await getUserName({ tx: ctx.tx, userId: claim.claimantId });
  if (claimant) {
    const shop = await getShop(ctx.tx);
    await queueEmail(ctx, {
      to: claimant.email,
      template: "claim-decision",
      props: {
        name: claimant.name,
        maker: document?.set.maker ?? "",
        model: document?.set.model ?? "",
        decision: DECISION_STATUS[decision] as "accepted" | "rejected" | "inspecting",
        reason,
        claimUrl: `${env().APP_URL.replace(/\/$/, "")}/portal/claims/${claimId}`,
        shopAddress: [shop.name, ...shop.addressLines].join(", "),
      },
      dedupeKey: `claim-decision:${claimId}:${DECISION_STATUS[decision]}`,
    });
  }
  return { claim: updated!, warrantyJobId };
}

/**
 * The warranty job: linked to the certificate and the claim, for the claimant (a later owner gets their
 * own copy of the set record), with the lines the advice linked to the symptom carried over as covered,
 * so they price at zero. The bench triages it from there.
 */
async function openWarrantyJob(
  ctx: TxContext,
  { claim, cert, actorId, advice }: { claim: Claim; cert: Certificate; actorId: string; advice: StoredAdvice },
): Promise<string> {
  const [original] = await ctx.tx
    .select({ job: jobs, set: radioSets })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .where(eq(jobs.id, cert.jobId))
    .limit(1);
  if (!original) throw new AppError("not_found", "The job of this certificate was not found.");
  let setId = original.set.id;
  if (original.set.ownerId !== claim.claimantId) {
    const s = original.set;
    const [copy] = await ctx.tx
      .insert(radioSets)
      .values({
        ownerId: claim.claimantId,
        maker: s.maker,
        model: s.model,
        year: s.year,
        serial: s.serial,
        kind: s.kind,
        profile: s.profile,
      })
      .returning({ id: radioSets.id });
    setId = copy!.id;
  }
  const [job] = await ctx.tx
    .insert(jobs)
    .values({
      setId,
      customerId: claim.claimantId,
      technicianId: original.job.technicianId,
      symptoms: claim.description,
      priorWork: `Warranty claim on certificate ${cert.code}.`,
      delivery: original.job.delivery,
      isWarranty: true,
      certificateId: cert.id,
      claimId: claim.id,
    })
    .returning({ id: jobs.id });
  const jobId = job!.id;
  await recordJobCreated(ctx, { jobId, actorId });
  await transitionJob(ctx, {
    jobId,
    to: "in_triage",
    actor: "staff",
    actorId,
    note: `Warranty claim accepted (certificate ${cert.code}).`,
  });

  const lines = await coveredLines(ctx, cert.jobId, advice);
  if (lines.length > 0) await saveDraft(ctx, { jobId, actorId, version: 0, lines });
  return jobId;
}

async function coveredLines(ctx: TxContext, originalJobId: string, advice: StoredAdvice): Promise<DraftLine[]> {
  const [revision] = await ctx.tx
    .select()
    .from(estimateRevisions)
    .where(and(eq(estimateRevisions.jobId, originalJobId), eq(estimateRevisions.status, "approved")))
    .orderBy(desc(estimateRevisions.revision))
    .limit(1);
  if (!revision) return [];
  const shop = await getShop(ctx.tx);
  const exponent = shop.policy.currency.exponent;
  const rows = await ctx.tx
    .select()
    .from(estimateLines)
    .where(eq(estimateLines.revisionId, revision.id))
    .orderBy(asc(estimateLines.position));
  const work = new Set(advice.matchedWork);
  const parts = new Set(advice.matchedParts);
  const bare = (code: string) => code.replace(/^part\./, "").replace(/\.\d+$/, "");
  return rows
    .filter((l) => (l.category === "parts" || l.partCostMinor !== null ? parts.has(bare(l.code)) || parts.has(l.code) : work.has(l.code)))
    .map((l): DraftLine => {
      const isPart = l.category === "parts" || l.partCostMinor !== null;
      return {
        key: l.code,
        kind: isPart ? "part" : "labour",
        code: l.code,
        title: l.title,
        category: l.category,
        minutes: isPart ? 0 : l.minutes,
        quantity: l.quantity,
        reason: `Warranty: ${l.reason || l.title}`.slice(0, 1000),
        readings: l.readings,
        unitCost: isPart ? formatMinor(l.partCostMinor ?? 0, exponent) : "",
        markupPercent: isPart && l.markupBp !== null ? String(l.markupBp / 100) : "",
        covered: true,
      };
    });
}

export const CLAIM_STATUS_LABEL: Record<Claim["status"], { owner: string; staff: string; icon: string }> = {
  open: { owner: "Waiting for the shop", staff: "New", icon: "✉" },
  inspecting: { owner: "The shop will inspect the set", staff: "Inspect first", icon: "⌕" },
  accepted: { owner: "Accepted: warranty job opened", staff: "Accepted", icon: "✓" },
  rejected: { owner: "Not covered", staff: "Rejected", icon: "✕" },
  withdrawn: { owner: "Withdrawn", staff: "Withdrawn", icon: "–" },
};

/** What the claimant sees of a claim: no staff-only advice reasons beyond the outcome. */
export function claimSummary(row: { claim: Claim; certificateCode: string; certificateContent: Record<string, unknown> }) {
  const set = (row.certificateContent as { set?: { maker?: string; model?: string } }).set;
  return {
    id: row.claim.id,
    status: row.claim.status,
    statusLabel: CLAIM_STATUS_LABEL[row.claim.status].owner,
    symptomCategory: row.claim.symptomCategory,
    createdAt: row.claim.createdAt.toISOString(),
    decidedAt: row.claim.decidedAt?.toISOString() ?? null,
    decisionReason: row.claim.decisionReason,
    warrantyJobId: row.claim.warrantyJobId,
    certificateCode: row.certificateCode,
    setName: [set?.maker, set?.model].filter(Boolean).join(" "),
  };
}
export type ClaimSummary = ReturnType<typeof claimSummary>;

export const OUTCOME_LABEL: Record<ClaimAdvice["outcome"], string> = {
  "likely-covered": "✓ Likely covered",
  "not-covered": "✕ Not covered",
  "inspect-first": "⌕ Inspect first",
};
