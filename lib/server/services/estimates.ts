import "server-only";
import { and, desc, eq, isNull, notInArray, sql } from "drizzle-orm";
import { db, type Database } from "@/db";
import { getEstimateForStaff, listRevisionsForStaff } from "@/db/queries/estimates";
import { estimateLines, estimateRevisions, estimates, jobs, jobTasks, radioSets, user } from "@/db/schema";
import type { JobState } from "@/lib/engine/jobs/states";
import type { TxContext } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import { computeChecklist } from "@/lib/engine/checklist/compute-checklist";
import { setProfileSchema, type SetProfile } from "@/lib/engine/checklist/profile";
import { env } from "@/lib/server/env";
import { AppError } from "@/lib/server/errors";
import { jobNumber } from "@/lib/engine/jobs/states";
import { queueEmail } from "@/lib/server/mail";
import { formatMinor } from "@/lib/engine/pricing/money";
import { defaultPartsCatalogue, type PartsCatalogue } from "@/lib/engine/pricing/parts";
import { checklistCatalogue, partsByIds } from "@/lib/server/services/parts";
import type { PricedEstimate } from "@/lib/engine/pricing/price-estimate";
import { transitionJob } from "@/lib/server/services/jobs";
import { getShop } from "@/lib/server/services/shop";
import type { ShopPolicy } from "@/lib/engine/shop-policy";
import { fieldErrors } from "@/lib/engine/requests/field-errors";
import { listRequiredReadings } from "@/lib/engine/verdicts";
import { draftSchema, effectiveMarkupBp, moneyText, tryPriceDraft, type DraftLine } from "@/lib/validation/estimate";

// States from which a revision may be sent (see lib/jobs/states.ts).
export const SENDABLE_STATES: readonly JobState[] = ["in_triage", "estimate_sent", "approved", "on_bench", "bench_revision"];
// A revision sent from these states is a scope change at the bench: the set stays there.
const AT_BENCH: readonly JobState[] = ["on_bench", "bench_revision"];
// While a job is in these states, its estimate may still be edited.
export const EDITABLE_STATES: readonly JobState[] = [
  "requested",
  "in_triage",
  "awaiting_owner",
  "estimate_sent",
  "approved",
  "on_bench",
  "bench_revision",
];

export type ProfileCheck = { ok: true; profile: SetProfile } | { ok: false; fields: Record<string, string> };

export function checkProfile(raw: unknown): ProfileCheck {
  const parsed = setProfileSchema.safeParse(raw);
  return parsed.success ? { ok: true, profile: parsed.data } : { ok: false, fields: fieldErrors(parsed.error) };
}

/**
 * The first draft of an estimate: the computed checklist, each labour line followed by the parts it calls
 * for at catalogue cost and markup. Warranty jobs start with every line covered.
 */
export function buildDraft(
  profile: SetProfile,
  policy: ShopPolicy,
  {
    covered = false,
    catalogue = {},
    partIds = {},
  }: { covered?: boolean; catalogue?: PartsCatalogue; partIds?: Record<string, string> } = {},
): DraftLine[] {
  const out: DraftLine[] = [];
  const used = new Set<string>();
  const uniqueCode = (base: string) => {
    let code = base;
    for (let n = 2; used.has(code); n++) code = `${base}.${n}`;
    used.add(code);
    return code;
  };
  for (const line of computeChecklist(profile, policy)) {
    out.push({
      key: line.code,
      kind: "labour",
      code: uniqueCode(line.code),
      title: line.title,
      category: line.category,
      minutes: line.minutes,
      quantity: line.quantity,
      reason: line.reason,
      readings: line.readings,
      unitCost: "",
      markupPercent: "",
      covered,
    });
    for (const part of line.parts) {
      // A part retired from the catalogue comes without a cost: the builder asks for one.
      const entry = Object.hasOwn(catalogue, part.code) ? catalogue[part.code] : undefined;
      const markupBp = entry?.markupBp ?? policy.parts.defaultMarkupBp;
      const code = uniqueCode(`part.${part.code}`);
      const partId = Object.hasOwn(partIds, part.code) ? partIds[part.code] : undefined;
      out.push({
        key: `${line.code}:${part.code}`,
        kind: "part",
        code,
        title: entry?.title ?? defaultPartsCatalogue[part.code].title,
        category: "parts",
        minutes: 0,
        quantity: part.quantity,
        reason: `For: ${line.title}`,
        readings: [],
        unitCost: entry ? formatMinor(entry.costMinor, policy.currency.exponent) : "",
        markupPercent: String(markupBp / 100),
        covered,
        ...(entry && partId ? { partId } : {}),
      });
    }
  }
  return out;
}

/** Prices a draft with the shop policy; bad figures become a field-level 400. */
export function priceDraft(lines: readonly DraftLine[], policy: ShopPolicy): PricedEstimate {
  const result = tryPriceDraft(lines, policy);
  if (!result.ok) throw new AppError("invalid_input", result.message, result.fields);
  return result.priced;
}

async function loadJob(tx: Database, jobId: string) {
  const [row] = await tx
    .select({ job: jobs, set: radioSets, customer: { id: user.id, name: user.name, email: user.email } })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .innerJoin(user, eq(user.id, jobs.customerId))
    .where(eq(jobs.id, jobId))
    .limit(1);
  if (!row) throw new AppError("not_found", "That job was not found.");
  return row;
}

function storedDraft(raw: unknown): DraftLine[] {
  const parsed = draftSchema.safeParse(raw);
  return parsed.success ? parsed.data.lines : [];
}

export type EstimateView = {
  jobId: string;
  jobState: JobState;
  /** 0 while nothing has been saved; the builder sends it back with its save. */
  version: number;
  saved: boolean;
  currentRevision: number;
  updatedAt: string | null;
  updatedByName: string | null;
  lines: DraftLine[];
  priced: PricedEstimate | null;
  pricingError: { message: string; fields: Record<string, string> } | null;
  profileIssues: Record<string, string> | null;
  /** What each reading key on a line is called on the bench sheet, so the builder never shows the key. */
  readingLabels: Record<string, string>;
  currency: { code: string; exponent: number };
  /** The policy the builder prices with, so its live totals are the engine's own. */
  policy: ShopPolicy;
  isWarranty: boolean;
  /** The catalogue parts the lines name: stock count (null when not counted), and whether since retired. */
  partsInStock: Record<string, { name: string; stock: number | null; retired: boolean }>;
  editable: boolean;
  sendable: boolean;
  revisions: Awaited<ReturnType<typeof listRevisionsForStaff>>;
};

/** The builder's view: the saved draft, or a fresh one computed from the profile (not stored until saved). */
export async function getEstimateView({ jobId }: { jobId: string }): Promise<EstimateView> {
  const { job, set } = await loadJob(db, jobId);
  const shop = await getShop();
  const saved = await getEstimateForStaff({ jobId });
  const profile = checkProfile(set.profile);
  let lines: DraftLine[] = [];
  if (saved) lines = storedDraft(saved.estimate.draft);
  else if (profile.ok) lines = buildDraft(profile.profile, shop.policy, { covered: job.isWarranty, ...(await checklistCatalogue()) });
  let priced: PricedEstimate | null = null;
  let pricingError: EstimateView["pricingError"] = null;
  try {
    priced = priceDraft(lines, shop.policy);
  } catch (e) {
    if (!(e instanceof AppError)) throw e;
    pricingError = { message: e.message, fields: e.fields ?? {} };
  }
  return {
    jobId,
    jobState: job.state,
    version: saved?.estimate.version ?? 0,
    saved: Boolean(saved),
    currentRevision: saved?.estimate.currentRevision ?? 0,
    updatedAt: saved?.estimate.updatedAt.toISOString() ?? null,
    updatedByName: saved?.updatedByName ?? null,
    lines,
    priced,
    pricingError,
    profileIssues: profile.ok ? null : profile.fields,
    readingLabels: profile.ok
      ? Object.fromEntries(listRequiredReadings(profile.profile, shop.policy.tolerances).map((r) => [r.key, r.label]))
      : {},
    currency: { code: shop.policy.currency.code, exponent: shop.policy.currency.exponent },
    policy: shop.policy,
    isWarranty: job.isWarranty,
    partsInStock: await partsByIds([...new Set(lines.flatMap((l) => (l.partId ? [l.partId] : [])))]),
    editable: EDITABLE_STATES.includes(job.state),
    sendable: SENDABLE_STATES.includes(job.state),
    revisions: await listRevisionsForStaff({ jobId }),
  };
}

function staleError(current: number): AppError {
  return new AppError(
    "stale",
    `Someone else saved this estimate while you were editing it (it is now at version ${current}). Nothing was overwritten and your changes are still in the form: load their version to compare, or save yours over it.`,
  );
}

export type SaveDraftInput = { jobId: string; actorId: string; version: number; lines: DraftLine[] };

/**
 * Saves the draft if nobody saved since `version` (0 = never saved). A stale save changes nothing and
 * answers 409; the caller keeps its edits.
 */
export async function saveDraft(ctx: TxContext, input: SaveDraftInput): Promise<{ version: number; priced: PricedEstimate }> {
  const { job } = await loadJob(ctx.tx, input.jobId);
  if (!EDITABLE_STATES.includes(job.state)) {
    throw new AppError("conflict", "This job is past the point where its estimate can change.");
  }
  const shop = await getShop(ctx.tx);
  const priced = priceDraft(input.lines, shop.policy);
  const draft = { lines: input.lines } as Record<string, unknown>;
  const now = new Date();
  let version: number;
  if (input.version === 0) {
    const [row] = await ctx.tx
      .insert(estimates)
      .values({ jobId: input.jobId, draft, version: 1, updatedAt: now, updatedBy: input.actorId })
      .onConflictDoNothing({ target: estimates.jobId })
      .returning({ id: estimates.id, version: estimates.version });
    if (!row) {
      const existing = await getEstimateForStaff({ jobId: input.jobId }, ctx.tx);
      throw staleError(existing?.estimate.version ?? 1);
    }
    version = row.version;
    await audit(ctx, {
      actorId: input.actorId,
      action: "estimate.save",
      entity: "estimate",
      entityId: row.id,
      before: null,
      after: { version, lines: input.lines.length },
    });
  } else {
    const [row] = await ctx.tx
      .update(estimates)
      .set({ draft, version: sql`${estimates.version} + 1`, updatedAt: now, updatedBy: input.actorId })
      .where(and(eq(estimates.jobId, input.jobId), eq(estimates.version, input.version)))
      .returning({ id: estimates.id, version: estimates.version });
    if (!row) {
      const existing = await getEstimateForStaff({ jobId: input.jobId }, ctx.tx);
      if (!existing) throw new AppError("stale", "This estimate has not been saved yet: reload the builder and save again.");
      throw staleError(existing.estimate.version);
    }
    version = row.version;
    await audit(ctx, {
      actorId: input.actorId,
      action: "estimate.save",
      entity: "estimate",
      entityId: row.id,
      before: { version: input.version },
      after: { version, lines: input.lines.length },
    });
  }
  return { version, priced };
}

/** Replaces the draft with a fresh one from the (corrected) profile; same version rule as a save. */
export async function rebuildDraft(ctx: TxContext, { jobId, actorId, version }: { jobId: string; actorId: string; version: number }) {
  const { job, set } = await loadJob(ctx.tx, jobId);
  const profile = checkProfile(set.profile);
  if (!profile.ok)
    throw new AppError("invalid_input", "The set profile needs attention before the checklist can be computed.", profile.fields);
  const shop = await getShop(ctx.tx);
  const lines = buildDraft(profile.profile, shop.policy, { covered: job.isWarranty, ...(await checklistCatalogue(ctx.tx)) });
  return saveDraft(ctx, { jobId, actorId, version, lines });
}

export type SendRevisionInput = {
  jobId: string;
  actorId: string;
  changeSummary?: string | null;
  /** When given, the draft must still be at this version (what the sender saw). */
  version?: number;
};

/**
 * Sends the saved draft as revision N+1: lines and totals frozen, the previous sent revision superseded,
 * the job moved to "estimate sent", the checklist tasks brought in line, and the owner e-mailed. From the
 * bench the set stays on the bench ("revision at the bench") and the checklist keeps the approved scope
 * until the owner answers.
 */
export async function sendRevision(ctx: TxContext, input: SendRevisionInput) {
  const { tx } = ctx;
  const { job, set, customer } = await loadJob(tx, input.jobId);
  if (!SENDABLE_STATES.includes(job.state)) {
    throw new AppError(
      "invalid_transition",
      "An estimate can be sent from triage, after approval, or from the bench — not from this state.",
    );
  }
  const [estimate] = await tx.select().from(estimates).where(eq(estimates.jobId, input.jobId)).for("update").limit(1);
  if (!estimate) throw new AppError("conflict", "Save the estimate before sending it.");
  if (input.version !== undefined && input.version !== estimate.version) throw staleError(estimate.version);
  const lines = storedDraft(estimate.draft);
  if (lines.length === 0) throw new AppError("invalid_input", "An estimate needs at least one line.", { lines: "Add at least one line." });

  const [last] = await tx
    .select({ revision: estimateRevisions.revision })
    .from(estimateRevisions)
    .where(eq(estimateRevisions.jobId, input.jobId))
    .orderBy(desc(estimateRevisions.revision))
    .limit(1);
  const revision = (last?.revision ?? 0) + 1;
  const changeSummary = input.changeSummary?.trim() || null;
  if (revision > 1 && !changeSummary) {
    throw new AppError("invalid_input", "Say what changed since the last revision.", {
      changeSummary: "Say what changed since the last revision.",
    });
  }

  const shop = await getShop(tx);
  const policy = shop.policy;
  const priced = priceDraft(lines, policy);
  const t = priced.totals;

  await tx
    .update(estimateRevisions)
    .set({ status: "superseded" })
    .where(and(eq(estimateRevisions.jobId, input.jobId), eq(estimateRevisions.status, "sent")));

  const [rev] = await tx
    .insert(estimateRevisions)
    .values({
      estimateId: estimate.id,
      jobId: input.jobId,
      revision,
      status: "sent",
      currency: t.currency,
      labourMinor: t.labourMinor,
      partsMinor: t.partsMinor,
      taxMinor: t.taxMinor,
      totalMinor: t.totalMinor,
      depositMinor: t.depositMinor,
      pricing: {
        exponent: t.exponent,
        labourTaxMinor: t.labourTaxMinor,
        partsTaxMinor: t.partsTaxMinor,
        balanceMinor: t.balanceMinor,
        billedMinutes: t.billedMinutes,
        workedMinutes: t.workedMinutes,
        roundingMinutes: t.roundingMinutes,
        roundingLabourMinor: t.roundingLabourMinor,
        billingRounding: t.billingRounding,
        labourRateMinorPerHour: policy.labourRateMinorPerHour,
        billingIncrementMinutes: policy.billingIncrementMinutes,
        tax: policy.tax,
        deposit: policy.deposit,
        warranty: policy.warranty,
        draftVersion: estimate.version,
      },
      changeSummary,
      sentBy: input.actorId,
    })
    .returning();

  await tx.insert(estimateLines).values(
    lines.map((line, i) => {
      const p = priced.lines[i]!;
      const part = p.parts[0];
      return {
        revisionId: rev!.id,
        position: i + 1,
        code: line.code,
        title: line.title,
        category: line.category,
        minutes: line.kind === "labour" ? line.minutes : 0,
        quantity: line.quantity,
        reason: line.reason,
        readings: line.readings,
        partCostMinor: line.kind === "part" && part ? part.unitCostMinor : null,
        markupBp: line.kind === "part" ? effectiveMarkupBp(line, policy) : null,
        partId: line.kind === "part" ? (line.partId ?? null) : null,
        labourMinor: p.labourMinor,
        partsMinor: p.partsMinor,
        coveredByWarranty: line.covered ? 1 : 0,
      };
    }),
  );

  await tx.update(estimates).set({ currentRevision: revision }).where(eq(estimates.id, estimate.id));

  const atBench = AT_BENCH.includes(job.state);
  await transitionJob(ctx, {
    jobId: input.jobId,
    to: atBench ? "bench_revision" : "estimate_sent",
    actor: "staff",
    actorId: input.actorId,
    note:
      revision === 1 ? "Estimate sent" : `Revision ${revision} sent${atBench ? " while the set is on the bench" : ""}: ${changeSummary}`,
    patch: job.technicianId ? undefined : { technicianId: input.actorId },
  });

  // The checklist to tick at the bench follows the labour lines of the newest revision (at the bench, of
  // the revision the owner approves).
  if (!atBench)
    await syncTasks(
      ctx,
      input.jobId,
      lines.filter((l) => l.kind === "labour"),
    );

  await audit(ctx, {
    actorId: input.actorId,
    action: "estimate.send",
    entity: "estimate_revision",
    entityId: rev!.id,
    before: last ? { revision: last.revision } : null,
    after: { revision, totalMinor: t.totalMinor, depositMinor: t.depositMinor, ...(changeSummary ? { changeSummary } : {}) },
  });

  const props = {
    name: customer.name,
    jobNumber: jobNumber(job.number),
    setName: `${set.maker} ${set.model}`,
    url: `${env().APP_URL}/portal/jobs/${job.id}`,
    totalText: moneyText(t.totalMinor, t.currency, t.exponent),
    depositText: moneyText(t.depositMinor, t.currency, t.exponent),
  };
  if (revision === 1) {
    await queueEmail(ctx, { to: customer.email, template: "estimate-ready", props, dedupeKey: `estimate:${job.id}:r${revision}` });
  } else {
    await queueEmail(ctx, {
      to: customer.email,
      template: "estimate-revised",
      props: { ...props, changeSummary: changeSummary ?? undefined, ...(atBench ? { atBench: true } : {}) },
      dedupeKey: `estimate:${job.id}:r${revision}`,
    });
  }
  return { revisionId: rev!.id, revision, totals: t };
}

/** Brings the bench checklist in line with a scope: its labour lines are added, open lines not in it removed. */
export async function syncTasks(ctx: TxContext, jobId: string, labour: readonly { code: string; title: string }[]) {
  for (const l of labour) {
    await ctx.tx
      .insert(jobTasks)
      .values({ jobId, code: l.code, title: l.title })
      .onConflictDoUpdate({ target: [jobTasks.jobId, jobTasks.code], set: { title: l.title } });
  }
  const keep = labour.map((l) => l.code);
  await ctx.tx
    .delete(jobTasks)
    .where(and(eq(jobTasks.jobId, jobId), isNull(jobTasks.doneAt), keep.length ? notInArray(jobTasks.code, keep) : undefined));
}
